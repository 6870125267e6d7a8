/**
 * The 256-colour PNG writer (src/render/png-palette.ts), decoded by pngjs, an independent PNG
 * reader: an image of at most 256 colours comes back exactly; a ramp of 16 x 16 x 16 colours in
 * steps of 17 levels comes back within two steps (median cut, P. Heckbert, SIGGRAPH 1982: 256
 * boxes over 4096 equally common colours hold 16 colours each, at best 2 x 2 x 4, so a colour
 * may sit 1.5 steps = 25.5 levels from its box's mean in one channel).
 */
import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { Raster } from '../src/render/raster.js';
import { toPalettePng } from '../src/render/png-palette.js';

describe('toPalettePng', () => {
  it('keeps an image of at most 256 colours exactly', () => {
    const r = new Raster(37, 23);
    for (let y = 0; y < 23; y++) for (let x = 0; x < 37; x++) r.set(x, y, [(x % 8) * 30, (y % 8) * 30, ((x + y) % 4) * 60]); // 8 x 8 x 4 = 256 colours
    const png = PNG.sync.read(toPalettePng(r));
    expect([png.width, png.height]).toEqual([37, 23]);
    for (let i = 0; i < 37 * 23; i++) for (let c = 0; c < 3; c++) expect(png.data[4 * i + c]).toBe(r.data[4 * i + c]);
  });

  it('brings 4096 colours to 256 with every pixel within two ramp steps (34 levels) and the mean at the optimum for boxes of 16', () => {
    const r = new Raster(64, 64);
    for (let y = 0; y < 64; y++) for (let x = 0; x < 64; x++) r.set(x, y, [(x % 16) * 17, (y % 16) * 17, (Math.floor(x / 16) + 4 * Math.floor(y / 16)) * 17]);
    const png = PNG.sync.read(toPalettePng(r));
    let worst = 0;
    let sum = 0;
    for (let i = 0; i < 64 * 64; i++) {
      for (let c = 0; c < 3; c++) {
        const d = Math.abs(png.data[4 * i + c] - r.data[4 * i + c]);
        worst = Math.max(worst, d);
        sum += d;
      }
    }
    process.stdout.write(`palette ramp: worst ${worst}, mean ${(sum / (3 * 64 * 64)).toFixed(2)} levels\n`);
    expect(worst).toBeLessThanOrEqual(34);
    // boxes of 2 x 2 x 4 colours: mean distance to the box mean (0.5 + 0.5 + 1) / 3 steps = 11.33 levels, the least for 16
    expect(sum / (3 * 64 * 64)).toBeLessThanOrEqual(11.34);
  });
});
