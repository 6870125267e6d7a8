/**
 * Loads and supports on the geometry picture, checked on decoded pixels: the strap of
 * examples/strap-bolt-hole.json (an invented part) is held on its left end and pulled on its
 * right end, so the support colour must appear just left of the plate and the load arrows
 * just right of it, pointing away (to +x), and neither colour anywhere else off the plate.
 */
import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { loadModelFile } from '../src/model/load.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { buildResult } from '../src/report/result.js';
import { plotSource } from '../src/report/saved.js';
import { geometryScene } from '../src/report/pictures.js';
import { renderPng } from '../src/render/scene.js';
import { toPixel, type View } from '../src/render/field.js';
import { LOAD_COLOUR, SUPPORT_COLOUR } from '../src/render/boundary-conditions.js';

describe('geometry picture: loads and supports', () => {
  const { model } = loadModelFile('examples/strap-bolt-hole.json');
  const a = analyseModel(model);
  const src = plotSource(a, buildResult(a, 'examples/strap-bolt-hole.json'), '2024-01-02T03:04:05Z');
  const scene = geometryScene(src, { width: 1200 });
  const png = PNG.sync.read(renderPng(scene).toPng());
  const view = scene.info.view as View;
  const [x0, y0, x1, y1] = a.domain.bbox;
  const [left, top] = toPixel(view, x0, y1);
  const [right, bottom] = toPixel(view, x1, y0);
  const near = (x: number, y: number, c: readonly number[]) => {
    const o = 4 * (y * png.width + x);
    return Math.abs(png.data[o] - c[0]) + Math.abs(png.data[o + 1] - c[1]) + Math.abs(png.data[o + 2] - c[2]) < 40;
  };
  const count = (c: readonly number[], xa: number, xb: number, ya: number, yb: number) => {
    let n = 0;
    for (let y = Math.max(0, Math.floor(ya)); y < Math.min(png.height, Math.ceil(yb)); y++) for (let x = Math.max(0, Math.floor(xa)); x < Math.min(png.width, Math.ceil(xb)); x++) if (near(x, y, c)) n++;
    return n;
  };

  it('draws one load and one support', () => {
    expect(scene.info.boundaryConditions).toEqual({ loads: 1, supports: 1 });
  });

  it('the support colour lies along the held left end, the load arrows beyond the pulled right end', () => {
    const band = 60;
    expect(count(SUPPORT_COLOUR, left - band, left + 3, top, bottom)).toBeGreaterThan(50);
    expect(count(LOAD_COLOUR, right + 2, right + band, top, bottom)).toBeGreaterThan(50);
    // none of either above or below the plate, nor the load on the left or the support on the right
    expect(count(LOAD_COLOUR, 0, png.width, 0, top - 25)).toBe(0);
    expect(count(SUPPORT_COLOUR, right + 2, png.width, 0, png.height)).toBe(0);
    expect(count(LOAD_COLOUR, 0, left - 2, 0, png.height)).toBe(0);
  });

  it('the arrows point away from the part (+x): their heads are the widest part, at the far end', () => {
    // per column right of the plate, how many load-coloured pixels: the head columns hold more than the shaft columns
    const cols: number[] = [];
    for (let x = Math.ceil(right) + 2; x < Math.ceil(right) + 45; x++) cols.push(count(LOAD_COLOUR, x, x + 1, top, bottom));
    const nonzero = cols.map((c, i) => [c, i]).filter(([c]) => c > 0);
    const first = nonzero.slice(0, 5).reduce((s, [c]) => s + c, 0) / 5;
    const heaviest = nonzero.reduce((b, x) => (x[0] > b[0] ? x : b));
    expect(heaviest[1]).toBeGreaterThan(nonzero[0][1] + 10);
    expect(heaviest[0]).toBeGreaterThan(2 * first);
  });
});

describe('geometry picture of an imported drawing', () => {
  // meshes/import-plate-hole.svg: our own test drawing, a 200 x 50 plate with a central bore
  it('draws the loads and supports from the solution, also when the model no longer holds its drawing', async () => {
    const { join } = await import('node:path');
    const { loadModelAndDrawing } = await import('../src/pipeline/load.js');
    const file = join('meshes', 'plate-hole-from-svg.json');
    const text = JSON.stringify({
      material: { E: 210000, nu: 0.3 },
      thickness: 10,
      geometry: { from: 'import-plate-hole.svg' },
      supports: [{ type: 'pin', at: [0, 25] }, { type: 'pin', at: [200, 25], fix: 'y' }],
      loads: [{ type: 'traction', on: 'pull', normal: 100 }],
      mesh: { size: 8, raiserSize: 1 },
    });
    const { model, drawing } = loadModelAndDrawing(text, file);
    const a = analyseModel(model, { drawing });
    const result = buildResult(a, file);
    expect(geometryScene(plotSource(a, result), { width: 800 }).info.boundaryConditions).toEqual({ loads: 1, supports: 2 });
    // as a saved solution holds it: the model without its drawing; the loads and supports come
    // from the result (where the finite element stage applied them), not from the drawing
    const saved = JSON.parse(JSON.stringify(model));
    const bare = geometryScene({ ...plotSource(a, result), model: saved }, { width: 800 });
    expect(bare.info.boundaryConditions).toEqual({ loads: 1, supports: 2 });
    expect(bare.items.some((it) => it.kind === 'text' && it.text.includes('loads and supports not drawn'))).toBe(false);
  });
});
