/**
 * `raiser verify`: every case of the built-in suite passes against its named source and
 * tolerance (the sources and tolerances live with the cases in src/verify/suite.ts), and the
 * command writes its report for quality records.
 */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runVerify, verifyCases } from '../src/verify/suite.js';
import { raiser } from './support/cli.js';

describe('verification suite', () => {
  const rows = runVerify();

  it('covers the cases the suite promises', () => {
    const ids = verifyCases().map((c) => c.id);
    for (const id of ['patch-p1', 'patch-p2', 'mms-p1-energy', 'mms-p2-stress', 'kirsch-uniaxial', 'kirsch-equibiaxial', 'kirsch-shear', 'inglis', 'hole-in-strip-0.2', 'fillet-tension', 'fillet-bending', 'u-notches-semicircular', 'edge-notch-semicircular', 'kf-shigley-6-6', 'sharp-corner']) {
      expect(ids).toContain(id);
    }
  });

  for (const c of verifyCases()) {
    it(`${c.id}: ${c.title} (${c.source})`, () => {
      const r = rows.find((x) => x.id === c.id)!;
      expect(r.detail).not.toMatch(/^failed to run/);
      expect(r.error, `${c.id}: computed ${r.computed}, reference ${r.reference}`).toBeLessThanOrEqual(c.tolerance);
      expect(r.pass).toBe(true);
    });
  }
});

describe('raiser verify', () => {
  it('prints a table, writes the Markdown report and JSON, and exits 0 when all pass', () => {
    const dir = join(mkdtempSync(join(tmpdir(), 'raiser-verify-')), 'out');
    const r = raiser(['verify', '--only', 'patch,kf', '-o', dir]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/pass\s+patch-p1/);
    expect(r.stdout).toContain('all 3 cases pass');
    const md = readFileSync(join(dir, 'verify-report.md'), 'utf8');
    expect(md).toContain('| kf-shigley-6-6 |');
    expect(md).toContain('Shigley');
    const json = JSON.parse(readFileSync(join(dir, 'verify.json'), 'utf8'));
    expect(json.pass).toBe(true);
    expect(json.rows).toHaveLength(3);
    const j = raiser(['verify', '--only', 'kf', '--json']);
    expect(JSON.parse(j.stdout).rows[0].computed).toBeCloseTo(1.55, 2);
  });

  it('an unknown case name is bad input', () => {
    const r = raiser(['verify', '--only', 'no-such-case']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('kirsch-uniaxial');
  });
});
