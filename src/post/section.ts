/**
 * Nominal stress: the cut across the part that Kt refers to.
 *
 * The cuts considered are the straight lines across the part perpendicular to the load
 * direction d. For each cut the material it crosses (the intervals inside the plate, holes
 * excluded) comes from a fine trace of the boundary; the force it carries is the sum, over the
 * nodes beyond it, of the nodal forces K u (applied loads plus reactions), which the discrete
 * solution balances exactly. Among the cuts that carry at least half of the largest such force
 * (so a cut through an unloaded overhang is not taken), the net section is the one with the
 * least material, the gross section the one with the most. Ties go to the cut nearest the peak.
 *
 *   tension: sigma_nom = F / (t * L)
 *   in-plane bending: sigma_nom = M c / I, I = t * sum integral (v - v_bar)^2 dv over the
 *   material intervals, c the farthest fibre; for one interval of width d, 6 M / (t d^2).
 */
import type { Polylines } from '../geometry/intersect.js';

export interface Cut {
  /** the two outermost material points of the cut */
  from: [number, number];
  to: [number, number];
  /** material length along the cut and its area (times the thickness) */
  length: number;
  area: number;
  /** material intervals along the cut, as pairs of points */
  intervals: [number, number, number, number][];
  /** force through the cut along d (tension), or bending moment about the cut's centroid */
  force: number;
  moment: number;
  stress: number;
  kind: 'tension' | 'bending';
}

export interface SectionInput {
  trace: Polylines;
  nodes: Float64Array;
  /** nodal forces K u: applied loads plus reactions */
  nodalForce: Float64Array;
  thickness: number;
  /** unit load direction */
  dx: number;
  dy: number;
  kind: 'tension' | 'bending';
  peakX: number;
  peakY: number;
  scale: number;
}

/** Material intervals [v0, v1] along the line p . d = u, with v = p . e, e = (-dy, dx). */
function intervalsAt(trace: Polylines, dx: number, dy: number, u: number): number[] {
  const { xy, segs } = trace;
  const vs: number[] = [];
  for (let s = 0; s < segs.length / 2; s++) {
    const a = segs[2 * s];
    const b = segs[2 * s + 1];
    const ua = xy[2 * a] * dx + xy[2 * a + 1] * dy;
    const ub = xy[2 * b] * dx + xy[2 * b + 1] * dy;
    if (ua > u === ub > u) continue;
    const va = -xy[2 * a] * dy + xy[2 * a + 1] * dx;
    const vb = -xy[2 * b] * dy + xy[2 * b + 1] * dx;
    vs.push(va + ((u - ua) / (ub - ua)) * (vb - va));
  }
  vs.sort((p, q) => p - q);
  return vs;
}

function lengthOf(vs: number[]): number {
  let L = 0;
  for (let k = 0; k + 1 < vs.length; k += 2) L += vs[k + 1] - vs[k];
  return L;
}

/** Sorted node positions along d with suffix sums of force and moment terms, for F(u) and M(u). */
function prefix(input: SectionInput) {
  const { nodes, nodalForce, dx, dy } = input;
  const n = nodes.length / 2;
  const order = new Int32Array(n);
  const us = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    order[i] = i;
    us[i] = nodes[2 * i] * dx + nodes[2 * i + 1] * dy;
  }
  order.sort((a, b) => us[a] - us[b]);
  // Suffix sums from the far end: force along d, and the moment terms of r about the origin
  // and the transverse force, so M about any point c follows: M_c = M_0 - (c x F).
  const Fd = new Float64Array(n + 1);
  const Fx = new Float64Array(n + 1);
  const Fy = new Float64Array(n + 1);
  const M0 = new Float64Array(n + 1);
  const usSorted = new Float64Array(n);
  for (let k = n - 1; k >= 0; k--) {
    const i = order[k];
    usSorted[k] = us[i];
    const rx = nodalForce[2 * i];
    const ry = nodalForce[2 * i + 1];
    Fd[k] = Fd[k + 1] + rx * dx + ry * dy;
    Fx[k] = Fx[k + 1] + rx;
    Fy[k] = Fy[k + 1] + ry;
    M0[k] = M0[k + 1] + nodes[2 * i] * ry - nodes[2 * i + 1] * rx;
  }
  return {
    at(u: number) {
      // First sorted index with position > u.
      let lo = 0;
      let hi = n;
      while (lo < hi) {
        const mid = (lo + hi) >> 1;
        if (usSorted[mid] > u) hi = mid;
        else lo = mid + 1;
      }
      return { Fd: Fd[lo], Fx: Fx[lo], Fy: Fy[lo], M0: M0[lo] };
    },
  };
}

function makeCut(input: SectionInput, u: number, vs: number[], sums: { Fd: number; Fx: number; Fy: number; M0: number }): Cut {
  const { dx, dy, thickness } = input;
  const L = lengthOf(vs);
  const ex = -dy;
  const ey = dx;
  const point = (v: number): [number, number] => [u * dx + v * ex, u * dy + v * ey];
  // Centroid and second moment of the material intervals.
  let first = 0;
  for (let k = 0; k + 1 < vs.length; k += 2) first += 0.5 * (vs[k + 1] * vs[k + 1] - vs[k] * vs[k]);
  const vbar = L > 0 ? first / L : 0;
  let I2 = 0;
  let cmax = 0;
  for (let k = 0; k + 1 < vs.length; k += 2) {
    const a = vs[k] - vbar;
    const b = vs[k + 1] - vbar;
    I2 += (b * b * b - a * a * a) / 3;
    cmax = Math.max(cmax, Math.abs(a), Math.abs(b));
  }
  const [cx, cy] = point(vbar);
  const moment = sums.M0 - (cx * sums.Fy - cy * sums.Fx);
  const intervals: [number, number, number, number][] = [];
  for (let k = 0; k + 1 < vs.length; k += 2) intervals.push([...point(vs[k]), ...point(vs[k + 1])]);
  const stress = input.kind === 'tension' ? sums.Fd / (thickness * L) : (Math.abs(moment) * cmax) / (thickness * I2);
  return {
    from: point(vs[0]),
    to: point(vs[vs.length - 1]),
    length: L,
    area: L * thickness,
    intervals,
    force: sums.Fd,
    moment,
    stress: input.kind === 'tension' ? stress : Math.sign(moment || 1) * stress,
    kind: input.kind,
  };
}

/** The net (least material) and gross (most material) load-carrying cuts. */
export function findSections(input: SectionInput): { net: Cut; gross: Cut } {
  const { trace, dx, dy, scale } = input;
  const sums = prefix(input);
  // Candidate positions: every trace vertex, nudged to both sides, plus an even spread.
  const us: number[] = [];
  let umin = Infinity;
  let umax = -Infinity;
  for (let i = 0; i < trace.xy.length; i += 2) {
    const u = trace.xy[i] * dx + trace.xy[i + 1] * dy;
    umin = Math.min(umin, u);
    umax = Math.max(umax, u);
  }
  const eps = 1e-9 * scale;
  for (let i = 0; i < trace.xy.length; i += 2) {
    const u = trace.xy[i] * dx + trace.xy[i + 1] * dy;
    us.push(u - eps, u + eps);
  }
  for (let k = 0; k < 400; k++) us.push(umin + ((k + 0.5) / 400) * (umax - umin));
  const inside = us.filter((u) => u > umin + 0.5 * eps && u < umax - 0.5 * eps);
  const cands = inside.map((u) => {
    const vs = intervalsAt(trace, dx, dy, u);
    const s = sums.at(u);
    return { u, vs, L: lengthOf(vs), s };
  }).filter((c) => c.vs.length >= 2);
  const carried = (c: (typeof cands)[number]) => {
    if (input.kind === 'tension') return Math.abs(c.s.Fd);
    return Math.abs(makeCut(input, c.u, c.vs, c.s).moment);
  };
  const carry = cands.map(carried);
  const maxCarry = carry.reduce((m, c) => Math.max(m, c), -Infinity); // no spread: a long trace overflowed the call stack
  const loaded = cands.filter((_c, i) => carry[i] >= 0.5 * maxCarry);
  const peakU = input.peakX * dx + input.peakY * dy;
  const pick = (better: (a: number, b: number) => boolean) => {
    let best = loaded[0];
    for (const c of loaded) {
      const tie = Math.abs(c.L - best.L) <= 1e-7 * Math.max(c.L, best.L);
      if ((!tie && better(c.L, best.L)) || (tie && Math.abs(c.u - peakU) < Math.abs(best.u - peakU))) best = c;
    }
    return makeCut(input, best.u, best.vs, best.s);
  };
  return { net: pick((a, b) => a < b), gross: pick((a, b) => a > b) };
}

/** A user-given straight cut from p to q: the material along the segment, and what it carries. */
export function sectionAlong(input: Omit<SectionInput, 'dx' | 'dy'>, px: number, py: number, qx: number, qy: number): Cut {
  const len = Math.hypot(qx - px, qy - py);
  // d is normal to the cut: the cut runs along e = (-dy, dx).
  const ex = (qx - px) / len;
  const ey = (qy - py) / len;
  const dx = ey;
  const dy = -ex;
  const full: SectionInput = { ...input, dx, dy };
  const u0 = px * dx + py * dy;
  const v0 = -px * dy + py * dx;
  const v1 = -qx * dy + qy * dx;
  const lo = Math.min(v0, v1);
  const hi = Math.max(v0, v1);
  // A cut along a straight boundary (a symmetry edge, say) is taken just inside the material:
  // of the two lines a hair to either side, the one that crosses more material.
  const eps = 1e-9 * input.scale;
  let best: { u: number; clipped: number[]; L: number } = { u: u0, clipped: [], L: 0 };
  for (const u of [u0 + eps, u0 - eps]) {
    const vs = intervalsAt(input.trace, dx, dy, u);
    const clipped: number[] = [];
    let L = 0;
    for (let k = 0; k + 1 < vs.length; k += 2) {
      const a = Math.max(lo, vs[k]);
      const b = Math.min(hi, vs[k + 1]);
      if (b > a) {
        clipped.push(a, b);
        L += b - a;
      }
    }
    if (L > best.L * (1 + 1e-9)) best = { u, clipped, L };
  }
  const pre = prefix(full);
  if (best.clipped.length === 0) return { ...makeCut(full, u0, [lo, lo], pre.at(u0)), length: 0, area: 0, stress: NaN };
  return makeCut(full, best.u, best.clipped, pre.at(best.u));
}
