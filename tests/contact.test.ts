/**
 * Rigid round pins in frictionless contact with circular holes (src/fem/contact.ts): the
 * properties an exact solution of the contact conditions has, and one published solution.
 *
 * Properties (they follow from the conditions themselves, for any correct solver):
 * - with no clearance the problem is linear once the contact arc is known and the gap is zero
 *   at no load, so the arc and Kt do not depend on the size of the load;
 * - the contact forces add up to the pin's force (pin equilibrium), and the part's held end
 *   carries it back (global equilibrium from K u, computed apart from the contact solve);
 * - no tension in the contact and no overlap, to round-off (1e-9 of the force and of the pin's
 *   displacement); a force only where the gap is closed;
 * - the active set converges in a handful of iterations, and the count is reported.
 *
 * Published solution: a pin with clearance in a large plate at small loads, against the Hertz
 * approximation for conforming cylinders, half-width a = sqrt(4 P R / (pi E')) with P the force
 * per unit thickness, R = R_p R_h / (R_h - R_p) and E' = E in plane stress (rigid pin) (K.L.
 * Johnson, Contact Mechanics, Cambridge 1985, line contact of cylinders, with the conforming
 * radius [M]). The approximation treats the arc as flat, so it holds while a is small beside the
 * radius; at a/R = 0.1 and 0.2 the finite elements met it to within the node spacing when this
 * test was written (the last node in contact sat within 0.1% of R a/R of it). Tolerance: the
 * Hertz arc must lie between the last node in contact and the first one out, widened by 2% of a
 * for the outer boundary (the plate is 20 hole radii across and held at its rim).
 */
import { describe, expect, it } from 'vitest';
import { analyseModel, type Analysis } from '../src/pipeline/analyse.js';
import type { Model } from '../src/model/schema.js';
import type { PinContact } from '../src/fem/contact.js';
import { roundLug } from './support/pins.js';
import { ktOf } from './support/kt.js';

const d = 20;
const W = 40;
const t = 10;

function lugWithPin(F: [number, number], clearance = 0): Analysis {
  return analyseModel(roundLug({ W, d, thickness: t, load: { type: 'rigid-pin', on: { hole: 'pin' }, force: F, clearance } }));
}

function only(a: Analysis): PinContact {
  expect(a.pins?.contact?.pins.length).toBe(1);
  return a.pins!.contact!.pins[0];
}

/** The gap at every hole node from the displacement field itself: rho - R_p + (u - delta) . n. */
function gapsFromDisplacements(a: Analysis, c: PinContact): number[] {
  const Rp = c.pin.radius - c.pin.clearance / 2;
  const { nodes, normal, rho } = c.hole;
  return Array.from(nodes, (nd, i) => rho[i] - Rp + (a.u[2 * nd] - c.displacement[0]) * normal[2 * i] + (a.u[2 * nd + 1] - c.displacement[1]) * normal[2 * i + 1]);
}

describe('rigid pin in a lug, close fit', () => {
  const small = lugWithPin([1000, 0]);
  const large = lugWithPin([1e6, 0]);

  it('has the same contact arc and Kt whatever the size of the load', () => {
    expect(Array.from(only(large).active)).toEqual(Array.from(only(small).active));
    expect(ktOf(large).net! / ktOf(small).net! - 1).toBeLessThan(1e-9);
    // the same place, to the search's resolution along the hole's edge
    expect(Math.abs(large.peak.x - small.peak.x)).toBeLessThan(1e-6 * d);
    // displacements scale with the load
    expect(only(large).displacement[0] / only(small).displacement[0] / 1000 - 1).toBeLessThan(1e-9);
  });

  it('converges in a handful of active-set iterations, and reports them', () => {
    // a close fit converges in 1 to 3 iterations (measured before this code was written, with an independent solver)
    expect(small.pins!.contact!.iterations).toBeGreaterThanOrEqual(1);
    expect(small.pins!.contact!.iterations).toBeLessThanOrEqual(3);
    expect(small.pins!.contact!.activeHistory.length).toBe(small.pins!.contact!.iterations);
  });

  it('has contact forces that add up to the pin force, carried back by the held end', () => {
    const c = only(small);
    let fx = 0;
    let fy = 0;
    for (let i = 0; i < c.force.length; i++) {
      // the pressure times the node's share of the hole gives the force back
      const f = c.pressure[i] * c.hole.weight[i] * t;
      fx += f * c.hole.normal[2 * i];
      fy += f * c.hole.normal[2 * i + 1];
    }
    expect(Math.abs(fx - 1000)).toBeLessThan(1e-10 * 1000);
    expect(Math.abs(fy)).toBeLessThan(1e-10 * 1000);
    expect(Math.abs(small.reaction.fx + 1000)).toBeLessThan(1e-9 * 1000);
    expect(Math.abs(small.reaction.fy)).toBeLessThan(1e-9 * 1000);
    expect(small.equilibriumError).toBeLessThan(1e-9);
  });

  it('has no tension in the contact, no overlap, and force only where the gap is closed', () => {
    const c = only(small);
    const gaps = gapsFromDisplacements(small, c);
    const scale = Math.hypot(...c.displacement);
    for (let i = 0; i < c.force.length; i++) {
      expect(c.force[i]).toBeGreaterThanOrEqual(-1e-9 * 1000);
      expect(gaps[i]).toBeGreaterThanOrEqual(-1e-9 * scale);
      if (c.active[i]) expect(Math.abs(gaps[i])).toBeLessThan(1e-9 * scale);
      else expect(c.force[i]).toBe(0);
    }
    // the arc faces the force and is not empty
    expect(c.active.reduce((s, v) => s + v, 0)).toBeGreaterThan(5);
    for (let i = 0; i < c.force.length; i++) if (c.active[i]) expect(c.hole.normal[2 * i]).toBeGreaterThan(-1e-9);
  });
});

describe('rigid pin with clearance', () => {
  it('touches on a narrower arc than a close fit, moves along its force, and still meets every condition', () => {
    const close = only(lugWithPin([10000, 0]));
    const a = lugWithPin([10000, 0], 0.2);
    const loose = only(a);
    const count = (c: PinContact) => c.active.reduce((s, v) => s + v, 0);
    expect(count(loose)).toBeLessThan(count(close));
    expect(loose.displacement[0]).toBeGreaterThan(0.1); // it closes the radial clearance 0.1 first
    expect(Math.abs(loose.displacement[1])).toBeLessThan(1e-3 * loose.displacement[0]);
    const gaps = gapsFromDisplacements(a, loose);
    for (let i = 0; i < gaps.length; i++) {
      expect(loose.force[i]).toBeGreaterThanOrEqual(-1e-9 * 10000);
      expect(gaps[i]).toBeGreaterThanOrEqual(-1e-9 * loose.displacement[0]);
    }
    expect(Math.abs(loose.resultant[0] - 10000)).toBeLessThan(1e-9 * 10000);
    expect(a.pins!.contact!.iterations).toBeLessThanOrEqual(10);
  });

  it('meets the Hertz half-width for conforming cylinders at small loads (large plate)', () => {
    const R = 10;
    const c = 0.2;
    const E = 210000;
    const Rp = R - c / 2;
    const Reff = (Rp * R) / (R - Rp);
    for (const alpha of [0.1, 0.2]) {
      const a = alpha * R;
      const F = ((Math.PI * E * a * a) / (4 * Reff)) * t; // Hertz inverted: the load that gives half-width a
      const model: Model = {
        title: 'pin with clearance in a large disc (invented test part)',
        material: { E, nu: 0.3 },
        thickness: t,
        geometry: { outline: { shape: 'circle', center: [0, 0], radius: 20 * R, tag: 'rim' }, holes: [{ shape: 'circle', center: [0, 0], radius: R, name: 'pin' }] },
        supports: [{ type: 'fixed', on: 'rim' }],
        // off the axes, so nothing depends on the mesh lining up with the force
        loads: [{ type: 'rigid-pin', on: { hole: 'pin' }, force: [F * Math.cos(0.5), F * Math.sin(0.5)], clearance: c }],
        mesh: { raiserSize: R / 100 },
      };
      const pc = only(analyseModel(model));
      // angles from the force's direction
      let lastIn = 0;
      let firstOut = Math.PI;
      const off = (i: number) => Math.abs(Math.atan2(Math.sin(pc.hole.angle[i] - 0.5), Math.cos(pc.hole.angle[i] - 0.5)));
      for (let i = 0; i < pc.active.length; i++) if (pc.active[i]) lastIn = Math.max(lastIn, off(i));
      for (let i = 0; i < pc.active.length; i++) if (!pc.active[i] && off(i) > lastIn) firstOut = Math.min(firstOut, off(i));
      // the arc is one piece about the force
      for (let i = 0; i < pc.active.length; i++) expect(pc.active[i]).toBe(off(i) <= lastIn ? 1 : 0);
      expect(R * lastIn, `a/R = ${alpha}`).toBeLessThanOrEqual(a * 1.02);
      expect(R * firstOut, `a/R = ${alpha}`).toBeGreaterThanOrEqual(a * 0.98);
    }
  });
});

describe('a link held by a fixed pin and pulled by another', () => {
  const L = 120;
  const link = (extra: Model['supports']): Model => ({
    title: 'link plate (invented test part)',
    material: { E: 210000, nu: 0.3 },
    thickness: t,
    geometry: {
      outline: {
        shape: 'path',
        path: [
          { at: [0, -W / 2], edge: 'side' },
          { at: [L, -W / 2], arc: { center: [L, 0], turn: 'ccw' } },
          { at: [L, W / 2], edge: 'side' },
          { at: [0, W / 2], arc: { center: [0, 0], turn: 'ccw' } },
        ],
      },
      holes: [
        { shape: 'circle', center: [0, 0], diameter: d, name: 'A' },
        { shape: 'circle', center: [L, 0], diameter: d, name: 'B' },
      ],
    },
    supports: [{ type: 'rigid-pin', on: { hole: 'A' } }, ...extra],
    loads: [{ type: 'rigid-pin', on: { hole: 'B' }, force: [10000, 0] }],
  });

  it('balances: the fixed pin carries the pulled pin force back, pressing on the far side of its hole', () => {
    const a = analyseModel(link([{ type: 'pin', at: [L + W / 2, 0], fix: 'y' }]));
    const [held, pulled] = a.pins!.contact!.pins;
    expect(held.pin.role).toBe('support');
    expect(Math.abs(held.resultant[0] + 10000)).toBeLessThan(1e-8 * 10000);
    expect(Math.abs(pulled.resultant[0] - 10000)).toBeLessThan(1e-9 * 10000);
    expect(Math.abs(a.reaction.fx + 10000)).toBeLessThan(1e-8 * 10000);
    expect(a.equilibriumError).toBeLessThan(1e-9);
    for (let i = 0; i < held.active.length; i++) if (held.active[i]) expect(held.hole.normal[2 * i]).toBeLessThan(1e-9);
    expect(a.pins!.contact!.iterations).toBeLessThanOrEqual(5);
  });

  it('without a support against turning it names the free rotation about the fixed pin', () => {
    expect(() => analyseModel(link([]))).toThrow(/free to rotate about \(0, 0\)/);
  });
});
