import { stringify } from 'csv-stringify/sync';

// The one CSV writer for every export (pure: no I/O), on csv-stringify. RFC 4180 quoting, CRLF line ends, and
// text cells neutralised so no spreadsheet reads them as a formula (OWASP "CSV injection").

export type CsvValue = string | number | null | undefined;

/** A formula trigger at the start of the cell or of any part a separator could split off. */
const FORMULA_AFTER_SEPARATOR = /(^|[,;\t|\r\n])([ \u00a0]*)([=+\-@\uff1d\uff0b\uff0d\uff20])/g;
/** A plain decimal number ("-12.5"): read as a number, never as a formula. */
const PLAIN_NUMBER = /^-?\d+(?:\.\d+)?$/;
/** Characters a spreadsheet may split cells on when it guesses the separator, line breaks and quotes. */
const NEEDS_QUOTES = /[",;\t|\r\n]/;

/**
 * Makes text safe to open in a spreadsheet: an apostrophe goes before every `=`, `+`, `-` or `@`
 * (and their full-width forms) that starts the cell or follows a separator — so `Sam;=2+3;x`
 * stays text even when the file is opened with `;` as the separator — and before a leading tab or
 * carriage return. Plain numbers are left alone.
 */
export function neutraliseFormula(s: string): string {
  if (PLAIN_NUMBER.test(s)) return s;
  const out = s.replace(FORMULA_AFTER_SEPARATOR, "$1$2'$3");
  return /^[\t\r]/.test(out) ? `'${out}` : out;
}

/**
 * Rows of cells → a CSV document through csv-stringify: comma-separated, CRLF after every row
 * (RFC 4180), empty cells for null/undefined. Text cells are neutralised (see `neutraliseFormula`);
 * numbers never are. A cell is quoted when it holds a quote or any separator a spreadsheet might
 * use, so a `;`-separated reading keeps it whole too.
 */
export function csvRows(rows: readonly (readonly CsvValue[])[]): string {
  return stringify(rows as CsvValue[][], {
    record_delimiter: 'windows',
    eof: true,
    quoted_match: NEEDS_QUOTES,
    cast: { string: (v) => neutraliseFormula(v) },
  });
}
