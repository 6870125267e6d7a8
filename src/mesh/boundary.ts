/**
 * Boundary discretisation: every domain edge is cut into straight segments whose lengths follow
 * the size field, with all points on the true curve. Consecutive edges of a loop share their
 * junction point, so loops come out closed by construction.
 *
 * Point spacing: with G(t) = integral_0^t |dp/dt| / h(p(t)) dt, the k-th point sits where
 * G = k G(1) / n and n = round(G(1)) (at least enough to follow a curve), so each segment is about
 * one local size long.
 */
import { curveDerivative, curveTurn, evaluateCurve, subCurve } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';
import type { SizeField } from './sizefield.js';

export interface BoundaryPoints {
  /** x0, y0, x1, y1, ... */
  xy: Float64Array;
  /** domain edge the point lies inside, or -1 for a junction between edges */
  edge: Int32Array;
  /** curve parameter on that edge (0 for junctions) */
  param: Float64Array;
  /** junction points: index into domain.corners, or -1 if the junction is tangent-continuous or not a junction */
  corner: Int32Array;
  /** segments as point index pairs, in loop order with the material on the left */
  segments: Int32Array;
  /** per segment: domain edge, and curve parameters at its two ends */
  segEdge: Int32Array;
  segT0: Float64Array;
  segT1: Float64Array;
}

/** Fewest segments on a curved edge, by its turning angle: no chord turns more than 30 degrees. */
const MAX_CHORD_TURN = Math.PI / 6;

/** A point the mesh must have a node at: on domain edge `edge` at curve parameter t (0 < t < 1). */
export interface HardPoint {
  edge: number;
  t: number;
}

/** Places boundary points on every loop of the domain. */
export function discretiseBoundary(domain: Domain, size: SizeField, hard: readonly HardPoint[] = []): BoundaryPoints {
  const xs: number[] = [];
  const edgeOf: number[] = [];
  const params: number[] = [];
  const cornerOf: number[] = [];
  const segs: number[] = [];
  const segEdge: number[] = [];
  const segT0: number[] = [];
  const segT1: number[] = [];
  const p = [0, 0];

  // Junction corners by (loop, outgoing edge).
  const cornerByEdgeOut = new Map<number, number>();
  domain.corners.forEach((c, i) => cornerByEdgeOut.set(c.edgeOut, i));

  for (const loop of domain.loops) {
    const first = xs.length / 2;
    for (let k = 0; k < loop.edges.length; k++) {
      const edgeId = loop.edges[k];
      const e = domain.edges[edgeId];
      const at = hard.filter((h) => h.edge === edgeId).map((h) => h.t);
      // A whole circle or ellipse gets nodes at its four axis ends, where peaks of symmetric
      // loadings sit (t = 0 is the start point already).
      if ((e.curve.kind === 'arc' || e.curve.kind === 'ellipse') && Math.abs(Math.abs(e.curve.sweep) - 2 * Math.PI) < 1e-9) at.push(0.25, 0.5, 0.75);
      const ts = placeWithHardPoints(e.curve, size, at);
      // Junction at t = 0 (the end of the previous edge), then interior points.
      const start = xs.length / 2;
      evaluateCurve(e.curve, 0, p);
      xs.push(p[0], p[1]);
      edgeOf.push(-1);
      params.push(0);
      cornerOf.push(cornerByEdgeOut.get(edgeId) ?? -1);
      for (let j = 1; j < ts.length - 1; j++) {
        evaluateCurve(e.curve, ts[j], p);
        xs.push(p[0], p[1]);
        edgeOf.push(edgeId);
        params.push(ts[j]);
        cornerOf.push(-1);
      }
      const count = ts.length - 1; // segments on this edge
      for (let j = 0; j < count; j++) {
        const a = start + j;
        const isLastOfLoop = k === loop.edges.length - 1 && j === count - 1;
        const b = isLastOfLoop ? first : start + j + 1;
        segs.push(a, b);
        segEdge.push(edgeId);
        segT0.push(ts[j]);
        segT1.push(ts[j + 1]);
      }
    }
  }
  return {
    xy: Float64Array.from(xs),
    edge: Int32Array.from(edgeOf),
    param: Float64Array.from(params),
    corner: Int32Array.from(cornerOf),
    segments: Int32Array.from(segs),
    segEdge: Int32Array.from(segEdge),
    segT0: Float64Array.from(segT0),
    segT1: Float64Array.from(segT1),
  };
}

/** As placeOnCurve, with points forced at the given parameters (each piece between them placed alone). */
function placeWithHardPoints(curve: Parameters<typeof evaluateCurve>[0], size: SizeField, at: number[]): Float64Array {
  const cuts = [...new Set(at.filter((t) => t > 1e-9 && t < 1 - 1e-9))].sort((a, b) => a - b);
  if (cuts.length === 0) return placeOnCurve(curve, size);
  const out: number[] = [0];
  const bounds = [0, ...cuts, 1];
  for (let k = 0; k + 1 < bounds.length; k++) {
    const a = bounds[k];
    const b = bounds[k + 1];
    const piece = placeOnCurve(subCurve(curve, a, b), size);
    for (let j = 1; j < piece.length; j++) out.push(a + (b - a) * piece[j]);
  }
  out[out.length - 1] = 1;
  return Float64Array.from(out);
}

/** Parameters 0 = t0 < t1 < ... < tn = 1 of the points on one curve. */
function placeOnCurve(curve: Parameters<typeof evaluateCurve>[0], size: SizeField): Float64Array {
  const turn = curveTurn(curve);
  const whole = (curve.kind === 'arc' || curve.kind === 'ellipse') && (curve.sweep === 2 * Math.PI || curve.sweep === -2 * Math.PI);
  const minSegments = curve.kind === 'line' ? 1 : Math.max(whole ? 8 : 1, Math.ceil(turn / MAX_CHORD_TURN));
  let samples = 64;
  for (let pass = 0; pass < 4; pass++) {
    const g = integrateDensity(curve, size, samples);
    const total = g[samples];
    const n = Math.max(minSegments, Math.round(total));
    if (samples < 8 * n && pass < 3) {
      samples = Math.min(8 * n, 1 << 20);
      continue;
    }
    const ts = new Float64Array(n + 1);
    ts[n] = 1;
    let j = 0;
    for (let k = 1; k < n; k++) {
      const target = (k * total) / n;
      while (j < samples && g[j + 1] < target) j++;
      const span = g[j + 1] - g[j];
      const f = span > 0 ? (target - g[j]) / span : 0;
      ts[k] = (j + f) / samples;
    }
    return ts;
  }
  throw new Error('unreachable');
}

/** Cumulative integral of |dp/dt| / h at samples + 1 equally spaced parameters (midpoint rule). */
function integrateDensity(curve: Parameters<typeof evaluateCurve>[0], size: SizeField, samples: number): Float64Array {
  const g = new Float64Array(samples + 1);
  const p = [0, 0];
  const d = [0, 0];
  for (let i = 0; i < samples; i++) {
    const t = (i + 0.5) / samples;
    evaluateCurve(curve, t, p);
    curveDerivative(curve, t, d);
    g[i + 1] = g[i] + Math.hypot(d[0], d[1]) / samples / size.at(p[0], p[1]);
  }
  return g;
}
