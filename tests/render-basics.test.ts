/**
 * The drawing kernel: the colour map's published table and its rising lightness, the round
 * numbers of legends and axes, exact antialiased coverage of filled paths, and text drawn from
 * the glyph outlines of the shipped font.
 */
import { describe, expect, it } from 'vitest';
import { BATLOW } from '../src/render/batlow.js';
import { colourAt, colourBytes, DEFAULT_MAP, lightness } from '../src/render/colormap.js';
import { capHeight, layoutText, textWidth } from '../src/render/font.js';
import { Raster } from '../src/render/raster.js';
import { decimalsFor, formatTicks, formatValue, niceStep, roundDown125, ticksIn } from '../src/render/ticks.js';

describe('colour map', () => {
  it('is the 256-entry batlow table, starting and ending at its published colours', () => {
    expect(BATLOW.length).toBe(3 * 256);
    // First and last rows of batlow.txt (Crameri 2018, version 7).
    expect(Array.from(BATLOW.slice(0, 3))).toEqual([0.0051932, 0.098238, 0.34984]);
    expect(Array.from(BATLOW.slice(765))).toEqual([0.98135, 0.80041, 0.98127]);
    expect(colourAt(DEFAULT_MAP, 0).map((v) => v / 255)).toEqual([0.0051932, 0.098238, 0.34984].map((v) => expect.closeTo(v, 12)));
    expect(colourBytes(DEFAULT_MAP, 2)).toEqual(colourBytes(DEFAULT_MAP, 1));
  });

  it('rises in lightness (CIE L*) at every step, so it reads in order in grey-scale print', () => {
    let prev = -1;
    for (let k = 0; k <= 1000; k++) {
      const c = colourAt(DEFAULT_MAP, k / 1000);
      const L = lightness(c[0], c[1], c[2]);
      expect(L).toBeGreaterThan(prev);
      prev = L;
    }
    expect(lightness(...(colourAt(DEFAULT_MAP, 0) as [number, number, number]))).toBeLessThan(15);
    expect(prev).toBeGreaterThan(85);
  });

  it('is continuous: neighbouring values never jump (no bands)', () => {
    for (let k = 0; k < 2000; k++) {
      const a = colourAt(DEFAULT_MAP, k / 2000);
      const b = colourAt(DEFAULT_MAP, (k + 1) / 2000);
      for (let c = 0; c < 3; c++) expect(Math.abs(a[c] - b[c])).toBeLessThan(1);
    }
  });
});

describe('round numbers', () => {
  it('steps of 1, 2, 2.5 and 5 times a power of ten', () => {
    expect(niceStep(-5.015, 292.4, 8)).toBe(50);
    expect(niceStep(0, 1, 4)).toBe(0.25);
    expect(niceStep(0, 1, 5)).toBe(0.2);
    expect(niceStep(0, 0.013, 6)).toBeCloseTo(0.0025, 15);
    expect(niceStep(100, 1100, 10)).toBe(100);
    expect(ticksIn(-5.015, 292.4, 50)).toEqual([0, 50, 100, 150, 200, 250]);
    expect(ticksIn(-0.3, 0.3, 0.1).map((v) => Number(v.toFixed(10)))).toEqual([-0.3, -0.2, -0.1, 0, 0.1, 0.2, 0.3]);
  });

  it('labels every tick with the decimals its step needs, with a true minus sign', () => {
    expect(decimalsFor(2.5)).toBe(1);
    expect(decimalsFor(0.25)).toBe(2);
    expect(decimalsFor(50)).toBe(0);
    expect(formatTicks([0, 2.5, 5], 2.5)).toEqual(['0.0', '2.5', '5.0']);
    expect(formatTicks([-50, 0, 50], 50)).toEqual(['\u221250', '0', '50']);
    expect(formatTicks([0, 2e6, 4e6], 2e6)).toEqual(['0', '2e+6', '4e+6']);
    expect(formatValue(292.38912)).toBe('292.4');
    expect(formatValue(-5.01523)).toBe('\u22125.015');
    expect(formatValue(1.2346e-5)).toBe('1.235e-5');
    expect(roundDown125(66)).toBe(50);
    expect(roundDown125(19.9)).toBe(10);
    expect(roundDown125(0.031)).toBe(0.02);
  });
});

describe('raster', () => {
  it('covers a filled square with exactly its area, antialiased at fractional edges', () => {
    const r = new Raster(40, 40, [255, 255, 255]);
    r.fillPath([[5.25, 5.5, 15.25, 5.5, 15.25, 15.5, 5.25, 15.5]], [0, 0, 0]);
    let covered = 0;
    for (let i = 0; i < 40 * 40; i++) covered += (255 - r.data[4 * i]) / 255;
    expect(covered).toBeCloseTo(100, 1);
    expect(r.get(10, 10)[0]).toBe(0);
    expect(r.get(5, 10)[0]).toBe(Math.round(255 * 0.25)); // pixel 5 covered from x = 5.25: 75%
  });

  it('cuts a hole where a subpath runs the other way, as the holes of a plate do', () => {
    const r = new Raster(30, 30, [255, 255, 255]);
    r.fillPath([[2, 2, 28, 2, 28, 28, 2, 28], [10, 10, 10, 20, 20, 20, 20, 10]], [0, 0, 0]);
    expect(r.get(5, 5)[0]).toBe(0);
    expect(r.get(15, 15)[0]).toBe(255);
  });

  it('clips fills to the clip box and to the raster', () => {
    const r = new Raster(20, 20, [255, 255, 255]);
    r.setClip([0, 0, 10, 20]);
    r.fillPath([[-30, -30, 50, -30, 50, 50, -30, 50]], [0, 0, 0]);
    r.setClip(null);
    expect(r.get(9, 5)[0]).toBe(0);
    expect(r.get(10, 5)[0]).toBe(255);
  });
});

describe('text', () => {
  it('is drawn from the glyph outlines of DejaVu Sans: ink inside the text box, none outside', () => {
    const r = new Raster(200, 40, [255, 255, 255]);
    const t = layoutText('Kt 2.515', 10, 28, 20);
    r.fillPath(t.polygons, [0, 0, 0]);
    expect(textWidth('Kt 2.515', 20)).toBeGreaterThan(60);
    expect(t.polygons.length).toBeGreaterThan(6);
    let inside = 0;
    let outside = 0;
    for (let y = 0; y < 40; y++) {
      for (let x = 0; x < 200; x++) {
        const ink = r.get(x, y)[0] < 250;
        const inBox = x >= t.box[0] - 1 && x <= t.box[2] + 1 && y >= t.box[1] - 1 && y <= t.box[3] + 1;
        if (ink && inBox) inside++;
        if (ink && !inBox) outside++;
      }
    }
    expect(inside).toBeGreaterThan(150);
    expect(outside).toBe(0);
    // Antialiased: there are grey edge pixels, not only black and white.
    let grey = 0;
    for (let i = 0; i < 200 * 40; i++) if (r.data[4 * i] > 30 && r.data[4 * i] < 225) grey++;
    expect(grey).toBeGreaterThan(40);
    // Digits stand on the baseline and reach the cap height.
    let topInk = 40;
    for (let y = 0; y < 40 && topInk === 40; y++) for (let x = 0; x < 200; x++) if (r.get(x, y)[0] < 128) topInk = y;
    expect(Math.abs(28 - capHeight(20) - topInk)).toBeLessThanOrEqual(1.5);
  });
});
