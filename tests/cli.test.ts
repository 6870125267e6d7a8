/**
 * The command line as a user meets it: exit codes (0 done, 2 bad input, 3 cannot be analysed),
 * --json printing one JSON object and nothing else, result files written whole and not
 * overwritten without --force, templates feeding the solver.
 */
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { raiser } from './support/cli.js';

const tmp = mkdtempSync(join(tmpdir(), 'raiser-cli-'));

describe('raiser solve', () => {
  it('--json prints one JSON object holding every documented field, and nothing else', () => {
    const r = raiser(['solve', 'examples/strap-bolt-hole.json', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    for (const path of [
      'kt.raiser', 'kt.kind', 'kt.value', 'kt.error', 'kt.band', 'kt.definition', 'kt.net', 'kt.gross',
      'peak.stress', 'peak.measure', 'peak.x', 'peak.y', 'peak.feature',
      'raisers.0.name', 'raisers.0.peak.stress', 'raisers.0.section.from', 'raisers.0.section.to', 'raisers.0.section.area', 'raisers.0.section.N',
      'raisers.0.section.M', 'raisers.0.kt.net.value', 'raisers.0.kt.net.nominal', 'raisers.0.kt.net.band', 'raisers.0.gross.length',
      'singularPoints', 'load.resultant.fx',
      'mesh.nodes', 'mesh.elements', 'mesh.dofs', 'mesh.elementType', 'mesh.minAngleDeg', 'units.stress',
    ]) {
      const v = path.split('.').reduce((o: any, k) => o?.[k], j);
      expect(v, path).not.toBeUndefined();
      expect(v, path).not.toBeNull();
    }
    expect(j.mesh.dofs).toBe(2 * j.mesh.nodes);
    expect(j.cautions.length).toBeGreaterThanOrEqual(4);
  });

  it('prints a summary with Kt, the section and the cautions', () => {
    const r = raiser(['solve', 'examples/strap-bolt-hole.json']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Kt net \d\.\d+ \+- [\d.]+% at hole 1 "bolt hole"/);
    expect(r.stdout).toMatch(/Kt net\s+\d/);
    expect(r.stdout).toMatch(/Kt gross\s+\d/);
    expect(r.stdout).toMatch(/net section \(150, 0\) to \(150, 60\), 43 mm of material in 2 ligaments/);
    expect(r.stdout).toContain('bolt hole');
    expect(r.stdout).toContain('qualified engineer');
    expect(r.stdout).toContain('Kf = 1 + q (Kt - 1)');
  });

  it('-o writes result.json and nodes.csv, refuses to overwrite without --force, leaves no temporary files', () => {
    const out = join(tmp, 'out');
    expect(raiser(['solve', 'examples/strap-bolt-hole.json', '-o', out]).code).toBe(0);
    const result = JSON.parse(readFileSync(join(out, 'result.json'), 'utf8'));
    const csv = readFileSync(join(out, 'nodes.csv'), 'utf8').trim().split('\n');
    expect(csv[0]).toBe('node,x,y,ux,uy,sxx,syy,sxy,s1,s2,von_mises,tresca');
    expect(csv.length - 1).toBe(result.mesh.nodes);
    const again = raiser(['solve', 'examples/strap-bolt-hole.json', '-o', out]);
    expect(again.code).toBe(2);
    expect(again.stderr).toContain('--force');
    expect(raiser(['solve', 'examples/strap-bolt-hole.json', '-o', out, '--force']).code).toBe(0);
    const pictures = ['contour', 'convergence', 'deformed', 'geometry', 'mesh', 'peak', 'section'].flatMap((n) => [`${n}.png`, `${n}.svg`]);
    expect(readdirSync(out).sort()).toEqual([...pictures, 'nodes.csv', 'report.html', 'result.json', 'result.vtu', 'solution.raiser'].sort());
  });

  it('a missing file, malformed JSON and an invalid model exit with 2 and say where', () => {
    const missing = raiser(['solve', join(tmp, 'nope.json')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/no such file/);
    const bad = join(tmp, 'bad.json');
    writeFileSync(bad, '{ "material": { "E": 1, } }');
    const r = raiser(['solve', bad]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/bad\.json:1:/);
    writeFileSync(bad, JSON.stringify({ material: { E: 1, nu: 0.7 }, thickness: 1, geometry: { outline: { shape: 'circle', center: [0, 0], radius: 1 } }, supports: [{ type: 'fixed', on: { outline: true } }], loads: [{ type: 'pressure', on: { outline: true }, p: 1 }] }));
    const nu = raiser(['solve', bad]);
    expect(nu.code).toBe(2);
    expect(nu.stderr).toContain('material.nu');
    expect(nu.stderr).not.toMatch(/at .*\.js:\d+/); // no stack trace without --debug
  });

  it('a model free to move exits with 3 and names the free motion', () => {
    const m = JSON.parse(readFileSync('examples/strap-bolt-hole.json', 'utf8'));
    m.supports = [{ type: 'roller', fix: 'y', on: 'clamped end' }];
    const f = join(tmp, 'free.json');
    writeFileSync(f, JSON.stringify(m));
    const r = raiser(['solve', f]);
    expect(r.code).toBe(3);
    expect(r.stderr).toContain('free to translate in x');
  });

  it('a single pin leaves the rotation free and says about which point', () => {
    const m = JSON.parse(readFileSync('examples/strap-bolt-hole.json', 'utf8'));
    m.supports = [{ type: 'pin', at: [0, 30] }];
    const f = join(tmp, 'rot.json');
    writeFileSync(f, JSON.stringify(m));
    const r = raiser(['solve', f]);
    expect(r.code).toBe(3);
    expect(r.stderr).toMatch(/free to rotate about \(0, 30\)/);
  });
});

describe('raiser new', () => {
  it('lists the templates', () => {
    const r = raiser(['new']);
    expect(r.code).toBe(0);
    for (const t of ['plate-with-hole', 'plate-with-elliptical-hole', 'stepped-bar', 'u-notched-bar', 'edge-notched-bar']) expect(r.stdout).toContain(t);
  });

  it('prints a model that solves, recording its chart family', () => {
    const r = raiser(['new', 'plate-with-hole', '--W', '50', '--d', '10']);
    expect(r.code).toBe(0);
    const model = JSON.parse(r.stdout);
    expect(model.chart.family).toBe('plate-with-hole-tension');
    const f = join(tmp, 'pwh.json');
    writeFileSync(f, r.stdout);
    const s = raiser(['solve', f, '--json']);
    expect(s.code).toBe(0);
    // Pilkey chart 4.1 fit at d/W = 0.2: Ktn = 2.519 (REFERENCES.md section 3), 2% tolerance.
    expect(Math.abs(JSON.parse(s.stdout).kt.net / 2.519 - 1)).toBeLessThan(0.02);
    expect(JSON.parse(s.stdout).raisers[0].chart.difference).not.toBeNull();
  });

  it('takes the long parameter names too: --width 50 --diameter 10 is --W 50 --d 10', () => {
    const a = raiser(['new', 'plate-with-hole', '--width', '50', '--diameter', '10']);
    const b = raiser(['new', 'plate-with-hole', '--W', '50', '--d', '10']);
    expect(a.code).toBe(0);
    expect(a.stdout).toBe(b.stdout);
  });

  it('an unknown template or parameter exits with 2 and suggests the right name', () => {
    const r = raiser(['new', 'plate-with-hol']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('plate-with-hole');
    const p = raiser(['new', 'plate-with-hole', '--diam', '10']);
    expect(p.code).toBe(2);
    expect(existsSync(join(tmp, 'never'))).toBe(false);
  });
});
