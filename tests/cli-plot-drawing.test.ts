/**
 * `raiser plot` of a saved solution whose model reads its geometry from a drawing
 * (geometry.from): the saved solution holds all the pictures need (the mesh, and where the
 * finite element stage applied the loads and supports), so the drawing may be gone. The part is
 * meshes/import-plate-hole.svg, our own invented test drawing (a 200 x 50 plate with a bore).
 */
import { describe, expect, it } from 'vitest';
import { copyFileSync, existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { raiser } from './support/cli.js';
import { LOAD_COLOUR, SUPPORT_COLOUR } from '../src/render/boundary-conditions.js';

/** Pixels within a small distance of a colour. */
function countColour(png: PNG, c: readonly number[]): number {
  let n = 0;
  for (let o = 0; o < png.data.length; o += 4) if (Math.abs(png.data[o] - c[0]) + Math.abs(png.data[o + 1] - c[1]) + Math.abs(png.data[o + 2] - c[2]) < 40) n++;
  return n;
}

describe('raiser plot without the drawing the geometry came from', () => {
  it('save, delete the drawing, plot: the geometry picture still shows the loads and supports', () => {
    const dir = mkdtempSync(join(tmpdir(), 'raiser-plot-drawing-'));
    copyFileSync(join('meshes', 'import-plate-hole.svg'), join(dir, 'plate.svg'));
    const model = join(dir, 'plate.json');
    writeFileSync(
      model,
      JSON.stringify({
        title: 'Invented plate with a bore, read from a drawing (test scenario)',
        material: { E: 210000, nu: 0.3 },
        thickness: 10,
        geometry: { from: 'plate.svg' },
        supports: [{ type: 'pin', at: [0, 25] }, { type: 'pin', at: [200, 25], fix: 'y' }],
        loads: [{ type: 'traction', on: 'pull', normal: 100 }],
        mesh: { size: 8, raiserSize: 1 },
      }),
    );
    const out = join(dir, 'solved');
    const s = raiser(['solve', model, '--single-mesh', '-o', out, '--picture-size', '800x500']);
    expect(s.code, s.stderr).toBe(0);
    const before = PNG.sync.read(readFileSync(join(out, 'geometry.png')));
    rmSync(join(dir, 'plate.svg'));
    const again = join(dir, 'again');
    const p = raiser(['plot', out, '-o', again, '--picture-size', '800x500', '--format', 'png']);
    expect(p.code, p.stderr).toBe(0);
    expect(existsSync(join(again, 'contour.png'))).toBe(true);
    const after = PNG.sync.read(readFileSync(join(again, 'geometry.png')));
    expect(countColour(after, LOAD_COLOUR)).toBeGreaterThan(50);
    expect(countColour(after, SUPPORT_COLOUR)).toBeGreaterThan(10);
    // the same picture as the solve drew while the drawing was there
    expect(Buffer.compare(after.data, before.data)).toBe(0);
    rmSync(dir, { recursive: true, force: true });
  });
});
