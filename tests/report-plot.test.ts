/**
 * `raiser plot` as a user meets it: pictures drawn again from the saved solution of
 * `raiser solve -o` with another measure, size, range and window, without solving; existing
 * pictures kept unless --force; bad options exit 2 with the option named.
 */
import { describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import { raiser } from './support/cli.js';

const tmp = mkdtempSync(join(tmpdir(), 'raiser-plot-'));
const out = join(tmp, 'solved');

describe('raiser plot', () => {
  it('solve --single-mesh -o writes the saved solution and pictures; plot redraws them with other options', () => {
    const s = raiser(['solve', 'examples/strap-bolt-hole.json', '--single-mesh', '-o', out, '--picture-size', '800x500']);
    expect(s.code).toBe(0);
    expect(existsSync(join(out, 'solution.raiser'))).toBe(true);
    expect(existsSync(join(out, 'convergence.png'))).toBe(false);
    const first = PNG.sync.read(readFileSync(join(out, 'contour.png')));
    expect(first.width).toBe(800);
    const again = join(tmp, 'vm');
    const p = raiser(['plot', out, '-o', again, '--measure', 'von-mises', '--picture-size', '700x450', '--range', '0:250', '--only', 'contour,peak,section', '--format', 'png', '--no-iso']);
    expect(p.code, p.stderr).toBe(0);
    expect(p.stdout).toContain('wrote');
    const vm = PNG.sync.read(readFileSync(join(again, 'contour.png')));
    expect([vm.width, vm.height]).toEqual([700, 450]);
    expect(existsSync(join(again, 'contour.svg'))).toBe(false);
    expect(existsSync(join(again, 'mesh.png'))).toBe(false);
    expect(existsSync(join(again, 'peak.png'))).toBe(true);
    expect(existsSync(join(again, 'section.png'))).toBe(true);
  });

  it('keeps existing pictures unless --force, and draws a zoom window with mesh lines and the report', () => {
    const kept = raiser(['plot', join(out, 'solution.raiser')]);
    expect(kept.code).toBe(2);
    expect(kept.stderr).toContain('--force');
    const z = raiser(['plot', join(out, 'solution.raiser'), '--force', '--window', '130,16,170,56', '--mesh', '--only', 'contour', '--report']);
    expect(z.code, z.stderr).toBe(0);
    expect(readFileSync(join(out, 'report.html'), 'utf8')).toContain('Stress concentration report');
  });

  it('bad options and files exit 2 and say which', () => {
    expect(raiser(['plot', out, '-o', join(tmp, 'x'), '--picture-size', '10x10']).stderr).toContain('--picture-size');
    expect(raiser(['plot', out, '-o', join(tmp, 'x'), '--range', '5:1']).stderr).toContain('--range');
    expect(raiser(['plot', out, '-o', join(tmp, 'x'), '--only', 'nope']).stderr).toContain('there is no picture "nope"');
    const notSaved = raiser(['plot', 'examples/strap-bolt-hole.json', '-o', join(tmp, 'x')]);
    expect(notSaved.code).toBe(2);
    expect(notSaved.stderr).toContain('not a raiser saved solution');
    expect(raiser(['plot', join(tmp, 'missing')]).code).toBe(2);
  });
});
