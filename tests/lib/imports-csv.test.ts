// Reading spreadsheet exports: BOM, `;` and tab separators, quoted commas and line breaks, blank
// lines, headings in any order, and numbers with the locale's thousands separators.
import { describe, expect, it } from 'vitest';
import { csvFileHash, parseLocaleNumber, readCsv } from '@/lib/imports/csv-read';

const COLUMNS = [
  { key: 'name', headings: ['Name', 'Full name'], required: false },
  { key: 'email', headings: ['E-mail', 'Email address'], required: true },
  { key: 'role', headings: ['Role'], required: false },
] as const;

describe('readCsv', () => {
  it('reads a comma file with a BOM, quoted commas, CRLF line ends and headings in any order', () => {
    const r = readCsv('\uFEFFRole,E-mail,Name\r\nbrewer,ada@example.org,"Lovelace, Ada"\r\n', COLUMNS);
    expect(r).toMatchObject({
      ok: true,
      delimiter: ',',
      rows: [{ line: 2, cells: { name: 'Lovelace, Ada', email: 'ada@example.org', role: 'brewer' } }],
    });
  });

  it('guesses `;` and tab separators, skips blank lines but keeps spreadsheet row numbers', () => {
    const semi = readCsv(
      'name;email;role\n\nA;a@example.org;member\n;;\n"B\nsecond line";b@example.org;admin\nC;c@example.org;x\n',
      COLUMNS,
    );
    expect(semi.ok && semi.delimiter).toBe(';');
    // Row 2 and 4 are blank; row 5's quoted cell spans two physical lines, so C is on line 7.
    expect(semi.ok && semi.rows.map((r) => [r.line, r.cells.email])).toEqual([
      [3, 'a@example.org'],
      [5, 'b@example.org'],
      [7, 'c@example.org'],
    ]);
    const tab = readCsv('Email address\tFull name\nz@example.org\tZed\n', COLUMNS);
    expect(tab).toMatchObject({
      ok: true,
      delimiter: '\t',
      rows: [{ line: 2, cells: { email: 'z@example.org', name: 'Zed', role: '' } }],
    });
  });

  it('names a missing required column, an empty file and a file with no rows', () => {
    expect(readCsv('name,role\nA,member\n', COLUMNS)).toMatchObject({
      ok: false,
      field: 'csv',
      error: expect.stringContaining('"E-mail"'),
    });
    expect(readCsv('\uFEFF\r\n\r\n', COLUMNS)).toMatchObject({ ok: false, error: expect.stringContaining('empty') });
    expect(readCsv('email\n\n', COLUMNS)).toMatchObject({ ok: false, error: expect.stringContaining('no rows') });
  });

  it('lists headings it does not use', () => {
    const r = readCsv('email,phone\na@example.org,555\n', COLUMNS);
    expect(r.ok && r.ignoredHeadings).toEqual(['phone']);
  });

  it('hashes the same file the same whatever its line ends or BOM', () => {
    expect(csvFileHash('\uFEFFa,b\r\n1,2\r\n')).toBe(csvFileHash('a,b\n1,2'));
    expect(csvFileHash('a,b\n1,2')).not.toBe(csvFileHash('a,b\n1,3'));
  });
});

describe('parseLocaleNumber', () => {
  it('US co-ops: comma groups, dot decimals', () => {
    expect(parseLocaleNumber('1,234.50', '.')).toBe('1234.50');
    expect(parseLocaleNumber('$1,234', '.')).toBe('1234');
    expect(parseLocaleNumber('-12.5', '.')).toBe('-12.5');
    expect(parseLocaleNumber('(40.00)', '.')).toBe('-40.00');
    expect(parseLocaleNumber('0', '.')).toBe('0');
  });
  it('metric co-ops: dot or space groups, comma decimals', () => {
    expect(parseLocaleNumber('1.234,5', ',')).toBe('1234.5');
    expect(parseLocaleNumber('1 234,5', ',')).toBe('1234.5');
    expect(parseLocaleNumber('12,75', ',')).toBe('12.75');
  });
  it('refuses what is not a number, and misplaced groups', () => {
    for (const bad of ['', 'abc', '1,23.4', '12.5.6', '1e5', '0x10', '--3'])
      expect(parseLocaleNumber(bad, '.')).toBeNull();
    expect(parseLocaleNumber('1.23,4', ',')).toBeNull();
  });
});

describe('import values in the co-op’s locale', async () => {
  const { readDate, readMoneyCents, readQuantity } = await import('@/lib/imports/values');
  it('dates: MM/DD/YYYY in US co-ops, DD/MM/YYYY in metric ones, ISO everywhere; impossible days refused', () => {
    expect(readDate('03/04/2026', 'us')).toEqual({ ok: true, value: '2026-03-04' });
    expect(readDate('03/04/2026', 'metric')).toEqual({ ok: true, value: '2026-04-03' });
    expect(readDate('31.12.2025', 'metric')).toEqual({ ok: true, value: '2025-12-31' });
    expect(readDate('2026-02-28', 'metric')).toEqual({ ok: true, value: '2026-02-28' });
    for (const bad of ['2026-02-30', '13/01/2026', '1/2/26', 'yesterday', ''])
      expect(readDate(bad, 'us').ok).toBe(false);
  });
  it('money to whole cents without floats; metric files with dot decimals still read', () => {
    expect(readMoneyCents('1,250.00', 'us')).toEqual({ ok: true, value: 125000 });
    expect(readMoneyCents('-40', 'us')).toEqual({ ok: true, value: -4000 });
    expect(readMoneyCents('1.250,5', 'metric')).toEqual({ ok: true, value: 125050 });
    expect(readMoneyCents('12.50', 'metric')).toEqual({ ok: true, value: 1250 });
    expect(readMoneyCents('0.1', 'us')).toEqual({ ok: true, value: 10 });
    expect(readMoneyCents('1.005', 'us').ok).toBe(false);
  });
  it('quantities: exact decimals, never negative', () => {
    expect(readQuantity('1,200.5', 'us')).toEqual({ ok: true, value: '1200.5' });
    expect(readQuantity('-3', 'us').ok).toBe(false);
  });
});
