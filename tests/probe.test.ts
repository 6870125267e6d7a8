/**
 * `raiser probe`: the stresses of a saved solution at any point, taken in the element holding the
 * point. Checks: at the governing raiser's peak the probe reads the peak the result reports (the
 * same recovered field, interpolated by the same 6-node shape functions along the hole's edge,
 * to 1e-6); at a node it reads the nodal value exactly (shape functions are 1 at their node and 0
 * at the others); far from the hole in the strip's shank it reads the uniform stress F / (W t)
 * (St-Venant: 1.25 widths from the clamp and from the hole, their disturbances have decayed like exp(-4.21 x / W) to about 0.5%); points
 * outside the part are said to be outside; bad points are refused with exit 2.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { raiser } from './support/cli.js';

describe('raiser probe', () => {
  const dir = join(mkdtempSync(join(tmpdir(), 'raiser-probe-')), 'strap');
  const solved = raiser(['solve', 'examples/strap-bolt-hole.json', '-o', dir, '--no-pictures']);
  const result = JSON.parse(readFileSync(join(dir, 'result.json'), 'utf8'));

  it('reads the raiser\'s peak at its place, the nodal value at a node, and F / (W t) in the shank', () => {
    expect(solved.code).toBe(0);
    const pk = result.raisers[0].peak;
    const r = raiser(['probe', dir, '--at', `${pk.x},${pk.y}`, '--at', '75,30', '--at', '400,30', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.units.stress).toBe('MPa');
    expect(Math.abs(j.points[0].s1 / pk.stress - 1)).toBeLessThan(1e-6);
    expect(Math.abs(j.points[1].sxx / (40000 / (60 * 8)) - 1)).toBeLessThan(0.01);
    expect(j.points[2].inside).toBe(false);
    expect(j.points[2].sxx).toBeNull();
  });

  it('reads the nodal value at a node (nodes.csv, whose coordinates are rounded to their printed digits)', () => {
    const rows = readFileSync(join(dir, 'nodes.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(',').map(Number));
    const row = rows[Math.floor(rows.length / 2)];
    const r = raiser(['probe', dir, '--at', `${row[1]},${row[2]}`, '--json']);
    const p = JSON.parse(r.stdout).points[0];
    expect(Math.abs(p.sxx - row[5])).toBeLessThanOrEqual(1e-5 * Math.max(1, Math.abs(row[5])));
    expect(Math.abs(p.ux - row[3])).toBeLessThanOrEqual(1e-5 * Math.max(1e-3, Math.abs(row[3])));
  });

  it('samples a line evenly, as a table and as CSV', () => {
    const t = raiser(['probe', dir, '--line', '150,0,150,60', '--points', '7']);
    expect(t.code).toBe(0);
    expect(t.stdout).toContain('in the element holding each point');
    expect(t.stdout).toContain('outside the part'); // the line crosses the hole
    const c = raiser(['probe', dir, '--line', '150,0,150,60', '--points', '7', '--csv']);
    const lines = c.stdout.trim().split('\n');
    expect(lines[0]).toBe('x,y,ux,uy,sxx,syy,sxy,s1,s2,von_mises,tresca');
    expect(lines).toHaveLength(8);
    expect(Number(lines[4].split(',')[1])).toBeCloseTo(30, 12);
  });

  it('refuses a point that is not two numbers, and --points without --line (exit 2)', () => {
    const a = raiser(['probe', dir, '--at', '12']);
    expect(a.code).toBe(2);
    expect(a.stderr).toMatch(/--at.*not a point/);
    const b = raiser(['probe', dir, '--points', '5']);
    expect(b.code).toBe(2);
    expect(b.stderr).toMatch(/--points needs --line/);
  });
});
