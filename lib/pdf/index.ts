import 'server-only';
import fs from 'node:fs';
import path from 'node:path';
import * as fontkit from 'fontkit';
import PDFDocument from 'pdfkit';
import { lruMemo } from '@/lib/cache/lru-memo';

/**
 * Shipped fonts (fonts/). TrueType, unpacked from the .woff files (scripts/woff-to-ttf.cjs):
 * fontkit mis-reads some text from .woff2 and re-inflates every WOFF table on each glyph lookup.
 * The parsed fonts are created once per process and shared by every document (pdfkit accepts a
 * fontkit font and subsets it per document), so tables, glyphs and shaping are not redone for
 * each PDF — about 4× faster invoices.
 */
const FONT_REGULAR_FILE = path.resolve(process.cwd(), 'fonts', 'inter-latin-400-normal.ttf');
const FONT_BOLD_FILE = path.resolve(process.cwd(), 'fonts', 'inter-latin-700-normal.ttf');
/**
 * Inter's latin subset has no ≤ ≥ → ≈ (nor any arrow or mathematical operator): those come from
 * a DejaVu Sans subset (U+2190–21FF, U+2200–22FF; fonts/LICENSE-DejaVu.txt), switched to per run.
 */
const SYMBOLS_REGULAR_FILE = path.resolve(process.cwd(), 'fonts', 'dejavu-sans-symbols.ttf');
const SYMBOLS_BOLD_FILE = path.resolve(process.cwd(), 'fonts', 'dejavu-sans-bold-symbols.ttf');
interface Fonts {
  regular: fontkit.Font;
  bold: fontkit.Font;
  symbols: fontkit.Font;
  symbolsBold: fontkit.Font;
}
let fonts: Fonts | undefined;
const load = (file: string) => plainShaping(fontkit.create(fs.readFileSync(file)));
const loadFonts = () =>
  (fonts ??= {
    regular: load(FONT_REGULAR_FILE),
    bold: load(FONT_BOLD_FILE),
    symbols: load(SYMBOLS_REGULAR_FILE),
    symbolsBold: load(SYMBOLS_BOLD_FILE),
  });

/** A run of text and whether it needs the symbols font. */
interface Run {
  text: string;
  symbols: boolean;
}

/**
 * Splits text into runs the primary font can draw and runs it can't (drawn with the symbols
 * font when that has the glyph; otherwise left to the primary font).
 */
export function fontRuns(text: string, primary: fontkit.Font, symbols: fontkit.Font): Run[] {
  const runs: Run[] = [];
  for (const ch of text) {
    const cp = ch.codePointAt(0)!;
    const useSymbols = !primary.hasGlyphForCodePoint(cp) && symbols.hasGlyphForCodePoint(cp) && cp > 0x20;
    const last = runs[runs.length - 1];
    if (last && last.symbols === useSymbols) last.text += ch;
    else runs.push({ text: ch, symbols: useSymbols });
  }
  return runs;
}

/**
 * Characters of `text` that neither the PDF's regular (or bold) font nor the symbols font can
 * draw — they would print as an empty box. Tests use it on every string a PDF shows.
 */
export function missingPdfGlyphs(text: string, weight: 'regular' | 'bold' = 'regular'): string[] {
  const f = loadFonts();
  const [primary, symbols] = weight === 'bold' ? [f.bold, f.symbolsBold] : [f.regular, f.symbols];
  return [
    ...new Set(
      [...text].filter(
        (ch) =>
          /\S/.test(ch) &&
          !primary.hasGlyphForCodePoint(ch.codePointAt(0)!) &&
          !symbols.hasGlyphForCodePoint(ch.codePointAt(0)!),
      ),
    ),
  ];
}

type TextOptions = PDFKit.Mixins.TextOptions;

/**
 * Makes `doc.text` fall back to the symbols font for characters Inter lacks: text the current
 * font can draw goes straight through (no cost for invoices); otherwise it is written as
 * `continued` runs that switch font and back, keeping the caller's position and options.
 */
function withSymbolFallback(doc: PDFKit.PDFDocument, f: Fonts): PDFKit.PDFDocument {
  const text = doc.text.bind(doc) as (
    t: string,
    x?: number | TextOptions,
    y?: number,
    o?: TextOptions,
  ) => PDFKit.PDFDocument;
  const font = doc.font.bind(doc) as (name: string, size?: number) => PDFKit.PDFDocument;
  let current = 'regular';
  (doc as unknown as { font: (name: string, size?: number) => PDFKit.PDFDocument }).font = (
    name: string,
    size?: number,
  ) => {
    current = name;
    return size === undefined ? font(name) : font(name, size);
  };
  (doc as unknown as { text: typeof text }).text = (t, x, y, o) => {
    const str = t === undefined || t === null ? '' : String(t);
    const bold = current === 'bold';
    const primary = bold ? f.bold : current === 'regular' ? f.regular : null;
    if (!primary) return text(t, x, y, o);
    const runs = fontRuns(str, primary, bold ? f.symbolsBold : f.symbols);
    if (runs.every((r) => !r.symbols)) return text(t, x, y, o);
    const options: TextOptions = (typeof x === 'object' ? x : o) ?? {};
    const [px, py] = typeof x === 'number' ? [x, y] : [undefined, undefined];
    runs.forEach((run, i) => {
      font(run.symbols ? (bold ? 'symbols-bold' : 'symbols') : current);
      const opts = { ...options, continued: i < runs.length - 1 ? true : (options.continued ?? false) };
      if (i === 0 && px !== undefined) text(run.text, px, py, opts);
      else text(run.text, opts);
    });
    font(current);
    return doc;
  };
  return doc;
}

/**
 * Lays text out without Inter's contextual alternates and ligatures ('calt' rewrites arrows and
 * case-dependent punctuation): they change nothing on forms and invoices but made shaping about
 * five times slower. Kerning, composition and marks stay on; a caller's explicit features win.
 *
 * pdfkit shapes word by word and remembers words only within one document; invoices repeat the
 * same words ("Draw", "gal", dates, labels), so the shaped words are kept per font for the
 * process too (lib/cache lruMemo, at most LAYOUT_MEMO words). pdfkit scales the positions it
 * gets in place, so each caller gets its own copy of them; glyphs are shared read-only objects.
 */
const PLAIN_FEATURES = { calt: false, liga: false, clig: false, rclt: false };
const LAYOUT_MEMO = 20_000;
type Shaped = Pick<fontkit.GlyphRun, 'glyphs' | 'positions'>;
function plainShaping(font: fontkit.Font): fontkit.Font {
  const layout = font.layout.bind(font);
  const memo = lruMemo<Shaped>(LAYOUT_MEMO);
  font.layout = (text, features) => {
    if (features) return layout(text, features);
    const shaped = memo(text, () => {
      const run = layout(text, PLAIN_FEATURES);
      return { glyphs: run.glyphs, positions: run.positions.map((p) => ({ ...p })) };
    });
    const positions = shaped.positions.map((p) => ({ ...p }));
    return {
      glyphs: shaped.glyphs,
      positions,
      get advanceWidth() {
        return positions.reduce((sum, p) => sum + p.xAdvance, 0);
      },
    } as unknown as fontkit.GlyphRun;
  };
  return font;
}

/** A new A4/Letter document using the shipped fonts ('regular' and 'bold' are registered). */
export function newPdf(opts: { title: string; size?: 'LETTER' | 'A4' }): PDFKit.PDFDocument {
  const f = loadFonts();
  const doc = new PDFDocument({
    size: opts.size ?? 'LETTER',
    margin: 50,
    font: f.regular as unknown as string,
    info: { Title: opts.title, Producer: 'Tallyvat' },
  });
  doc.registerFont('regular', f.regular as unknown as string);
  doc.registerFont('bold', f.bold as unknown as string);
  doc.registerFont('symbols', f.symbols as unknown as string);
  doc.registerFont('symbols-bold', f.symbolsBold as unknown as string);
  doc.font('regular');
  return withSymbolFallback(doc, f);
}

/** Renders a document to a Buffer. */
export function pdfToBuffer(doc: PDFKit.PDFDocument): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}

/** A Response carrying a PDF download with a safe Content-Disposition. */
export function pdfResponse(bytes: Buffer, filename: string): Response {
  const safe = filename.replace(/[^A-Za-z0-9._-]/g, '_');
  return new Response(new Uint8Array(bytes), {
    headers: {
      'content-type': 'application/pdf',
      'content-disposition': `attachment; filename="${safe}"`,
      'cache-control': 'private, no-store',
    },
  });
}
