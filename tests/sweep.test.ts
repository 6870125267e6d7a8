/**
 * Sweeps and sizing, through the command line:
 *  - a sweep of the plate with a central hole over d/W reproduces the published curve (Howland
 *    1930, Peterson-Pilkey chart 4.1 fit, REFERENCES.md section 3) within 2%;
 *  - a sweep of a shoulder fillet radius reproduces the chart 3.1 fit (section 4) within 5%;
 *  - a sweep killed part-way and run again finishes with every case present exactly once;
 *  - `raiser size` on a fillet finds a radius whose Kt meets the limit and lies within 2% of it;
 *  - a model's own parameters drive a two-name sweep (a family of curves).
 */
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { PNG } from 'pngjs';
import { describe, expect, it } from 'vitest';
import { ktHoleInStripNet, ktSteppedBarTension } from '../src/charts/formulas.js';
import { raiser, ROOT } from './support/cli.js';

const tmp = mkdtempSync(join(tmpdir(), 'raiser-sweep-'));

function csv(dir: string) {
  const [head, ...rows] = readFileSync(join(dir, 'sweep.csv'), 'utf8').trim().split('\n');
  const cols = head.split(',');
  return rows.map((r) => {
    const cells = r.match(/("([^"]|"")*"|[^,]*)(,|$)/g)!.map((c) => c.replace(/,$/, ''));
    return Object.fromEntries(cols.map((c, i) => [c, cells[i]]));
  });
}

describe('raiser sweep', () => {
  it('plate with a central hole over d/W = 0.1 ... 0.5 follows the published curve within 2%', () => {
    const model = join(tmp, 'hole.json');
    writeFileSync(model, raiser(['new', 'plate-with-hole', '--W', '100', '--d', '20']).stdout);
    const out = join(tmp, 'hole-sweep');
    const r = raiser(['sweep', model, '--vary', 'd=10:50:5', '-o', out, '--jobs', '2']);
    expect(r.code).toBe(0);
    const rows = csv(out);
    expect(rows.map((x) => Number(x.x))).toEqual([0.1, 0.2, 0.3, 0.4, 0.5]);
    for (const row of rows) {
      const dw = Number(row.x);
      expect(Math.abs(Number(row.kt_net) / ktHoleInStripNet(dw) - 1)).toBeLessThan(0.02);
      expect(Number(row.chart_kt)).toBeCloseTo(ktHoleInStripNet(dw), 6);
      expect(row.status).toBe('converged');
    }
    expect(readFileSync(join(out, 'sweep.svg'), 'utf8')).toContain('<svg');
    // The PNG chart: its size, and the curve's colour present (markers and line).
    const png = PNG.sync.read(readFileSync(join(out, 'sweep.png')));
    expect([png.width, png.height]).toEqual([1400, 900]);
    let curve = 0;
    for (let i = 0; i < png.data.length; i += 4) if (Math.abs(png.data[i] - 27) + Math.abs(png.data[i + 1] - 79) + Math.abs(png.data[i + 2] - 114) < 12) curve++;
    expect(curve).toBeGreaterThan(500);
  });

  it('a shoulder fillet radius follows the chart 3.1 fit within 5%', () => {
    const model = join(tmp, 'fillet.json');
    writeFileSync(model, raiser(['new', 'stepped-bar', '--D', '40', '--d', '20', '--r', '2']).stdout);
    const out = join(tmp, 'fillet-sweep');
    expect(raiser(['sweep', model, '--vary', 'r=2:8:4', '-o', out]).code).toBe(0);
    for (const row of csv(out)) expect(Math.abs(Number(row.kt_net) / ktSteppedBarTension(40, 20, Number(row.r)) - 1)).toBeLessThan(0.05);
  });

  it('killed part-way and run again, finishes with every case present exactly once', async () => {
    const model = join(tmp, 'kill.json');
    writeFileSync(model, raiser(['new', 'plate-with-hole', '--W', '100', '--d', '20']).stdout);
    const out = join(tmp, 'kill-sweep');
    const bin = fileURLToPath(new URL('../dist/cli/raiser.js', import.meta.url));
    const child = spawn(process.execPath, [bin, 'sweep', model, '--vary', 'd=10:50:9', '-o', out, '--jobs', '1'], { cwd: ROOT, stdio: 'ignore' });
    await new Promise<void>((resolve) => {
      const poll = setInterval(() => {
        const dir = join(out, 'cases');
        if (existsSync(dir) && readdirSync(dir).filter((f) => f.endsWith('.json')).length >= 2) {
          clearInterval(poll);
          child.kill('SIGKILL');
          resolve();
        }
      }, 20);
    });
    await new Promise((r) => child.on('exit', r));
    const kept = readdirSync(join(out, 'cases')).filter((f) => f.endsWith('.json')).length;
    expect(kept).toBeGreaterThanOrEqual(2);
    expect(kept).toBeLessThan(9);
    // No half-written file: every kept case parses.
    for (const f of readdirSync(join(out, 'cases'))) {
      expect(f.endsWith('.json')).toBe(true);
      JSON.parse(readFileSync(join(out, 'cases', f), 'utf8'));
    }
    const again = raiser(['sweep', model, '--vary', 'd=10:50:9', '-o', out]);
    expect(again.code).toBe(0);
    expect(again.stdout).toMatch(new RegExp(`9 cases \\(${kept} kept from an earlier run\\)`));
    const ds = csv(out).map((r) => Number(r.d));
    expect(ds).toEqual([10, 15, 20, 25, 30, 35, 40, 45, 50]);
  });

  it('a model\'s own parameters drive a two-name sweep', () => {
    const model = join(tmp, 'param.json');
    writeFileSync(
      model,
      JSON.stringify({
        title: 'strap with an offset hole (invented)',
        parameters: { W: 40, d: 10, off: 0 },
        material: { E: 210000, nu: 0.3 },
        thickness: 5,
        geometry: {
          outline: { shape: 'path', path: [[0, 0], { at: ['=4*W', 0], edge: 'end' }, ['=4*W', '=W'], { at: [0, '=W'], edge: 'held' }] },
          holes: [{ shape: 'circle', center: ['=2*W', '=W/2 + off'], diameter: '=d' }],
        },
        supports: [{ type: 'fixed', on: 'held' }],
        loads: [{ type: 'traction', on: 'end', normal: 100 }],
      }),
    );
    const out = join(tmp, 'param-sweep');
    const r = raiser(['sweep', model, '--vary', 'd=8:12:2', '--vary', 'off=0:6:2', '-o', out, '--x', 'd/W', '--single-mesh']);
    expect(r.code).toBe(0);
    const rows = csv(out);
    expect(rows).toHaveLength(4);
    expect(rows.map((x) => Number(x.x))).toEqual([0.2, 0.2, 0.3, 0.3]);
    // Moving the hole off the centre line raises the peak, so Kt on the unchanged gross section;
    // the net section then carries its force off its centroid, a bending part of the net nominal
    // stress that Kt net includes.
    expect(Number(rows[1].kt_gross)).toBeGreaterThan(Number(rows[0].kt_gross));
    expect(Number(rows[1].peak)).toBeGreaterThan(Number(rows[0].peak));
  });

  it('an unknown name to vary is bad input with a suggestion', () => {
    const model = join(tmp, 'hole.json');
    const r = raiser(['sweep', model, '--vary', 'dd=1:2:2', '-o', join(tmp, 'x')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/did you mean "d"/);
  });
});

describe('raiser size', () => {
  it('finds a fillet radius whose Kt meets the limit and lies within 2% of it', () => {
    const model = join(tmp, 'size.json');
    writeFileSync(model, raiser(['new', 'stepped-bar', '--D', '60', '--d', '40', '--r', '4']).stdout);
    const r = raiser(['size', model, '--vary', 'r=1:12', '--kt-max', '1.8', '--json']);
    expect(r.code).toBe(0);
    const res = JSON.parse(r.stdout);
    expect(res.met).toBe(true);
    const kt = res.row.ktNet;
    expect(kt * (1 + res.row.error)).toBeLessThanOrEqual(1.8);
    expect(kt).toBeGreaterThanOrEqual(0.98 * 1.8);
    expect(res.value).toBeGreaterThan(1);
    expect(res.value).toBeLessThan(12);
  });

  it('says so when no value in the range meets the limit (exit 3)', () => {
    const model = join(tmp, 'size.json');
    const r = raiser(['size', model, '--vary', 'r=1:2', '--kt-max', '1.2']);
    expect(r.code).toBe(3);
    expect(r.stdout).toContain('no value of r');
  });
});
