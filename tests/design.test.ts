/**
 * Design figures: the chart library and its cross-check, the fatigue notch factor at the peak,
 * and Neuber's rule for the local stress and strain.
 *  - Each library entry evaluates the formula it names (the formulas are pinned to their
 *    published evaluations in tests/charts.test.ts) and says when dimensions leave its range.
 *  - The Kf chain of Shigley's Example 6-6 [V: Shigley's Mechanical Engineering Design, 9th ed.]:
 *    steel, Sut = 690 MPa, r = 3 mm, Kt = 1.65 -> q = 0.85, Kf = 1.55.
 *  - Neuber's rule sigma eps = (Kt S)^2 / E with a Ramberg-Osgood law (Neuber 1961 [M]): the
 *    solution satisfies the rule to round-off and falls back to the elastic value when the
 *    plastic term vanishes.
 */
import { describe, expect, it } from 'vitest';
import { CHARTS, compareWithChart, findChart } from '../src/charts/library.js';
import { ktHoleInStripNet, ktSteppedBarTension } from '../src/charts/formulas.js';
import { estimateFatigue, neuberLocal } from '../src/post/design.js';
import { resolveUnits } from '../src/model/units.js';
import { raiser } from './support/cli.js';

describe('chart library', () => {
  it('every entry has a source, a provenance tag, a nominal definition and a range', () => {
    for (const c of CHARTS) {
      expect(c.source.length).toBeGreaterThan(10);
      expect(['V', 'D', 'M', 'M+', 'D from M']).toContain(c.provenance);
      expect(c.nominalDefinition.length).toBeGreaterThan(3);
      expect(c.range.length).toBeGreaterThan(3);
    }
  });

  it('evaluates the formulas it names and flags dimensions outside their range', () => {
    expect(findChart('hole-in-strip')!.evaluate({ W: 50, d: 10 })).toBeCloseTo(ktHoleInStripNet(0.2), 12);
    expect(findChart('fillet-tension')!.evaluate({ D: 60, d: 40, r: 6 })).toBeCloseTo(ktSteppedBarTension(60, 40, 6), 12);
    expect(findChart('hole-in-strip')!.outside({ W: 50, d: 30 })).toHaveLength(1);
    expect(findChart('hole-in-strip')!.outside({ W: 50, d: 20 })).toHaveLength(0);
  });

  it('a template family maps to its chart, with the difference and the range check', () => {
    const c = compareWithChart('plate-with-hole-tension', { W: 100, d: 20 }, { net: 2.52, gross: 3.15 })!;
    expect(c.id).toBe('hole-in-strip');
    expect(c.difference).toBeCloseTo(2.52 / ktHoleInStripNet(0.2) - 1, 12);
    expect(compareWithChart('plate-with-hole-tension', { W: 100, d: 60 }, { net: 2, gross: 5 })!.outside.length).toBe(1);
  });

  it('raiser charts evaluates one from the command line, and says when outside the range', () => {
    const r = raiser(['charts', 'fillet-tension', '--D', '60', '--d', '40', '--r', '6', '--json']);
    expect(r.code).toBe(0);
    expect(JSON.parse(r.stdout).kt).toBeCloseTo(ktSteppedBarTension(60, 40, 6), 10);
    const o = raiser(['charts', 'hole-in-strip', '--W', '50', '--d', '30']);
    expect(o.stdout).toContain('outside the range');
    const bad = raiser(['charts', 'fillet-tensio']);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toContain('fillet-tension');
  });
});

describe('fatigue notch factor at the peak', () => {
  it('reproduces the Kf chain of Shigley Example 6-6: Kf = 1.55', () => {
    const f = estimateFatigue(1.65, 3, { E: 200000, nu: 0.3, ultimate: 690 }, resolveUnits())!;
    const neuber = f.methods.find((m) => m.name.startsWith('Neuber'))!;
    expect(neuber.q).toBeCloseTo(0.8467, 2);
    expect(neuber.kf).toBeCloseTo(1.55, 2);
  });

  it('uses given material constants in the model units, and says the estimate is not an assessment', () => {
    const f = estimateFatigue(2, 3, { E: 200000, nu: 0.3, notchSensitivity: { neuberSqrtA: 0.3136, petersonA: 0.1 } }, resolveUnits())!;
    expect(f.methods.map((m) => m.name)).toEqual(['Neuber, given constant', 'Peterson, given constant']);
    expect(f.methods[1].q).toBeCloseTo(1 / (1 + 0.1 / 3), 12);
    expect(f.notes.join(' ')).toContain('not a fatigue assessment');
  });

  it('gives nothing on a straight edge (no notch radius); without any material data it says q is withheld and why', () => {
    expect(estimateFatigue(2, Infinity, { E: 1, nu: 0.3, ultimate: 600 }, resolveUnits())).toBeNull();
    const f = estimateFatigue(2, 3, { E: 1, nu: 0.3 }, resolveUnits())!;
    expect(f.methods).toHaveLength(0);
    expect(f.withheld).toMatch(/no notch sensitivity q: the material has no ultimate strength/);
  });
});

describe("Neuber's rule", () => {
  it('meets sigma eps = (Kt S)^2 / E to round-off, with the local strain above the elastic one', () => {
    const E = 200000;
    const r = neuberLocal(500, E, 1000, 0.1);
    const eps = r.stress / E + Math.pow(r.stress / 1000, 10);
    expect(Math.abs((r.stress * eps) / ((500 * 500) / E) - 1)).toBeLessThan(1e-10);
    expect(r.stress).toBeLessThan(500);
    expect(r.strain).toBeGreaterThan(r.elasticStrain);
  });

  it('is the elastic value when the plastic term is negligible', () => {
    const r = neuberLocal(100, 200000, 1e9, 0.2);
    expect(r.stress).toBeCloseTo(100, 6);
  });
});
