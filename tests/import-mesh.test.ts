/**
 * `raiser mesh`: the imported geometry with its tags and the mesh, as a summary and a picture,
 * before anything is solved. Runs the built command line on models around the invented test
 * drawings in meshes/.
 */
import { copyFileSync, existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { describe, expect, it } from 'vitest';
import { drawGeometryPicture, MATERIAL } from '../src/render/geometry-picture.js';
import { buildDomain } from '../src/geometry/domain.js';
import { generateMesh } from '../src/mesh/generate.js';
import { loadModelAndDrawing } from '../src/pipeline/load.js';
import { raiser, ROOT } from './support/cli.js';

const MESHES = join(ROOT, 'meshes');

function modelFile(dir: string, geometry: object, loads: object[]): string {
  const path = join(dir, 'model.json');
  const m = { title: 'Invented test plate', material: { E: 210000, nu: 0.3 }, thickness: 10, geometry, supports: [{ type: 'pin', at: [0, 25] }, { type: 'pin', at: [200, 25], fix: 'y' }], loads, mesh: { size: 5 } };
  writeFileSync(path, JSON.stringify(m, null, 2));
  return path;
}

describe('raiser mesh', () => {
  it('prints the drawing, its loops, tags and what each load selects, and writes mesh-preview.png and mesh-preview.svg', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-mesh-'));
    // A drawing is read from the model file's folder (or, with --allow-drawing-outside, from anywhere).
    copyFileSync(join(MESHES, 'import-plate-hole.dxf'), join(dir, 'import-plate-hole.dxf'));
    const file = modelFile(dir, { from: 'import-plate-hole.dxf' }, [{ type: 'traction', on: 'PULL', normal: 100 }]);
    const r = raiser(['mesh', file, '-o', join(dir, 'out')]);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/geometry from .*import-plate-hole\.dxf \(DXF\), drawing unit mm \(from \$INSUNITS 4\)/);
    expect(r.stdout).toMatch(/1 hole, 5 edges \(4 lines, 1 arc\), area 9921\.5 mm\^2/);
    expect(r.stdout).toMatch(/tags: "EDGE" \(2 edges\), "PULL" \(2 edges\), "HOLE" \(1 edge\)/);
    expect(r.stdout).toMatch(/load 1 \(traction\): 2 edges, 100 mm long/);
    const png = PNG.sync.read(readFileSync(join(dir, 'out', 'mesh-preview.png')));
    expect(png.width).toBe(1600);
    const svg = readFileSync(join(dir, 'out', 'mesh-preview.svg'), 'utf8');
    expect(svg).toMatch(/aria-label="PULL \(2 edges\)"/);
    expect(svg).toMatch(/aria-label="HOLE \(1 edge\)"/);
    // A second run keeps the pictures unless --force.
    expect(raiser(['mesh', file, '-o', join(dir, 'out')]).code).toBe(2);
    expect(raiser(['mesh', file, '-o', join(dir, 'out'), '--force']).code).toBe(0);
  });
  it('--json prints the summary as JSON only', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-mesh-'));
    const file = modelFile(dir, { from: join(MESHES, 'import-plate-hole.svg') }, [{ type: 'traction', on: 'pull', normal: 100 }]);
    const r = raiser(['mesh', file, '--json', '--element', 'linear', '--allow-drawing-outside']);
    expect(r.code, r.stderr).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.loops.map((l: { label: string }) => l.label)).toEqual(['outline', 'hole 1 "bore"']);
    expect(j.mesh.order).toBe(1);
    expect(j.tags.pull).toBe(2);
    expect(existsSync(join(dir, 'out'))).toBe(false);
  });
  it('a bad drawing exits 2 with the place in the model file', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-mesh-'));
    copyFileSync(join(MESHES, 'import-bad-gap.dxf'), join(dir, 'import-bad-gap.dxf'));
    const file = modelFile(dir, { from: 'import-bad-gap.dxf' }, [{ type: 'traction', on: { x: 100 }, normal: 100 }]);
    const r = raiser(['mesh', file]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/model\.json:\d+:\d+: at geometry\.from: .*open contour/);
  });
  it('the picture colours each tag group apart and paints the material', () => {
    const { model, drawing } = loadModelAndDrawing(JSON.stringify({ material: { E: 1, nu: 0.3 }, thickness: 1, geometry: { from: 'import-plate-hole.svg' }, supports: [{ type: 'fixed', on: 'pull' }], loads: [{ type: 'pressure', on: 'bore', p: 1 }] }), join(MESHES, 'm.json'));
    const domain = buildDomain(model.geometry, drawing);
    const { mesh } = generateMesh(domain, { order: 2, size: 10 });
    const pic = drawGeometryPicture({ domain, mesh, title: 'test', lines: [] });
    // "plate" is on every edge, so the groups are told apart by the other tags.
    expect(pic.common).toEqual(['plate']);
    expect(pic.legend.map((g) => g.tags.join(' ')).sort()).toEqual(['bore', 'left-end pull', 'right-end pull', 'sides']);
    expect(new Set(pic.legend.map((g) => g.colour.join())).size).toBe(4);
    // Each group's colour is drawn, and the plate is filled with the material colour.
    const img = PNG.sync.read(pic.png);
    const seen = new Set<string>();
    for (let i = 0; i < img.data.length; i += 4) seen.add(`${img.data[i]},${img.data[i + 1]},${img.data[i + 2]}`);
    for (const g of pic.legend) expect(seen.has(g.colour.join()), g.tags.join()).toBe(true);
    expect(seen.has(MATERIAL.join())).toBe(true);
  });
});
