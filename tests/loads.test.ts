/**
 * Loads, supports and plane states against closed forms:
 *  - Lame's thick-walled cylinder under internal pressure (G. Lame, Lecons sur la theorie
 *    mathematique de l'elasticite des corps solides, 1852; S. Timoshenko & J. N. Goodier, Theory
 *    of Elasticity, 3rd ed. 1970, sec. 28): pressure on a curved edge, plane stress and strain.
 *    With A = p a^2 / (b^2 - a^2), B = p a^2 b^2 / (b^2 - a^2):
 *      s_theta(r) = A + B / r^2, s_r(r) = A - B / r^2,
 *      u_r(r) = [(1 - nu) A r + (1 + nu) B / r] / E            (plane stress)
 *      u_r(r) = (1 + nu) [(1 - 2 nu) A r + B / r] / E          (plane strain).
 *  - Pure bending of a plain bar by an end moment: s_xx = -M y / I (Euler-Bernoulli, exact in
 *    plane elasticity for a linear end traction: Timoshenko & Goodier sec. 22), so the peak is
 *    6 M / (t d^2); a plain bar has no stress raiser, so it has no Kt.
 *  - Pure shear: edge shear tractions with the documented sign convention reproduce s_xy = tau
 *    everywhere, the same as the remote stress state.
 *  - Kirsch's hole under equibiaxial and pure-shear remote stress: Kt = 2 and 4 on the largest
 *    remote principal stress (M. H. Sadd, Elasticity: Theory, Applications, and Numerics,
 *    Elsevier, sec. 8.4.3, eq. 8.4.18: "the stress concentration factor for this case is 4" and
 *    "equal biaxial tension ... gives a stress concentration factor of 2" [V]); no net or gross Kt
 *    is given for a biaxial state.
 */
import { describe, expect, it } from 'vitest';
import type { Model } from '../src/model/schema.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { governing, ktOf } from './support/kt.js';
import { FieldProbe } from '../src/mesh/probe.js';

const A_IN = 10;
const B_OUT = 30;
const P = 50;

function cylinder(state: 'plane-stress' | 'plane-strain'): Model {
  return {
    material: { E: 200000, nu: 0.3 },
    thickness: 1,
    state,
    geometry: {
      outline: {
        shape: 'path',
        path: [
          { at: [A_IN, 0] },
          { at: [B_OUT, 0], arc: { center: [0, 0], turn: 'ccw' } },
          { at: [0, B_OUT] },
          { at: [0, A_IN], arc: { center: [0, 0], turn: 'cw' }, edge: 'bore' },
        ],
      },
    },
    supports: [
      { type: 'symmetry', on: { x: 0 } },
      { type: 'symmetry', on: { y: 0 } },
    ],
    loads: [{ type: 'pressure', on: 'bore', p: P }],
  };
}

describe('pressure on a curved edge: Lame cylinder', () => {
  for (const state of ['plane-stress', 'plane-strain'] as const) {
    it(`${state}: hoop stress at the bore within 1% (the default mesh's stress accuracy), radial displacement within 0.1%`, () => {
      const a = analyseModel(cylinder(state));
      const A = (P * A_IN * A_IN) / (B_OUT * B_OUT - A_IN * A_IN);
      const B = (P * A_IN * A_IN * B_OUT * B_OUT) / (B_OUT * B_OUT - A_IN * A_IN);
      const hoop = A + B / (A_IN * A_IN);
      expect(hoop).toBeCloseTo(1.25 * P, 10); // (b^2 + a^2)/(b^2 - a^2) = 1.25 for b = 3a
      expect(Math.abs(a.peak.stress / hoop - 1)).toBeLessThan(0.01);
      expect(Math.hypot(a.peak.x, a.peak.y)).toBeCloseTo(A_IN, 6);
      const E = 200000;
      const nu = 0.3;
      const ur = state === 'plane-stress' ? ((1 - nu) * A * A_IN + ((1 + nu) * B) / A_IN) / E : ((1 + nu) * ((1 - 2 * nu) * A * A_IN + B / A_IN)) / E;
      // Node at (A_IN, 0) on the symmetry line: u_x is the radial displacement.
      let node = -1;
      for (let i = 0; i < a.mesh.nNodes; i++) if (Math.abs(a.mesh.nodes[2 * i] - A_IN) < 1e-9 && Math.abs(a.mesh.nodes[2 * i + 1]) < 1e-9) node = i;
      expect(node).toBeGreaterThanOrEqual(0);
      expect(Math.abs(a.u[2 * node] / ur - 1)).toBeLessThan(0.001);
      // Radial stress half-way through the wall.
      const r = 20;
      const probe = new FieldProbe(a.mesh);
      const sxx = probe.value(a.stress, 3, 0, r, 1e-9);
      expect(Math.abs(sxx / (A - B / (r * r)) - 1)).toBeLessThan(0.01);
    });
  }
});

describe('in-plane bending by an end moment', () => {
  it('a plain bar gives the beam stress 6M/(t d^2) and Kt = 1 on the bending nominal stress', () => {
    const d = 20;
    const t = 2;
    const M = 4e5;
    const a = analyseModel({
      material: { E: 210000, nu: 0.3 },
      thickness: t,
      geometry: { outline: { shape: 'path', path: [[0, 0], { at: [100, 0], edge: 'end' }, [100, d], { at: [0, d], edge: 'held' }] } },
      supports: [
        { type: 'roller', fix: 'x', on: 'held' },
        { type: 'pin', at: [0, d / 2], fix: 'y' },
      ],
      loads: [{ type: 'moment', on: 'end', m: M }],
    });
    expect(Math.abs(a.peak.stress / ((6 * M) / (t * d * d)) - 1)).toBeLessThan(0.005);
    expect(a.raisers).toHaveLength(0);
    expect(ktOf(a).value).toBeNull();
    // A counter-clockwise moment on the right end puts the lower fibres in tension.
    expect(a.peak.y).toBeLessThan(d / 2);
  });
});

describe('shear tractions and remote stress states', () => {
  const tau = 30;
  const square = (loads: Model['loads']): Model => ({
    material: { E: 100000, nu: 0.25 },
    thickness: 1,
    geometry: { outline: { shape: 'path', path: [{ at: [0, 0], edge: 'bottom' }, { at: [10, 0], edge: 'right' }, { at: [10, 10], edge: 'top' }, { at: [0, 10], edge: 'left' }] } },
    supports: [
      { type: 'pin', at: [0, 0] },
      { type: 'pin', at: [10, 0], fix: 'y' },
    ],
    loads,
  });

  it('edge shear tractions (+ along the direction of travel) give s_xy = tau everywhere, like the remote state', () => {
    const byEdge = analyseModel(square([
      { type: 'traction', on: ['right', 'left'], shear: tau },
      { type: 'traction', on: ['top', 'bottom'], shear: -tau },
    ]));
    const remote = analyseModel(square([{ type: 'remote', sxy: tau }]));
    for (const a of [byEdge, remote]) {
      for (let i = 0; i < a.mesh.nNodes; i++) {
        expect(Math.abs(a.stress[3 * i + 2] - tau)).toBeLessThan(1e-8 * tau);
        expect(Math.abs(a.stress[3 * i])).toBeLessThan(1e-8 * tau);
      }
      expect(a.equilibriumError).toBeLessThan(1e-12);
    }
  });

  const plate = (sxx: number, syy: number, sxy: number): Model => ({
    material: { E: 210000, nu: 0.3 },
    thickness: 1,
    geometry: {
      outline: { shape: 'path', path: [[-100, -100], [100, -100], [100, 100], [-100, 100]] },
      holes: [{ shape: 'circle', center: [0, 0], radius: 5 }],
    },
    supports: [
      { type: 'pin', at: [-100, 0] },
      { type: 'pin', at: [100, 0], fix: 'y' },
    ],
    loads: [{ type: 'remote', sxx, syy, sxy }],
  });

  it('equibiaxial remote stress on a wide plate: Kt = 2 within 1.5%', () => {
    const a = analyseModel(plate(100, 100, 0));
    const k = ktOf(a);
    expect(Math.abs(k.remote! / 2 - 1)).toBeLessThan(0.015);
    expect(k.kind).toBe('remote');
    expect(k.net).toBeNull();
    expect(k.gross).toBeNull();
    expect(governing(a).kt.find((q) => q.kind === 'net')!.withheld).toMatch(/biaxial/);
  });

  it('pure shear remote stress on a wide plate: Kt = 4 within 1.5%, peak at 45 degrees', () => {
    const a = analyseModel(plate(0, 0, 50));
    const k = ktOf(a);
    expect(Math.abs(k.remote! / 4 - 1)).toBeLessThan(0.015);
    expect(k.net).toBeNull();
    expect(k.gross).toBeNull();
    const angle = (Math.atan2(a.peak.y, a.peak.x) * 180) / Math.PI;
    // Tension peaks at -45 and 135 degrees for positive shear (sigma_1 along +45).
    expect(Math.min(Math.abs(angle + 45), Math.abs(angle - 135))).toBeLessThan(4);
  });
});
