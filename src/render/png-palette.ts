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
 * help, PNG specification 1.2, section 12.8) and compressed by zlib at level 9.
 * Chunk layout and CRC: PNG specification (W3C, second edition, 2003), sections 5.3 and 11.2.
 */
import { deflateSync } from 'node:zlib';
import type { Raster } from './raster.js';

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

function crc32(buf: Uint8Array): number {
  let c = 0xffffffff;
  for (let i = 0; i < buf.length; i++) c = CRC_TABLE[(c ^ buf[i]) & 255] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Uint8Array): Buffer {
  const out = Buffer.alloc(12 + data.length);
  out.writeUInt32BE(data.length, 0);
  out.write(type, 4, 'latin1');
  out.set(data, 8);
  out.writeUInt32BE(crc32(out.subarray(4, 8 + data.length)), 8 + data.length);
  return out;
}

interface Box {
  /** indices into the colour list */
  colours: number[];
}

/** Up to `most` palette colours (packed 0xRRGGBB) for the colours `rgb` seen `count` times each, by median cut. */
function medianCut(rgb: Int32Array, count: Float64Array, most: number): number[] {
  const channel = (c: number, k: number) => (rgb[c] >> (16 - 8 * k)) & 255;
  const spread = (b: Box): [number, number] => {
    let best = -1;
    let axis = 0;
    for (let k = 0; k < 3; k++) {
      let lo = 255;
      let hi = 0;
      let n = 0;
      for (const c of b.colours) {
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
  const boxes: Box[] = [{ colours: Array.from({ length: rgb.length }, (_, i) => i) }];
  while (boxes.length < most) {
    let pick = -1;
    let pickAxis = 0;
    let pickSpread = 0;
    boxes.forEach((b, i) => {
      if (b.colours.length < 2) return;
      const [s, axis] = spread(b);
      if (s > pickSpread) [pick, pickAxis, pickSpread] = [i, axis, s];
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
    boxes.splice(pick, 1, { colours: b.colours.slice(0, cut) }, { colours: b.colours.slice(cut) });
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
  for (let i = 0; i < W * H; i++) {
    const c = (data[4 * i] << 16) | (data[4 * i + 1] << 8) | data[4 * i + 2];
    let k = index.get(c);
    if (k === undefined) {
      k = counts.length;
      index.set(c, k);
      counts.push(0);
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
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(W, 0);
  ihdr.writeUInt32BE(H, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 3; // colour type: palette
  const plte = Buffer.alloc(3 * palette.length);
  palette.forEach((c, p) => {
    plte[3 * p] = (c >> 16) & 255;
    plte[3 * p + 1] = (c >> 8) & 255;
    plte[3 * p + 2] = c & 255;
  });
  const signature = Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]);
  return Buffer.concat([signature, chunk('IHDR', ihdr), chunk('PLTE', plte), chunk('IDAT', deflateSync(rows, { level: 9 })), chunk('IEND', Buffer.alloc(0))]);
}
