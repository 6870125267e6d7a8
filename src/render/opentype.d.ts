/** The part of opentype.js 1.3.4 used here (the package ships no types). */
declare module 'opentype.js' {
  export interface PathCommand {
    type: 'M' | 'L' | 'Q' | 'C' | 'Z';
    x?: number;
    y?: number;
    x1?: number;
    y1?: number;
    x2?: number;
    y2?: number;
  }
  export interface Path {
    commands: PathCommand[];
  }
  export interface RenderOptions {
    kerning?: boolean;
    features?: Record<string, boolean>;
  }
  export interface Font {
    unitsPerEm: number;
    ascender: number;
    descender: number;
    getPath(text: string, x: number, y: number, fontSize: number, options?: RenderOptions): Path;
    getAdvanceWidth(text: string, fontSize: number, options?: RenderOptions): number;
  }
  /** lowMemory: glyphs are parsed when first used */
  export function parse(buffer: ArrayBuffer, options?: { lowMemory?: boolean }): Font;
  const opentype: { parse: typeof parse };
  export default opentype;
}
