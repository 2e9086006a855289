import 'server-only';
import fs from 'node:fs';
import path from 'node:path';
import * as fontkit from 'fontkit';
import PDFDocument from 'pdfkit';

/**
 * Shipped fonts (fonts/). TrueType, unpacked from the .woff files (scripts/woff-to-ttf.cjs):
 * fontkit mis-reads some text from .woff2 and re-inflates every WOFF table on each glyph lookup.
 * The parsed fonts are created once per process and shared by every document (pdfkit accepts a
 * fontkit font and subsets it per document), so tables, glyphs and shaping are not redone for
 * each PDF — about 4× faster invoices.
 */
const FONT_REGULAR_FILE = path.resolve(process.cwd(), 'fonts', 'inter-latin-400-normal.ttf');
const FONT_BOLD_FILE = path.resolve(process.cwd(), 'fonts', 'inter-latin-700-normal.ttf');
let fonts: { regular: fontkit.Font; bold: fontkit.Font } | undefined;
const loadFonts = () =>
  (fonts ??= { regular: plainShaping(fontkit.create(fs.readFileSync(FONT_REGULAR_FILE))), bold: plainShaping(fontkit.create(fs.readFileSync(FONT_BOLD_FILE))) });

/**
 * Lays text out without Inter's contextual alternates and ligatures ('calt' rewrites arrows and
 * case-dependent punctuation): they change nothing on forms and invoices but made shaping about
 * five times slower. Kerning, composition and marks stay on; a caller's explicit features win.
 */
const PLAIN_FEATURES = { calt: false, liga: false, clig: false, rclt: false };
function plainShaping(font: fontkit.Font): fontkit.Font {
  const layout = font.layout.bind(font);
  font.layout = (text, features) => layout(text, features ?? PLAIN_FEATURES);
  return font;
}

/** A new A4/Letter document using the shipped fonts ('regular' and 'bold' are registered). */
export function newPdf(opts: { title: string; size?: 'LETTER' | 'A4' }): PDFKit.PDFDocument {
  const f = loadFonts();
  const doc = new PDFDocument({ size: opts.size ?? 'LETTER', margin: 50, font: f.regular as unknown as string, info: { Title: opts.title, Producer: 'Tallyvat' } });
  doc.registerFont('regular', f.regular as unknown as string);
  doc.registerFont('bold', f.bold as unknown as string);
  doc.font('regular');
  return doc;
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
