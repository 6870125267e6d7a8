/**
 * A raster as a palette (indexed-colour) PNG: one byte per pixel instead of three. The report's
 * pictures are mostly paper, ink and the antialiased blends between them, plus one colour map:
 * a few thousand distinct colours of which 256 well chosen ones are indistinguishable from all
 * of them, and the file is about a third of the true-colour one (measured on the strap
 * example's report pictures: 60 KB against 150-180 KB for the convergence chart at 1360 x 840).
 *
 * The 256 colours come from median cut (P. Heckbert, "Color image quantization for frame buffer
 * display", SIGGRAPH 1982): the box of colours with the largest spread, weighted by pixel
 * counts, is split at its weighted median along its longest axis until there are 256 boxes;
 * each box's colour is the count-weighted mean. An image of at most 256 colours keeps them
 * exactly. Rows are written unfiltered (filter 0: on indexed data the prediction filters do not
 * help, PNG specification 1.2, section 12.8) and compressed by zlib at level 6, its default.
 * Why not level 9: measured on the strap example's seven report pictures (7.0 MB of rows),
 * level 9 took 0.58-0.76 s for 552 KB, level 7 0.11 s for 577 KB, level 6 0.06-0.08 s for
 * 581 KB: the last 5% of size cost ten times the time, most of the report's whole budget.
 * Chunk layout and CRC: PNG specification (W3C, second edition, 2003), sections 5.3 and 11.2.
 */
import { deflateSync } from 'node:zlib';
import { assemblePng } from './png.js';
import type { Raster } from './raster.js';

interface Box {
  /** indices into the colour list */
  colours: number[];
  /** the box's spread (range along its widest axis times the square root of its pixels) and that axis, found once */
  spread: number;
  axis: number;
}

/** Up to `most` palette colours (packed 0xRRGGBB) for the colours `rgb` seen `count` times each, by median cut. */
function medianCut(rgb: Int32Array, count: Float64Array, most: number): number[] {
  const channel = (c: number, k: number) => (rgb[c] >> (16 - 8 * k)) & 255;
  const spread = (colours: number[]): [number, number] => {
    let best = -1;
    let axis = 0;
    for (let k = 0; k < 3; k++) {
      let lo = 255;
      let hi = 0;
      let n = 0;
      for (const c of colours) {
        const v = channel(c, k);
        if (v < lo) lo = v;
        if (v > hi) hi = v;
        n += count[c];
      }
      // the range times the pixels it covers: splitting a wide box of many pixels first
      const s = (hi - lo) * Math.sqrt(n);
      if (s > best) [best, axis] = [s, k];
    }
    return [best, axis];
  };
  const box = (colours: number[]): Box => {
    const [s, axis] = spread(colours);
    return { colours, spread: s, axis };
  };
  const boxes: Box[] = [box(Array.from({ length: rgb.length }, (_, i) => i))];
  while (boxes.length < most) {
    let pick = -1;
    let pickAxis = 0;
    let pickSpread = 0;
    boxes.forEach((b, i) => {
      if (b.colours.length < 2) return;
      if (b.spread > pickSpread) [pick, pickAxis, pickSpread] = [i, b.axis, b.spread];
    });
    if (pick < 0) break;
    const b = boxes[pick];
    b.colours.sort((p, q) => channel(p, pickAxis) - channel(q, pickAxis));
    let total = 0;
    for (const c of b.colours) total += count[c];
    let acc = 0;
    let cut = 1;
    for (; cut < b.colours.length - 1; cut++) {
      acc += count[b.colours[cut - 1]];
      if (acc >= total / 2) break;
    }
    boxes.splice(pick, 1, box(b.colours.slice(0, cut)), box(b.colours.slice(cut)));
  }
  return boxes.map((b) => {
    let n = 0;
    const sum = [0, 0, 0];
    for (const c of b.colours) {
      n += count[c];
      for (let k = 0; k < 3; k++) sum[k] += count[c] * channel(c, k);
    }
    const [r, g, bl] = sum.map((v) => Math.round(v / n));
    return (r << 16) | (g << 8) | bl;
  });
}

/** The opaque raster as an 8-bit palette PNG (transparency is not kept: the report's pictures are opaque). */
export function toPalettePng(r: Raster): Buffer {
  const { width: W, height: H, data } = r;
  const index = new Map<number, number>();
  const pixelColour = new Int32Array(W * H);
  const counts: number[] = [];
  // neighbouring pixels mostly share a colour: the last one found is tried before the map
  let lastColour = -1;
  let lastIndex = -1;
  for (let i = 0; i < W * H; i++) {
    const c = (data[4 * i] << 16) | (data[4 * i + 1] << 8) | data[4 * i + 2];
    let k: number | undefined = lastIndex;
    if (c !== lastColour) {
      k = index.get(c);
      if (k === undefined) {
        k = counts.length;
        index.set(c, k);
        counts.push(0);
      }
      lastColour = c;
      lastIndex = k;
    }
    counts[k]++;
    pixelColour[i] = k;
  }
  const colours = new Int32Array(index.size);
  for (const [c, k] of index) colours[k] = c;
  const palette = colours.length <= 256 ? Array.from(colours) : medianCut(colours, Float64Array.from(counts), 256);
  // Each distinct colour to its nearest palette colour (squared RGB distance), once.
  const toEntry = new Uint8Array(colours.length);
  for (let k = 0; k < colours.length; k++) {
    const c = colours[k];
    let best = 0;
    let bd = Infinity;
    for (let p = 0; p < palette.length; p++) {
      const dr = ((c >> 16) & 255) - ((palette[p] >> 16) & 255);
      const dg = ((c >> 8) & 255) - ((palette[p] >> 8) & 255);
      const db = (c & 255) - (palette[p] & 255);
      const d = dr * dr + dg * dg + db * db;
      if (d < bd) [bd, best] = [d, p];
    }
    toEntry[k] = best;
  }
  const rows = Buffer.alloc((W + 1) * H);
  for (let y = 0; y < H; y++) for (let x = 0; x < W; x++) rows[y * (W + 1) + 1 + x] = toEntry[pixelColour[y * W + x]];
  const plte = Buffer.alloc(3 * palette.length);
  palette.forEach((c, p) => {
    plte[3 * p] = (c >> 16) & 255;
    plte[3 * p + 1] = (c >> 8) & 255;
    plte[3 * p + 2] = c & 255;
  });
  return assemblePng(W, H, 3, deflateSync(rows, { level: 6 }), plte);
}
