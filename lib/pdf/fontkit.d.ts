// fontkit ships no type declarations; lib/pdf only creates fonts and hands them to pdfkit.
declare module 'fontkit' {
  export interface GlyphPosition {
    xAdvance: number;
    yAdvance: number;
    xOffset: number;
    yOffset: number;
  }
  export interface GlyphRun {
    glyphs: unknown[];
    positions: GlyphPosition[];
    readonly advanceWidth: number;
  }
  export interface Font {
    layout(text: string, features?: string[] | Record<string, boolean>): GlyphRun;
    hasGlyphForCodePoint(codePoint: number): boolean;
  }
  export function create(buffer: Uint8Array, postscriptName?: string): Font;
}
