/**
 * The point of the boundary nearest a given point: domain edge, curve parameter, position and
 * distance. Lines and arcs are projected exactly; ellipses by sampling then Newton steps on the
 * squared distance.
 */
import { curveDerivative, evaluateCurve, type Curve } from './curve.js';
import type { Domain } from './domain.js';

export interface BoundaryPoint {
  edge: number;
  t: number;
  x: number;
  y: number;
  distance: number;
}

function projectOnCurve(c: Curve, x: number, y: number): number {
  if (c.kind === 'line') {
    const ex = c.x1 - c.x0;
    const ey = c.y1 - c.y0;
    const t = ((x - c.x0) * ex + (y - c.y0) * ey) / (ex * ex + ey * ey);
    return Math.min(1, Math.max(0, t));
  }
  if (c.kind === 'arc') {
    const a = Math.atan2(y - c.cy, x - c.cx);
    let rel = (a - c.a0) / c.sweep;
    const period = (2 * Math.PI) / Math.abs(c.sweep);
    rel -= Math.floor(rel / period) * period;
    if (rel <= 1) return rel;
    // Outside the arc's range: the nearer end.
    return rel - 1 < period - rel ? 1 : 0;
  }
  const p = [0, 0];
  const d = [0, 0];
  let best = 0;
  let bd = Infinity;
  for (let k = 0; k <= 256; k++) {
    evaluateCurve(c, k / 256, p);
    const dd = (p[0] - x) ** 2 + (p[1] - y) ** 2;
    if (dd < bd) {
      bd = dd;
      best = k / 256;
    }
  }
  for (let it = 0; it < 30; it++) {
    evaluateCurve(c, best, p);
    curveDerivative(c, best, d);
    const g = (p[0] - x) * d[0] + (p[1] - y) * d[1];
    const h = d[0] * d[0] + d[1] * d[1];
    const step = g / h;
    best = Math.min(1, Math.max(0, best - step));
    if (Math.abs(step) < 1e-15) break;
  }
  return best;
}

/** The distance from (x, y) to one domain edge (its nearest point, ends included). */
export function distanceToEdge(domain: Domain, edge: number, x: number, y: number): number {
  const c = domain.edges[edge].curve;
  const p = [0, 0];
  evaluateCurve(c, projectOnCurve(c, x, y), p);
  return Math.hypot(p[0] - x, p[1] - y);
}

export function nearestBoundaryPoint(domain: Domain, x: number, y: number): BoundaryPoint {
  const p = [0, 0];
  let out: BoundaryPoint = { edge: -1, t: 0, x: NaN, y: NaN, distance: Infinity };
  for (const e of domain.edges) {
    const t = projectOnCurve(e.curve, x, y);
    evaluateCurve(e.curve, t, p);
    const d = Math.hypot(p[0] - x, p[1] - y);
    if (d < out.distance) out = { edge: e.id, t, x: p[0], y: p[1], distance: d };
  }
  return out;
}
