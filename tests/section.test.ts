/**
 * Sections and what they carry (src/post/section.ts), and each raiser's net section
 * (src/post/raiser-cut.ts).
 *
 * Identities of statics, exact for the discrete solution whatever its stress distribution: the
 * nodal forces r = K u of the nodes on one side of a cut are the external loads on that free
 * body, so the cut carries exactly the applied force and moment (to round-off):
 *  - a strip pulled by a uniform end traction: N = F, and for a section symmetric about the
 *    load's line M = 0, so the beam formula gives F / A_net (consistent nodal loads of a uniform
 *    traction have their resultant through the edge's middle to round-off);
 *  - a plain bar bent by an end moment M: N = 0 and the moment M, so the beam formula gives
 *    6 M / (t d^2) at the fibres (Timoshenko & Goodier, Theory of Elasticity, sec. 22);
 *  - a cantilever with a tip force P at x = L: a cut at x = a carries V = P and M = P (L - a).
 * Tolerances: 1e-10 of the load, a few hundred round-off errors of sums over the nodes.
 */
import { describe, expect, it } from 'vitest';
import { buildDomain } from '../src/geometry/domain.js';
import { expandTemplate } from '../src/model/templates.js';
import type { Model } from '../src/model/schema.js';
import { analyseModel } from '../src/pipeline/analyse.js';
import { buildResult } from '../src/report/result.js';
import { beamStress, cutBetween, loadsThroughCut, pointOnCut } from '../src/post/section.js';
import { governing, ktOf } from './support/kt.js';

const steel = { E: 210000, nu: 0.3 };

function strip(holes: Model['geometry']['holes'], loads: Model['loads'], supports: Model['supports']): Model {
  return {
    material: steel,
    thickness: 5,
    geometry: { outline: { shape: 'path', path: [{ at: [0, 0] }, { at: [200, 0], edge: 'right' }, { at: [200, 40] }, { at: [0, 40], edge: 'left' }] }, holes },
    supports,
    loads,
  };
}

describe('what a section carries', () => {
  it('a strip with a central hole under tension: the cut through the hole carries N = F, M = 0, and the beam formula gives F / A_net to 1e-12', () => {
    const F = 30000;
    const m = strip([{ shape: 'circle', center: [100, 20], diameter: 12 }], [{ type: 'force', on: 'right', fx: F }], [{ type: 'fixed', on: 'left' }]);
    const a = analyseModel(m);
    const cut = cutBetween(buildDomain(m.geometry), 100, 0, 100, 40, m.thickness)!;
    expect(cut.ligaments).toHaveLength(4);
    expect(cut.length).toBeCloseTo(28, 10);
    const loads = loadsThroughCut(a.mesh, cut, a.nodalForce)!;
    expect(Math.abs(loads.N - F)).toBeLessThan(1e-10 * F);
    expect(Math.abs(loads.M)).toBeLessThan(1e-10 * F * 40);
    const nominal = F / (28 * m.thickness);
    for (const v of cut.ligaments) expect(Math.abs(beamStress(cut, loads, v) / nominal - 1)).toBeLessThan(1e-12 + Math.abs(loads.M) * 20 / cut.inertia / nominal);
  });

  it('a cut through the centre of a loaded pin hole of a symmetric link: the hole\'s top and bottom nodes lie on the cut and share their force, so M = 0 by symmetry on every mesh (statics; it was 2.5e3, 1.7e3 or -1.7e3 N mm by round-off)', () => {
    // the invented link-plate example's shape: symmetric about y = 25, pulled through the right hole
    const m: Model = {
      material: steel,
      thickness: 6,
      geometry: {
        outline: { shape: 'path', path: [[0, 0], [160, 0], [160, 50], [0, 50]] },
        holes: [
          { shape: 'circle', center: [20, 25], diameter: 16, name: 'held' },
          { shape: 'circle', center: [140, 25], diameter: 16, name: 'pulled' },
        ],
      },
      supports: [{ type: 'fixed', on: { hole: 'held' } }],
      loads: [{ type: 'force', on: { hole: 'pulled' }, fx: 30000 }],
    };
    for (const size of [4, 2.5]) {
      const a = analyseModel({ ...m, mesh: { size, raiserSize: size / 4 } });
      // the net section the analysis found for the pulled hole: square to the pull, through its centre
      const ev = a.evaluation.raisers.find((r) => r.raiser.name.includes('pulled'))!;
      expect(Math.abs(ev.section!.ex)).toBeLessThan(1e-12);
      expect(Math.abs(Math.abs(ev.loads!.N) - 15000)).toBeLessThan(1e-6 * 15000); // the two sides of the hole share the pull: symmetry
      expect(Math.abs(ev.loads!.M)).toBeLessThan(1e-9 * 30000 * 50);
    }
  });

  it('a plain bar in pure bending: N = 0, M = the applied moment, and the beam formula gives 6 M / (t d^2) at the fibres', () => {
    const M = 4e5;
    const t = 2;
    const d = 20;
    const a = analyseModel({
      material: steel,
      thickness: t,
      geometry: { outline: { shape: 'path', path: [[0, 0], { at: [100, 0], edge: 'end' }, [100, d], { at: [0, d], edge: 'held' }] } },
      supports: [
        { type: 'roller', fix: 'x', on: 'held' },
        { type: 'pin', at: [0, d / 2], fix: 'y' },
      ],
      loads: [{ type: 'moment', on: 'end', m: M }],
    });
    const cut = cutBetween(a.domain, 60, 0, 60, d, t)!;
    const loads = loadsThroughCut(a.mesh, cut, a.nodalForce)!;
    expect(Math.abs(loads.N)).toBeLessThan(1e-10 * M / d);
    expect(Math.abs(Math.abs(loads.M) - M)).toBeLessThan(1e-10 * M);
    const expected = (6 * M) / (t * d * d);
    const lo = beamStress(cut, loads, cut.ligaments[0]);
    const hi = beamStress(cut, loads, cut.ligaments[1]);
    expect(Math.abs(Math.abs(lo) / expected - 1)).toBeLessThan(1e-10);
    expect(Math.abs(lo + hi)).toBeLessThan(1e-10 * expected);
    // A counter-clockwise moment on the right end puts the lower fibre (y = 0) in tension.
    const lower = pointOnCut(cut, cut.ligaments[0])[1] < pointOnCut(cut, cut.ligaments[1])[1] ? lo : hi;
    expect(lower).toBeGreaterThan(0);
  });

  it('a cantilever with a tip force: any cut carries V = P and M = P (L - a), on a free body either side', () => {
    const P = 1000;
    const L = 200;
    const m = strip([], [{ type: 'force', on: 'right', fy: -P }], [{ type: 'fixed', on: 'left' }]);
    const a = analyseModel(m);
    for (const x of [50, 120, 170]) {
      const cut = cutBetween(a.domain, x, 0, x, 40, m.thickness)!;
      const loads = loadsThroughCut(a.mesh, cut, a.nodalForce)!;
      expect(Math.abs(Math.abs(loads.V) - P)).toBeLessThan(1e-10 * P);
      // (the cut is taken a hair, 1e-9 of the part's size, off the given line)
      const xc = pointOnCut(cut, cut.vBar)[0];
      expect(Math.abs(xc - x)).toBeLessThan(1e-8 * L);
      expect(Math.abs(Math.abs(loads.M) - P * (L - xc))).toBeLessThan(1e-10 * P * L);
      expect(Math.abs(loads.N)).toBeLessThan(1e-10 * P);
      // The top fibre is in tension (hogging): the beam stress there is + M c / I.
      const top = pointOnCut(cut, cut.ligaments[0])[1] > pointOnCut(cut, cut.ligaments[1])[1] ? cut.ligaments[0] : cut.ligaments[1];
      expect(beamStress(cut, loads, top) / ((6 * P * (L - xc)) / (m.thickness * 40 * 40)) - 1).toBeCloseTo(0, 10);
    }
  });

  it('a cut that does not divide the part in two carries nothing defined', () => {
    const m = strip([], [{ type: 'force', on: 'right', fx: 1000 }], [{ type: 'fixed', on: 'left' }]);
    const a = analyseModel(m);
    // From the bottom edge half way up: the part stays connected around its end.
    const cut = cutBetween(a.domain, 100, 0, 100, 20, m.thickness)!;
    expect(loadsThroughCut(a.mesh, cut, a.nodalForce)).toBeNull();
  });
});

describe('the net section of a raiser', () => {
  const W = 60;
  const d = 18;
  const model = expandTemplate('plate-with-hole', { W, d });
  const auto = analyseModel(model);

  it('the quarter plate\'s hole: the cut through the hole centre, (W - d)/2 of material, half of a symmetric section (N / A), and the gross width W/2', () => {
    const g = governing(auto);
    expect(g.section!.length).toBeCloseTo((W - d) / 2, 6);
    expect(g.section!.mirror).toBe(true);
    expect(Math.abs(g.loads!.N - 100 * (W / 2) * model.thickness)).toBeLessThan(1e-9 * 100 * W * model.thickness);
    expect(g.gross!.cut.length).toBeCloseTo(W / 2, 6);
    const k = ktOf(auto);
    expect(k.gross! / k.net!).toBeCloseTo(W / (W - d), 9);
  });

  it('the same quarter plate pulled along y by a remote stress: the net section lies along the mirror plane y = 0 to the far end (an edge the remote syy leaves free), N / A', () => {
    // once the remote load counted the end x = L/2 as loaded although syy puts no traction on it,
    // and the cut went obliquely to the top edge: Kt net 5.00 (statics: N = syy x L/2 x t here)
    const m = structuredClone(model);
    m.loads = [{ type: 'remote', syy: 100 }];
    delete m.chart;
    const a = analyseModel(m);
    const g = governing(a);
    let L2 = 0; // the far end of the quarter plate
    for (let i = 0; i < a.mesh.nNodes; i++) L2 = Math.max(L2, a.mesh.nodes[2 * i]);
    expect(g.section!.length).toBeCloseTo(L2 - d / 2, 6);
    expect(Math.abs(g.section!.ey)).toBeLessThan(1e-9);
    expect(g.section!.mirror).toBe(true);
    expect(Math.abs(Math.abs(g.loads!.N) - 100 * L2 * m.thickness)).toBeLessThan(1e-9 * 100 * L2 * m.thickness);
    const k = ktOf(a);
    expect(k.net! / k.remote!).toBeCloseTo((L2 - d / 2) / L2, 9);
    // the template's chart (a strip of width W pulled along it) kept on the model: not compared, with the reason
    const withChart = structuredClone(model);
    withChart.loads = [{ type: 'remote', syy: 100 }];
    const ch = buildResult(analyseModel(withChart)).raisers[0].chart!;
    expect(ch.difference).toBeNull();
    expect(ch.outside.join(' ')).toMatch(new RegExp(`chart is for a width W = ${W}, but the part's gross width across the flow at this raiser is ${2 * L2}`));
    // pulled along the strip as the template made it, the chart is compared
    expect(buildResult(auto).raisers[0].chart!.difference).not.toBeNull();
  });

  it('a section given for the raiser on the same line gives the same nominal stress; one across part of the plate only its material', () => {
    const m = structuredClone(model);
    m.results = { nominal: { hole: { section: { from: [0, 0], to: [0, W / 2] } } } };
    const a = analyseModel(m);
    const net = governing(a).kt.find((k) => k.kind === 'net')!;
    const ref = governing(auto).kt.find((k) => k.kind === 'net')!;
    expect(governing(a).sectionGiven).toBe(true);
    expect(net.nominal).toBeCloseTo(ref.nominal, 6);
    const part = structuredClone(model);
    part.results = { section: { from: [10, 0], to: [10, W / 4] } };
    const b = analyseModel(part);
    expect(governing(b).section!.length).toBeCloseTo(W / 4, 6);
  });

  it('a nominal stress given for the raiser gives Kt on it', () => {
    const m = structuredClone(model);
    m.results = { nominal: { hole: { stress: 100 } } };
    const a = analyseModel(m);
    const k = ktOf(a);
    expect(k.kind).toBe('given');
    expect(k.value).toBeCloseTo(governing(a).peak.stress / 100, 12);
  });
});
