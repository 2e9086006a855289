// Reading CSV files exported from spreadsheets (pure: no I/O). Parsing is papaparse's; this adds
// what a co-op's own file needs: the BOM, the separator a spreadsheet chose (`,` `;` or tab),
// blank lines, headers matched by name in any order and case, and the spreadsheet's row numbers
// so the preview can say "row 14, e-mail".
import crypto from 'node:crypto';
import Papa from 'papaparse';

/** One expected column: its key, the headings it may appear under, and whether it must be there. */
export interface CsvColumn<K extends string = string> {
  key: K;
  /** Headings that mean this column (compared without case, spaces, dashes or underscores). */
  headings: readonly string[];
  required: boolean;
}

/** One data row: its row number as a spreadsheet shows it (the heading row is 1) and its cells by key. */
export interface CsvRow<K extends string = string> {
  line: number;
  cells: Record<K, string>;
}

export type CsvReadResult<K extends string = string> =
  | { ok: true; rows: CsvRow<K>[]; delimiter: string; ignoredHeadings: string[] }
  | { ok: false; error: string; field: 'csv' };

/** At most this many data rows per file: a co-op has up to a few hundred members. */
export const MAX_IMPORT_ROWS = 2000;

const normalHeading = (s: string) => s.toLowerCase().replace(/[\s_\-.]+/g, '');

/** The file's text as compared for "the same file": no BOM, line ends unified, trailing blank lines ignored. */
export function normalizedCsvText(text: string): string {
  return text
    .replace(/^\uFEFF/, '')
    .replace(/\r\n?/g, '\n')
    .replace(/\n+$/, '');
}

/** SHA-256 of the normalized text: the same file saved again on another system hashes the same. */
export function csvFileHash(text: string): string {
  return crypto.createHash('sha256').update(normalizedCsvText(text), 'utf8').digest('hex');
}

/**
 * Parses the file and maps its headings onto `columns`. Blank lines (also lines of only
 * separators) are skipped but still counted, so row numbers match the spreadsheet. A missing
 * required column, an empty file or a file over MAX_IMPORT_ROWS is one file-level error.
 */
export function readCsv<K extends string>(text: string, columns: readonly CsvColumn<K>[]): CsvReadResult<K> {
  const body = normalizedCsvText(text);
  if (body.trim() === '')
    return {
      ok: false,
      error: 'The file is empty. Use the template: a heading row, then one row per record.',
      field: 'csv',
    };
  const parsed = Papa.parse<string[]>(body, {
    delimiter: '',
    delimitersToGuess: [',', ';', '\t'],
    skipEmptyLines: false,
    header: false,
  });
  const data = parsed.data;
  const headerIndex = data.findIndex((r) => r.some((c) => c.trim() !== ''));
  if (headerIndex < 0) return { ok: false, error: 'The file has no heading row.', field: 'csv' };
  const headings = data[headerIndex]!.map((h) => h.trim());
  const position = new Map<K, number>();
  for (const col of columns) {
    const wanted = new Set([col.key, ...col.headings].map(normalHeading));
    const at = headings.findIndex((h) => wanted.has(normalHeading(h)));
    if (at >= 0) position.set(col.key, at);
    else if (col.required) {
      return {
        ok: false,
        error: `The heading row has no "${col.headings[0] ?? col.key}" column. Found: ${headings.filter(Boolean).join(', ') || 'nothing'}.`,
        field: 'csv',
      };
    }
  }
  const used = new Set(position.values());
  const ignoredHeadings = headings.filter((h, i) => h !== '' && !used.has(i));
  const rows: CsvRow<K>[] = [];
  // Physical line numbers: count the line breaks inside each record (quoted cells may hold some).
  let line = 1;
  for (let i = 0; i < data.length; i++) {
    const record = data[i]!;
    const span = 1 + record.reduce((n, c) => n + (c.match(/\n/g)?.length ?? 0), 0);
    if (i > headerIndex && record.some((c) => c.trim() !== '')) {
      const cells = {} as Record<K, string>;
      for (const col of columns) {
        const at = position.get(col.key);
        cells[col.key] = at === undefined ? '' : (record[at] ?? '').trim();
      }
      rows.push({ line, cells });
      if (rows.length > MAX_IMPORT_ROWS)
        return {
          ok: false,
          error: `The file has more than ${MAX_IMPORT_ROWS} rows. Split it into smaller files.`,
          field: 'csv',
        };
    }
    line += span;
  }
  if (rows.length === 0) return { ok: false, error: 'The file has a heading row but no rows under it.', field: 'csv' };
  return { ok: true, rows, delimiter: parsed.meta.delimiter, ignoredHeadings };
}

/**
 * A number as a spreadsheet in the co-op's locale writes it: US co-ops `1,234.5`; metric co-ops
 * `1.234,5` or `1 234,5` (a comma is the decimal mark there). Returns the plain decimal string
 * (`"1234.5"`, never a float) or null when it is not a number. A leading minus or parentheses
 * mean negative; a currency sign at either end is ignored.
 */
export function parseLocaleNumber(raw: string, decimalMark: '.' | ','): string | null {
  let s = raw.trim().replace(/[\s\u00a0\u202f]/g, '');
  let negative = false;
  if (/^\(.*\)$/.test(s)) {
    negative = true;
    s = s.slice(1, -1);
  }
  s = s.replace(/^[$€£]|[$€£]$/g, '');
  if (s.startsWith('-')) {
    negative = !negative;
    s = s.slice(1);
  }
  s = s.replace(/^[$€£]/, '');
  const group = decimalMark === '.' ? ',' : '.';
  // Thousands groups must be whole groups of three digits.
  const pattern = new RegExp(`^(\\d{1,3}(\\${group}\\d{3})+|\\d+)(\\${decimalMark}\\d+)?$`);
  if (!pattern.test(s)) return null;
  const [whole, frac] = s.split(decimalMark) as [string, string | undefined];
  const digits = whole
    .split(group)
    .join('')
    .replace(/^0+(?=\d)/, '');
  const out = frac ? `${digits}.${frac}` : digits;
  return negative && /[1-9]/.test(out) ? `-${out}` : out;
}
