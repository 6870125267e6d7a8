/**
 * Text from real glyph outlines: DejaVu Sans (the dejavu-fonts-ttf package) read by opentype.js,
 * laid out with the font's advance widths and kerning, and turned into flat polygons (quadratic
 * and cubic Bezier segments flattened to within about 1/8 pixel) that the raster fills with
 * antialiasing and the SVG writer emits as paths. No text depends on fonts installed on the
 * machine that opens a picture.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { Font } from 'opentype.js';

/** opentype.js, loaded on the first text drawn (not at start-up: most commands draw nothing). */
const loadOpentype = (): typeof import('opentype.js') => createRequire(import.meta.url)('opentype.js') as typeof import('opentype.js');

export type Weight = 'normal' | 'bold';

const fonts: Partial<Record<Weight, Font>> = {};

function font(weight: Weight): Font {
  let f = fonts[weight];
  if (!f) {
    const require = createRequire(import.meta.url);
    const file = require.resolve(`dejavu-fonts-ttf/ttf/${weight === 'bold' ? 'DejaVuSans-Bold.ttf' : 'DejaVuSans.ttf'}`);
    const b = readFileSync(file);
    // lowMemory: glyphs are read from the file when first drawn instead of all ~6000 at once
    // (the same outlines, advances and kerning; a faster start for the few dozen glyphs a picture uses)
    f = loadOpentype().parse(b.buffer.slice(b.byteOffset, b.byteOffset + b.byteLength) as ArrayBuffer, { lowMemory: true });
    fonts[weight] = f;
  }
  return f;
}

/**
 * Reads and parses both weights and measures every printable ASCII character once, so a later
 * picture does not wait for it (a sweep does this while its workers solve).
 */
export function loadFonts(): void {
  let ascii = '';
  for (let c = 32; c < 127; c++) ascii += String.fromCharCode(c);
  for (const weight of ['normal', 'bold'] as const) {
    const f = font(weight);
    for (let k = 0; k < ascii.length; k++) f.getAdvanceWidth(ascii[k] + ascii, 10, { kerning: true });
  }
}

/**
 * A cache of text measured or laid out, by weight, size and text: the pictures ask for the same
 * texts many times (a text's box when it is placed, its outline in the PNG and again in the SVG,
 * the caution line word by word in every frame). Emptied when it holds MEMO_MOST entries, so a
 * long run that draws many pictures does not grow it without end.
 */
const MEMO_MOST = 4096;

function remember<T>(memo: Map<string, T>, key: string, make: () => T): T {
  let v = memo.get(key);
  if (v === undefined) {
    if (memo.size >= MEMO_MOST) memo.clear();
    v = make();
    memo.set(key, v);
  }
  return v;
}

const widths = new Map<string, number>();

/** Advance width of the text at `size` pixels (em size), kerning included. */
export function textWidth(text: string, size: number, weight: Weight = 'normal'): number {
  return remember(widths, `${weight} ${size} ${text}`, () => font(weight).getAdvanceWidth(text, size, { kerning: true }));
}

/** Height above the baseline of capitals and digits (DejaVu Sans: 0.729 em). */
export function capHeight(size: number): number {
  return 0.729 * size;
}

export type Anchor = 'start' | 'middle' | 'end';

export interface TextLayout {
  /** closed polygons, flat x, y lists in pixels */
  polygons: number[][];
  /** the advance box: left, top (ascender), right, bottom (descender) */
  box: [number, number, number, number];
}

/**
 * The glyph outlines of `text` with its baseline at y and its anchor at x, rotated by `rotate`
 * radians about (x, y) (counter-clockwise on the screen for negative values, y being down).
 */
export function layoutText(text: string, x: number, y: number, size: number, anchor: Anchor = 'start', weight: Weight = 'normal', rotate = 0): TextLayout {
  const g = glyphOutlines(text, size, anchor, weight);
  const cos = Math.cos(rotate);
  const sin = Math.sin(rotate);
  const polygons = g.local.map((p) => {
    const out = new Array<number>(p.length);
    for (let k = 0; k < p.length; k += 2) {
      const qx = p[k];
      const qy = p[k + 1];
      out[k] = x + qx * cos - qy * sin;
      out[k + 1] = y + qx * sin + qy * cos;
    }
    return out;
  });
  const { x0, w, asc, desc } = g;
  // The box is given unrotated for rotate = 0 and as the bounding box of the rotated box otherwise.
  const corners = [
    [x0, -asc],
    [x0 + w, -asc],
    [x0 + w, desc],
    [x0, desc],
  ].map(([a, b]) => [x + a * cos - b * sin, y + a * sin + b * cos]);
  const xs = corners.map((p) => p[0]);
  const ys = corners.map((p) => p[1]);
  return { polygons, box: [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)] };
}

/** The outlines of a text with its anchor at the origin, unrotated: flat polygons and the advance box. */
interface LocalText {
  local: number[][];
  /** the left end of the advance, its width, the ascender and descender (pixels) */
  x0: number;
  w: number;
  asc: number;
  desc: number;
}

const outlines = new Map<string, LocalText>();

/**
 * The glyph outlines of `text` with its baseline at 0 and its anchor at 0, flattened (quadratic
 * and cubic segments cut so that the flattening error stays under 1/8 pixel); kept in the cache.
 */
function glyphOutlines(text: string, size: number, anchor: Anchor, weight: Weight): LocalText {
  return remember(outlines, `${weight} ${anchor} ${size} ${text}`, () => {
    const f = font(weight);
    const w = f.getAdvanceWidth(text, size, { kerning: true });
    const x0 = anchor === 'start' ? 0 : anchor === 'middle' ? -w / 2 : -w;
    const path = f.getPath(text, x0, 0, size, { kerning: true });
    const tol = 0.125;
    const local: number[][] = [];
    let cur: number[] = [];
    let px = 0;
    let py = 0;
    const close = () => {
      if (cur.length >= 6) local.push(cur);
      cur = [];
    };
    for (const c of path.commands) {
      switch (c.type) {
        case 'M':
          close();
          px = c.x!;
          py = c.y!;
          cur.push(px, py);
          break;
        case 'L':
          px = c.x!;
          py = c.y!;
          cur.push(px, py);
          break;
        case 'Q': {
          // Segments so that the flattening error (|p0 - 2 p1 + p2| / (4 n^2)) stays below tol.
          const dd = Math.hypot(px - 2 * c.x1! + c.x!, py - 2 * c.y1! + c.y!);
          const n = Math.max(1, Math.min(32, Math.ceil(Math.sqrt(dd / (4 * tol)))));
          for (let k = 1; k <= n; k++) {
            const t = k / n;
            const u = 1 - t;
            cur.push(u * u * px + 2 * u * t * c.x1! + t * t * c.x!, u * u * py + 2 * u * t * c.y1! + t * t * c.y!);
          }
          px = c.x!;
          py = c.y!;
          break;
        }
        case 'C': {
          const dd = Math.max(Math.hypot(px - 2 * c.x1! + c.x2!, py - 2 * c.y1! + c.y2!), Math.hypot(c.x1! - 2 * c.x2! + c.x!, c.y1! - 2 * c.y2! + c.y!));
          const n = Math.max(1, Math.min(48, Math.ceil(Math.sqrt((3 * dd) / (4 * tol)))));
          for (let k = 1; k <= n; k++) {
            const t = k / n;
            const u = 1 - t;
            cur.push(
              u * u * u * px + 3 * u * u * t * c.x1! + 3 * u * t * t * c.x2! + t * t * t * c.x!,
              u * u * u * py + 3 * u * u * t * c.y1! + 3 * u * t * t * c.y2! + t * t * t * c.y!,
            );
          }
          px = c.x!;
          py = c.y!;
          break;
        }
        case 'Z':
          close();
          break;
      }
    }
    close();
    return { local, x0, w, asc: (f.ascender / f.unitsPerEm) * size, desc: (-f.descender / f.unitsPerEm) * size };
  });
}
