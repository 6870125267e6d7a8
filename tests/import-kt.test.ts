/**
 * A drawing gives the same Kt as the same plate typed into the model: the invented plate in
 * meshes/import-plate-hole.svg and .dxf (200 x 50 mm, central hole of diameter 10, pulled at
 * both ends with 100 MPa) against the typed model, on the same mesh settings. The geometry is
 * the same to round-off, so only the mesh (whose points start elsewhere on the loops) differs:
 * the brief asks for agreement within 0.5%; measured 0.04% (SVG) and 0 (DXF, same loop order).
 */
import { describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { analyseModel } from '../src/pipeline/analyse.js';
import { loadModelAndDrawing } from '../src/pipeline/load.js';
import { ktOf } from './support/kt.js';

const MESHES = join(import.meta.dirname, '..', 'meshes');

const base = {
  material: { E: 210000, nu: 0.3 },
  thickness: 10,
  supports: [
    { type: 'pin', at: [0, 25] },
    { type: 'pin', at: [200, 25], fix: 'y' },
  ],
  mesh: { size: 5, raiserSize: 0.4 },
};

function kt(model: Record<string, unknown>) {
  const { model: m, drawing } = loadModelAndDrawing(JSON.stringify({ ...base, ...model }), join(MESHES, 'plate-hole.json'));
  const a = analyseModel(m, { drawing });
  return a;
}

describe('Kt from a drawing', () => {
  const typed = kt({
    geometry: {
      outline: { shape: 'path', path: [[0, 0], { at: [200, 0], edge: 'pull' }, [200, 50], { at: [0, 50], edge: 'pull' }] },
      holes: [{ shape: 'circle', center: [100, 25], diameter: 10 }],
    },
    loads: [{ type: 'traction', on: 'pull', normal: 100 }],
  });
  it('the typed plate has the Kt of a plate with a hole of d/W = 0.2 (net 2.5, within the 2% of this mesh)', () => {
    // Net-section Kt about 2.51 for d/W = 0.2 in tension (Howland's solution as charted by
    // Peterson, recalled [M]); this single mesh is checked loosely, the comparison below is the test.
    expect(ktOf(typed).net!).toBeGreaterThan(2.45);
    expect(ktOf(typed).net!).toBeLessThan(2.58);
    expect(typed.peak.feature).toMatch(/hole 1/);
  });
  it('the SVG drawing, its ends tagged by class "pull", gives the typed Kt within 0.5%', () => {
    const svg = kt({ geometry: { from: 'import-plate-hole.svg' }, loads: [{ type: 'traction', on: 'pull', normal: 100 }] });
    expect(Math.abs(ktOf(svg).net! / ktOf(typed).net! - 1)).toBeLessThan(0.005);
    expect(Math.abs(ktOf(svg).gross! / ktOf(typed).gross! - 1)).toBeLessThan(0.005);
    expect(svg.peak.feature).toBe('hole 1 "bore"');
  });
  it('the DXF drawing, its ends on layer PULL, gives the typed Kt within 0.5%', () => {
    const dxf = kt({ geometry: { from: 'import-plate-hole.dxf' }, loads: [{ type: 'traction', on: 'PULL', normal: 100 }] });
    expect(Math.abs(ktOf(dxf).net! / ktOf(typed).net! - 1)).toBeLessThan(0.005);
    expect(Math.abs(ktOf(dxf).gross! / ktOf(typed).gross! - 1)).toBeLessThan(0.005);
  });
  it('geometric selectors work on the imported shape: the ends as { "x": 0 } and { "x": 200 }', () => {
    const dxf = kt({ geometry: { from: 'import-plate-hole.dxf' }, loads: [{ type: 'traction', on: [{ x: 0 }, { x: 200 }], normal: 100 }] });
    expect(Math.abs(ktOf(dxf).net! / ktOf(typed).net! - 1)).toBeLessThan(0.005);
  });
});
