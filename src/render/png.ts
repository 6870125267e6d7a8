/**
 * PNG files written directly: the signature, IHDR, one IDAT and IEND (PNG specification, W3C
 * second edition 2003, sections 5.2-5.3 and 11.2), the scanlines filtered and compressed by
 * node:zlib. Chunk CRCs: the CRC-32 of ISO 3309 / ITU-T V.42 over type and data (section 5.5).
 *
 * The true-colour writer makes the same bytes as pngjs 7 did with the options raiser used
 * (8-bit RGB when every pixel is opaque, RGBA otherwise; Paeth filter, type 4, on every row;
 * zlib at level 6 with the run-length strategy Z_RLE and a 32 KiB chunk size): the filtered
 * bytes are the same and so is the compressed stream (tests/render-png.test.ts compares the
 * two on several rasters). It works on typed arrays in one pass per row instead of a call per
 * byte, and packs RGBA to RGB without a per-pixel function.
 *
 * Why level 6 stays: with Z_RLE, zlib's deflate() runs its run-length matcher (deflate_rle),
 * which reads none of the level's tuning (lazy matching, chain length), and the zlib header's
 * level bits are zero for this strategy at every level, so levels 1 to 9 give the same bytes and
 * the same time; only level 0 (stored, no compression) differs.
 */
import * as zlib from 'node:zlib';

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

/** CRC-32 (PNG specification, section 5.5): node:zlib's when this Node has it (20.15 and later), else a table. */
function crc32(buf: Uint8Array): number {
  const native = (zlib as { crc32?: (data: Uint8Array) => number }).crc32;
  if (native) return native(buf) >>> 0;
  let c = 0xffffffff;
  for (let i = 0; i < buf.length; i++) c = CRC_TABLE[(c ^ buf[i]) & 255] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/** One chunk: length, type, data, CRC of type and data. */
function chunk(type: string, data: Uint8Array): Buffer {
  const out = Buffer.alloc(12 + data.length);
  out.writeUInt32BE(data.length, 0);
  out.write(type, 4, 'latin1');
  out.set(data, 8);
  out.writeUInt32BE(crc32(out.subarray(4, 8 + data.length)), 8 + data.length);
  return out;
}

const SIGNATURE = Buffer.from([137, 80, 78, 71, 13, 10, 26, 10]);

/** A PNG of 8-bit samples: colour type 2 (RGB), 3 (palette, with `palette` as PLTE bytes) or 6 (RGBA). */
export function assemblePng(width: number, height: number, colourType: 2 | 3 | 6, idat: Uint8Array, palette?: Uint8Array): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = colourType;
  // compression 0, filter method 0, no interlace
  const parts = [SIGNATURE, chunk('IHDR', ihdr)];
  if (palette) parts.push(chunk('PLTE', palette));
  parts.push(chunk('IDAT', idat), chunk('IEND', new Uint8Array(0)));
  return Buffer.concat(parts);
}

/** The deflate options of the true-colour pictures (see the header: the level does not change the bytes). */
const TRUE_COLOUR_DEFLATE: zlib.ZlibOptions = { chunkSize: 32 * 1024, level: 6, strategy: zlib.constants.Z_RLE };

/**
 * Scanlines of `bpp` bytes per pixel (3 or 4) taken from RGBA pixels, each row with the filter
 * byte 4 and Paeth-filtered (PNG specification, section 9.4): x - predictor(left, up, up-left),
 * modulo 256, zero outside the image.
 */
function paethScanlines(rgba: Uint8Array, width: number, height: number, bpp: 3 | 4): Uint8Array {
  const row = width * bpp;
  const out = new Uint8Array((row + 1) * height);
  // the raw samples of this row and the previous one (zeros above the first)
  let cur = new Uint8Array(row);
  let prev = new Uint8Array(row);
  const pixels = Buffer.from(rgba.buffer, rgba.byteOffset, rgba.byteLength);
  const rgbaRow = 4 * width;
  for (let y = 0; y < height; y++) {
    const src = 4 * width * y;
    // A row equal to the one above filters to zeros (up = x, and left = up-left, so the
    // predictor is up): the output is zero already, and the previous row stays what it was.
    // Common in the margins and flat backgrounds; compared natively.
    if (y > 0 && pixels.compare(pixels, src - rgbaRow, src, src, src + rgbaRow) === 0) {
      out[y * (row + 1)] = 4;
      continue;
    }
    if (bpp === 4) cur.set(rgba.subarray(src, src + row));
    else {
      for (let x = 0, i = src, o = 0; x < width; x++, i += 4, o += 3) {
        cur[o] = rgba[i];
        cur[o + 1] = rgba[i + 1];
        cur[o + 2] = rgba[i + 2];
      }
    }
    const base = y * (row + 1);
    out[base] = 4;
    const o = base + 1;
    // the first pixel: left and up-left are zero, so the predictor is `up`
    for (let x = 0; x < bpp; x++) out[o + x] = cur[x] - prev[x];
    for (let x = bpp; x < row; x++) {
      const a = cur[x - bpp];
      const b = prev[x];
      const c = prev[x - bpp];
      // Where up-left equals left the predictor is `up`, where it equals up it is `left` (p is
      // then b or a, at distance 0): the flat regions of a picture take no further test.
      if (c === a) out[o + x] = cur[x] - b;
      else if (c === b) out[o + x] = cur[x] - a;
      else {
        const p = a + b - c;
        const pa = p > a ? p - a : a - p;
        const pb = p > b ? p - b : b - p;
        const pc = p > c ? p - c : c - p;
        out[o + x] = cur[x] - (pa <= pb && pa <= pc ? a : pb <= pc ? b : c);
      }
    }
    const t = prev;
    prev = cur;
    cur = t;
  }
  return out;
}

/** RGBA pixels (row by row from the top) as a PNG: RGB when every pixel is opaque, RGBA otherwise. */
export function encodePng(rgba: Uint8Array, width: number, height: number): Buffer {
  if (rgba.length !== 4 * width * height) throw new RangeError(`encodePng: ${rgba.length} bytes for ${width} x ${height} RGBA pixels`);
  let opaque = true;
  for (let i = 3; i < rgba.length; i += 4) {
    if (rgba[i] !== 255) {
      opaque = false;
      break;
    }
  }
  const filtered = paethScanlines(rgba, width, height, opaque ? 3 : 4);
  return assemblePng(width, height, opaque ? 2 : 6, zlib.deflateSync(filtered, TRUE_COLOUR_DEFLATE));
}
