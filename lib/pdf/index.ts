import 'server-only';
import path from 'node:path';
import PDFDocument from 'pdfkit';

/** Shipped fonts (fonts/); .woff because fontkit mis-reads some text from .woff2. */
const FONT_REGULAR = path.resolve(process.cwd(), 'fonts', 'inter-latin-400-normal.woff');
const FONT_BOLD = path.resolve(process.cwd(), 'fonts', 'inter-latin-700-normal.woff');

/** A new A4/Letter document using the shipped fonts ('regular' and 'bold' are registered). */
export function newPdf(opts: { title: string; size?: 'LETTER' | 'A4' }): PDFKit.PDFDocument {
  const doc = new PDFDocument({ size: opts.size ?? 'LETTER', margin: 50, font: FONT_REGULAR, info: { Title: opts.title, Producer: 'Tallyvat' } });
  doc.registerFont('regular', FONT_REGULAR);
  doc.registerFont('bold', FONT_BOLD);
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
