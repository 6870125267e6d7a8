/**
 * Continuous colour maps: a value is scaled to t in [0, 1] and the colour is interpolated
 * linearly between the 256 entries of the published table (batlow, see batlow.ts). Continuous,
 * not banded: neighbouring t give neighbouring colours.
 */
import { BATLOW } from './batlow.js';
import type { Rgb } from './raster.js';

export interface ColourMap {
  name: string;
  /** what to cite */
  source: string;
  /** r, g, b in 0..1 per entry */
  table: Float64Array;
}

const COLOUR_MAPS: Record<string, ColourMap> = {
  batlow: {
    name: 'batlow',
    source: 'F. Crameri, Scientific colour maps (2018), doi:10.5281/zenodo.1243862; Crameri, Shephard & Heron, Nat. Commun. 11 (2020) 5444',
    table: BATLOW,
  },
};

export const DEFAULT_MAP = COLOUR_MAPS.batlow;

/** The colour at t (clamped to [0, 1]) as 0..255 floats, interpolated in the table. */
export function colourAt(map: ColourMap, t: number, out: number[] = [0, 0, 0]): number[] {
  const n = map.table.length / 3;
  const s = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0)) * (n - 1);
  const i = Math.min(n - 2, Math.floor(s));
  const f = s - i;
  const tb = map.table;
  for (let c = 0; c < 3; c++) out[c] = 255 * (tb[3 * i + c] + (tb[3 * i + 3 + c] - tb[3 * i + c]) * f);
  return out;
}

/** The colour at t rounded to bytes. */
export function colourBytes(map: ColourMap, t: number): Rgb {
  const c = colourAt(map, t);
  return [Math.round(c[0]), Math.round(c[1]), Math.round(c[2])];
}

/** A lookup table of `size` byte colours (r, g, b) sampling the map evenly, for per-pixel use. */
export function colourLut(map: ColourMap, size = 1024): Uint8Array {
  const lut = new Uint8Array(3 * size);
  const c = [0, 0, 0];
  for (let k = 0; k < size; k++) {
    colourAt(map, k / (size - 1), c);
    lut[3 * k] = Math.round(c[0]);
    lut[3 * k + 1] = Math.round(c[1]);
    lut[3 * k + 2] = Math.round(c[2]);
  }
  return lut;
}

/** CIE L* (D65) of an sRGB colour given as 0..255 (IEC 61966-2-1 transfer, CIE 1976 lightness). */
export function lightness(r: number, g: number, b: number): number {
  const lin = (v: number) => {
    const c = v / 255;
    return c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4);
  };
  const Y = 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
  return Y > 216 / 24389 ? 116 * Math.cbrt(Y) - 16 : (24389 / 27) * Y;
}

/** Hex form #rrggbb of a byte colour. */
export function hex(c: readonly number[]): string {
  return '#' + [0, 1, 2].map((k) => Math.max(0, Math.min(255, Math.round(c[k]))).toString(16).padStart(2, '0')).join('');
}
