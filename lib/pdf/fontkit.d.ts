// fontkit ships no type declarations; lib/pdf only creates fonts and hands them to pdfkit.
declare module 'fontkit' {
  export interface Font {
    layout(text: string, features?: string[] | Record<string, boolean>): unknown;
    hasGlyphForCodePoint(codePoint: number): boolean;
  }
  export function create(buffer: Uint8Array, postscriptName?: string): Font;
}
