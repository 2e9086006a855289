// Finding 10: only a cell's first character was neutralised, so `Sam;=2+3;x` became a formula when
// a spreadsheet split the file on `;`; the quarterly CSV had its own writer without any guard.
// Now one writer (lib/csv.ts) serves every export.
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { csvRows, neutraliseFormula } from '@/lib/csv';

/** One cell as the CSV writer writes it (a one-cell document without its line end). */
const csvCell = (v: string | number | null) => csvRows([[v]]).slice(0, -2);

/** Splits a CSV line the way a spreadsheet does with `sep` as the separator (quotes respected). */
function cellsAs(line: string, sep: string): string[] {
  const out: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i]!;
    if (quoted) {
      if (ch === '"' && line[i + 1] === '"') {
        cur += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cur += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === sep) {
      out.push(cur);
      cur = '';
    } else cur += ch;
  }
  out.push(cur);
  return out;
}
/** What a spreadsheet would run: a cell starting with = + - @ (leading spaces ignored), unless it is a plain number. */
const isFormula = (cell: string) => /^\s*[=+\-@\uff1d]/.test(cell) && !/^-?\d+(\.\d+)?$/.test(cell);

const HOSTILE = [
  'Sam;=2+3;x',
  '=1+1',
  '+cmd|x',
  '-2+3',
  '@SUM(A1)',
  'a,=HYPERLINK("http://evil.example")',
  'tab\t=1',
  'line\n=1',
  'pipe|=1',
  '; =1',
  '\uff1d1+1',
  '\t=1',
  'ok',
  'a\n@x',
];

describe('one CSV writer', () => {
  it('no cell becomes a formula whichever separator the spreadsheet picks', () => {
    const doc = csvRows([HOSTILE, ['plain', -12.5, '-3.000']]);
    const lines = doc.split('\r\n').filter(Boolean);
    for (const sep of [',', ';', '\t', '|']) {
      for (const cell of cellsAs(lines[0]!, sep))
        expect(isFormula(cell), `${JSON.stringify(cell)} split on ${JSON.stringify(sep)}`).toBe(false);
    }
    expect(csvCell('Sam;=2+3;x')).toBe(`"Sam;'=2+3;x"`);
    expect(neutraliseFormula('-3.000')).toBe('-3.000');
    expect(csvCell(-5)).toBe('-5');
  });

  it('every export uses it: no other CSV cell writer in lib/', () => {
    const offenders: string[] = [];
    const walk = (dir: string) => {
      for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
        const p = path.join(dir, e.name);
        if (e.isDirectory()) walk(p);
        else if (/\.tsx?$/.test(e.name) && p !== path.resolve('lib/csv.ts')) {
          const src = fs.readFileSync(p, 'utf8');
          if (/const\s+csvCell\s*=|function\s+csvCell\b|\.replace\(\/"\/g,\s*'""'\)/.test(src))
            offenders.push(path.relative(process.cwd(), p));
        }
      }
    };
    walk(path.resolve('lib'));
    expect(offenders).toEqual([]);
  });
});
