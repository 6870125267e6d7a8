/**
 * The error band: the Grid Convergence Index arithmetic against its published-style test vector
 * (docs/REFERENCES.md section 10: h = 1, 0.5, 0.25 and f = 2.88, 2.97, 2.9925, exact value 3
 * with error h^2, give p = 2, f_ext = 3, e_a = 0.0075188, GCI = 0.3133%; Roache 1994, Celik et
 * al. 2008), the observed order with a non-constant refinement ratio, and the certified series
 * on Kirsch's plate with exact tractions, where the band must contain the exact Kt = 3.
 */
import { describe, expect, it } from 'vitest';
import { buildDomain } from '../src/geometry/domain.js';
import { selectEdges } from '../src/geometry/select.js';
import type { Model } from '../src/model/schema.js';
import { prepareModel } from '../src/pipeline/analyse.js';
import { certifyModel, certifyPrepared } from '../src/pipeline/certify.js';
import { gridConvergence, observedOrder } from '../src/post/convergence.js';
import { kirsch } from './support/kirsch.js';
import { inglisField } from '../src/verify/exact.js';
import { exactTractionPrepared } from '../src/verify/suite.js';

describe('grid convergence index', () => {
  it('reproduces the test vector: p = 2, f_ext = 3, e_a = 0.0075188, GCI = 0.3133%', () => {
    const g = gridConvergence([1, 0.5, 0.25], [2.88, 2.97, 2.9925], 2);
    expect(g.observedOrder).toBeCloseTo(2, 10);
    expect(g.extrapolated).toBeCloseTo(3, 10);
    expect(g.safetyFactor).toBe(1.25);
    expect(g.gci).toBeCloseTo((1.25 * 0.0075188) / 3, 7);
    expect(g.asymptoticRatio).toBeCloseTo(1, 1);
  });

  it('finds the order of an h^2 error with a non-constant refinement ratio (Celik 2008)', () => {
    const h = [1, 0.6, 0.25];
    const f = h.map((x) => 3 - 0.4 * x * x);
    const p = observedOrder(h[1] / h[2], h[0] / h[1], f[1] - f[2], f[0] - f[1]);
    expect(p).toBeCloseTo(2, 9);
  });

  it('falls back to the theoretical order and Fs = 3 when results oscillate, and gives a growing series no order and a band of three times its last change', () => {
    const osc = gridConvergence([1, 0.5, 0.25], [2.9, 2.99, 2.97], 2);
    expect(osc.behaviour).toBe('oscillating');
    expect(osc.safetyFactor).toBe(3);
    // The coarser swing (0.09), scaled by r^-p = 2^-2, exceeds the finer one (0.02); r^p - 1 = 3.
    expect(osc.gci).toBeCloseTo((3 * (0.09 / 4)) / 2.97 / 3, 12);
    const div = gridConvergence([1, 0.5, 0.25], [2, 2.5, 3.2], 2);
    expect(div.behaviour).toBe('diverging');
    expect(div.gci).toBeCloseTo((3 * 0.7) / 3.2, 12);
    expect(Number.isNaN(div.extrapolated)).toBe(true);
    expect(Number.isNaN(div.observedOrder)).toBe(true);
  });

  it('caps the order at the theoretical one when the observed order is higher (the cautious band)', () => {
    const h = [1, 0.5, 0.25];
    const g = gridConvergence(h, h.map((x) => 3 - 0.1 * x ** 4), 2);
    expect(g.observedOrder).toBeCloseTo(4, 6);
    expect(g.orderUsed).toBe(2);
  });
});

/** Kirsch's plate, quarter model, loaded by the exact tractions (see tests/kirsch.test.ts). */
function kirschPrepared() {
  const A = 1;
  const L = 6;
  const model: Model = {
    material: { E: 200000, nu: 0.3 },
    thickness: 1,
    geometry: {
      outline: { shape: 'path', path: [{ at: [A, 0] }, { at: [L, 0], edge: 'far' }, { at: [L, L], edge: 'far' }, { at: [0, L] }, { at: [0, A], arc: { center: [0, 0], turn: 'cw' } }] },
    },
    supports: [
      { type: 'symmetry', on: { x: 0 } },
      { type: 'symmetry', on: { y: 0 } },
    ],
    loads: [],
  };
  const prep = prepareModel(model);
  const domain = buildDomain(model.geometry);
  prep.extraTractions = [
    {
      edges: selectEdges(domain, 'far'),
      q: (x, y, nx, ny, out) => {
        const [sxx, syy, sxy] = kirsch(x, y);
        out[0] = sxx * nx + sxy * ny;
        out[1] = sxy * nx + syy * ny;
      },
    },
  ];
  prep.extraRemote = { sxx: 100, syy: 0, sxy: 0 };
  return prep;
}

/** The governing raiser's Kt against the remote stress, with its band. */
function remoteKt(c: ReturnType<typeof certifyPrepared>) {
  const g = c.settlement.raisers[c.settlement.governing];
  return g.kt.find((k) => k.kind === 'remote')!;
}

describe('certified Kt', () => {
  for (const target of [0.02, 0.01, 0.005]) {
    it(`Kirsch with exact tractions, target ${target * 100}%: converged, and the band of Kt (on the remote stress) contains the exact 3`, () => {
      const c = certifyPrepared(kirschPrepared(), { target });
      expect(c.status).toBe('converged');
      expect(c.quantity.kind).toBe('remote');
      const k = remoteKt(c);
      expect(k.error!).toBeLessThanOrEqual(target);
      expect(c.gci!.gci).toBe(k.error);
      expect(Math.abs(k.value! - 3)).toBeLessThanOrEqual(k.error! * k.value! + 1e-12);
      expect(k.band![0]).toBeLessThanOrEqual(3);
      expect(k.band![1]).toBeGreaterThanOrEqual(3);
      expect(c.meshes.length).toBeGreaterThanOrEqual(3);
    });
  }

  for (const target of [0.01, 0.005]) {
    it(`Inglis ellipse a/b = 2 with exact tractions, target ${target * 100}%: the band contains the exact Kt = 5`, () => {
      const model: Model = {
        material: { E: 210000, nu: 0.3 },
        thickness: 1,
        geometry: { outline: { shape: 'path', path: [[-8, -8], [8, -8], [8, 8], [-8, 8]], tag: 'far' }, holes: [{ shape: 'ellipse', center: [0, 0], a: 2, b: 1 }] },
        supports: [
          { type: 'pin', at: [-8, 0] },
          { type: 'pin', at: [8, 0], fix: 'y' },
        ],
        loads: [],
      };
      // Inglis (1913): Kt = 1 + 2a/b at (+-a, 0) for the load along y (REFERENCES.md section 2).
      const c = certifyPrepared(exactTractionPrepared(model, inglisField(2, 1, 100, Math.PI / 2), { sxx: 0, syy: 100, sxy: 0 }), { target });
      expect(c.status).toBe('converged');
      const k = remoteKt(c);
      expect(Math.abs(k.value! - 5)).toBeLessThanOrEqual(k.error! * k.value! + 1e-12);
      expect(Math.abs(Math.abs(c.analysis.peak.x) - 2)).toBeLessThan(0.01);
    });
  }

  it('a sharp re-entrant corner is reported as not converging, with no Kt', () => {
    const model: Model = {
      material: { E: 210000, nu: 0.3 },
      thickness: 5,
      geometry: { outline: { shape: 'path', path: [[0, 0], [100, 0], { at: [100, 40], edge: 'arm' }, [40, 40], [40, 100], { at: [0, 100], edge: 'top' }] } },
      supports: [{ type: 'fixed', on: 'top' }],
      loads: [{ type: 'force', on: 'arm', fy: -2000 }],
    };
    const c = certifyModel(model, { target: 0.01 });
    expect(c.status).toBe('singular');
    expect(c.analysis.peak.x).toBeCloseTo(40, 6);
    expect(c.analysis.peak.y).toBeCloseTo(40, 6);
    // Williams (1952): at a 90 degree re-entrant corner the stress grows like r^(lambda - 1),
    // lambda = 0.5445 (REFERENCES.md section 6), so the peak keeps rising with refinement.
    const peaks = c.meshes.map((m) => m.peak);
    for (let i = 1; i < peaks.length; i++) expect(peaks[i]).toBeGreaterThan(peaks[i - 1]);
  });
});
