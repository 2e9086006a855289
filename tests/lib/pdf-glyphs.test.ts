// Every string a PDF shows must print with a real glyph: the PDF fonts (Inter with a DejaVu Sans
// symbols subset) cover ≤ ≥ → ≈ ° and the text of the limits tables, safety cautions and
// invoice notes; the text extracted from a rendered PDF equals the intended strings.
import { describe, expect, it } from 'vitest';
import { PDFParse } from 'pdf-parse';
import { missingPdfGlyphs, newPdf, pdfToBuffer } from '@/lib/pdf';
import { QUALITY_LIMITS, SCREENING_CAUTION } from '@/lib/quality';
import { SAFETY_CAUTIONS, ALTITUDE_CAUTION } from '@/lib/safety';
import { INVOICE_ROUNDING_NOTE } from '@/lib/money';
import { YIELD_ASSUMPTIONS, altitudeNote, catalystGrams } from '@/lib/chemistry';

async function pdfText(bytes: Buffer): Promise<string> {
  const parser = new PDFParse({ data: new Uint8Array(bytes) });
  try {
    return (await parser.getText()).text;
  } finally {
    await parser.destroy();
  }
}

const normalise = (s: string) => s.replace(/\s+/g, ' ').trim();

const SYMBOLS = [
  '≤ 0.50 mg KOH/g',
  '≥ 93 °C',
  '12.84 g/L → 1451.4 g',
  '≈ 66 ppm',
  '1.9–6.0 mm²/s',
  '59.9 °C (139.8 °F)',
];
const explanation = catalystGrams({
  catalyst: 'KOH',
  titrant: 'NaOH',
  oilLiters: 113,
  baseGramsPerLiter: 7,
  titrationMl: 4,
  purityPct: 90,
  titrantFrom: 'pure-reagent',
  system: 'us',
}).explanation;
const STRINGS = [
  ...SYMBOLS,
  ...QUALITY_LIMITS.flatMap((r) => [r.label, r.limitText, r.unit, r.note ?? '', r.source]),
  ...SAFETY_CAUTIONS.map((c) => c.text),
  ALTITUDE_CAUTION.text,
  altitudeNote(1600, 'us') ?? '',
  SCREENING_CAUTION,
  INVOICE_ROUNDING_NOTE,
  ...YIELD_ASSUMPTIONS,
  explanation,
].filter((s) => s !== '');

describe('PDF fonts cover every glyph used (≤ ≥ → ≈ °)', () => {
  it('no character of the limits tables, cautions, notes or explanations lacks a glyph, regular or bold', () => {
    for (const s of STRINGS) {
      expect(missingPdfGlyphs(s), s).toEqual([]);
      expect(missingPdfGlyphs(s, 'bold'), s).toEqual([]);
    }
  });

  it('a rendered PDF gives back exactly the intended text, symbols included', async () => {
    const doc = newPdf({ title: 'glyph check' });
    for (const s of SYMBOLS) doc.text(s);
    doc.font('bold').text('Limit ≤ 0.50 → pass ≈ ok');
    doc.font('regular').text('Left ', { continued: true }).text('≥ right');
    doc.text('Boxed ≤ text in a column', 300, 400, { width: 120 });
    const text = await pdfText(await pdfToBuffer(doc));
    for (const s of SYMBOLS) expect(normalise(text)).toContain(s);
    expect(normalise(text)).toContain('Limit ≤ 0.50 → pass ≈ ok');
    expect(normalise(text)).toContain('Left ≥ right');
    expect(normalise(text)).toContain('Boxed ≤ text in a column');
  });
});

// Shaped words are remembered across documents (lib/pdf plainShaping); pdfkit scales the positions
// it gets in place, so a remembered word must measure and print the same in a later document.
describe('shaped words shared between documents', () => {
  it('the same words measure the same and print the same text in a second and third document', async () => {
    const line = 'Draw 14 on 3 Dec 2026: 12.500 gal at $4.52 ≤ limit';
    const widths: number[] = [];
    const texts: string[] = [];
    for (let i = 0; i < 3; i++) {
      const doc = newPdf({ title: `memo ${i}` });
      widths.push(doc.fontSize(10).widthOfString(line));
      doc.text(line);
      texts.push(normalise(await pdfText(await pdfToBuffer(doc))));
    }
    expect(widths[0]).toBeGreaterThan(100);
    expect(widths[1]).toBe(widths[0]);
    expect(widths[2]).toBe(widths[0]);
    expect(texts[0]).toContain(line);
    expect(texts[1]).toBe(texts[0]);
    expect(texts[2]).toBe(texts[0]);
  });
});
