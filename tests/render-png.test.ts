/**
 * The true-colour PNG writer (src/render/png.ts) against pngjs, an independent PNG library:
 *  - decoded by pngjs, every pixel comes back exactly (PNG is lossless: PNG specification, W3C
 *    second edition 2003, section 1; 8-bit RGB for an opaque raster, RGBA otherwise, section 11.2.2);
 *  - its bytes equal those pngjs 7 writes with the options raiser used before (Paeth on every row,
 *    zlib level 6 with the Z_RLE strategy, section 9.4 and 10), so the pictures stay the same files;
 *  - the chunk CRCs are those of the CRC-32 of ISO 3309 (section 5.5), checked by recomputing them
 *    from the specification's algorithm, and pngjs refuses a file whose CRC is wrong (so its
 *    reading above does check them).
 * The rasters: flat colour, antialiased fills, a transparent layer, random bytes (where Paeth's
 * three-way choice and the wrap modulo 256 are exercised), odd sizes and a single pixel.
 */
import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { createRequire } from 'node:module';
import { constants } from 'node:zlib';
import { Raster } from '../src/render/raster.js';
import { encodePng } from '../src/render/png.js';

/** A small deterministic generator (the 32-bit xorshift of G. Marsaglia, J. Stat. Softw. 8(14), 2003). */
function xorshift(seed: number): () => number {
  let s = seed >>> 0 || 1;
  return () => {
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return s;
  };
}

function rasters(): [string, Raster][] {
  const out: [string, Raster][] = [];
  out.push(['one white pixel', new Raster(1, 1)]);
  const flat = new Raster(40, 7, [12, 200, 77]);
  out.push(['flat colour 40 x 7', flat]);
  const drawn = new Raster(123, 61);
  drawn.fillPath([[3.2, 4.7, 110.5, 9.1, 60.3, 57.9]], [200, 40, 30]);
  drawn.strokePolyline([5, 50, 40, 10, 118, 55], 2.5, [20, 20, 28], 0.6);
  out.push(['antialiased fills 123 x 61', drawn]);
  const layer = new Raster(57, 33, null);
  layer.fillPath([[10, 3, 50, 8, 30, 30]], [90, 160, 210], 0.7);
  out.push(['transparent layer 57 x 33', layer]);
  for (const [w, h, seed] of [
    [31, 17, 1],
    [64, 9, 7],
  ]) {
    const r = new Raster(w, h);
    const next = xorshift(seed);
    for (let i = 0; i < r.data.length; i++) r.data[i] = next() & 255;
    out.push([`random RGBA ${w} x ${h}`, r]);
    const o = new Raster(w, h);
    for (let i = 0; i < o.data.length; i++) o.data[i] = i % 4 === 3 ? 255 : next() & 255;
    out.push([`random opaque ${w} x ${h}`, o]);
  }
  return out;
}

/** What pngjs 7 wrote for a raster with raiser's former options (Raster.toPng before src/render/png.ts). */
function pngjsBytes(r: Raster): Buffer {
  const png = new PNG({ width: r.width, height: r.height });
  png.data = Buffer.from(r.data.buffer, r.data.byteOffset, r.data.byteLength);
  let opaque = true;
  for (let i = 3; i < r.data.length; i += 4) if (r.data[i] !== 255) opaque = false;
  return PNG.sync.write(png, { colorType: opaque ? 2 : 6, inputColorType: 6, deflateLevel: 6, filterType: 4 });
}

/** CRC-32 bit by bit (PNG specification, annex D: polynomial 0xedb88320, reflected). */
function crcBitwise(b: Uint8Array): number {
  let c = 0xffffffff;
  for (const byte of b) {
    c ^= byte;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
  }
  return (c ^ 0xffffffff) >>> 0;
}

describe('encodePng', () => {
  it('pngjs was writing with the run-length strategy (Z_RLE = 3), the premise of the level note in png.ts', () => {
    expect(constants.Z_RLE).toBe(3);
    // pngjs's packer: deflateStrategy defaults to 3 when not given (lib/packer.js), and raiser never gave one
    const Packer = createRequire(import.meta.url)('pngjs/lib/packer.js') as new (o: object) => unknown;
    const opts = (new Packer({}) as { getDeflateOptions(): { strategy: number } }).getDeflateOptions();
    expect(opts.strategy).toBe(3);
  });

  for (const [name, r] of rasters()) {
    it(`${name}: the same bytes as pngjs, and decoded by pngjs to the same pixels`, () => {
      const bytes = encodePng(r.data, r.width, r.height);
      expect(bytes.equals(pngjsBytes(r))).toBe(true);
      const back = PNG.sync.read(bytes);
      expect([back.width, back.height]).toEqual([r.width, r.height]);
      expect(Buffer.from(back.data).equals(Buffer.from(r.data))).toBe(true);
    });
  }

  it('every chunk carries the CRC-32 of its type and data', () => {
    const r = rasters()[2][1];
    const b = encodePng(r.data, r.width, r.height);
    const types: string[] = [];
    let o = 8;
    while (o < b.length) {
      const n = b.readUInt32BE(o);
      types.push(b.toString('latin1', o + 4, o + 8));
      expect(b.readUInt32BE(o + 8 + n)).toBe(crcBitwise(b.subarray(o + 4, o + 8 + n)));
      o += 12 + n;
    }
    expect(types).toEqual(['IHDR', 'IDAT', 'IEND']);
    // a wrong CRC is refused by the reader, so the decoding tests above do check the CRCs
    const bad = Buffer.from(b);
    bad[bad.length - 1] ^= 1;
    expect(() => PNG.sync.read(bad)).toThrow();
  });

  it('refuses pixel data of the wrong length', () => {
    expect(() => encodePng(new Uint8Array(11), 2, 2)).toThrow(RangeError);
  });
});
