/**
 * The element size field: the target edge length at every point of the plate.
 *
 * Stress raisers are found from the geometry: concave arcs (holes, notch roots, shoulder
 * fillets: the material lies outside their circle), concave elliptical arcs (sized by their
 * local radius of curvature) and re-entrant sharp corners. Each raiser is a source with a size
 * h_s; away from it the size may grow at the grading rate g, so
 *
 *     h(x) = min( h_global, min_s ( h_s + g * dist(x, source_s) ) ),
 *
 * a Lipschitz-continuous field with constant g, which keeps neighbouring elements within a
 * factor of about 1 + g of each other. Convex arcs get a source too, coarser, only so that the
 * curve is followed closely.
 */
import { curvatureRadius, curveConcavity, evaluateCurve } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';

export interface SizeOptions {
  order: 1 | 2;
  /** target edge length away from raisers */
  size?: number;
  /** target edge length at raisers (overrides the radius-based default) */
  raiserSize?: number;
  /** growth rate of the size per unit distance */
  grading?: number;
  /** multiplies every size (1 = as given or as defaulted); used to build series of meshes */
  sizeFactor?: number;
}

export interface SizeSource {
  kind: 'arc' | 'point' | 'segment';
  /** the domain edge it comes from, or -1 for a corner */
  edge: number;
  h: number;
}

/** Elements along a full circle at a concave raiser, by element order (common practice for peak stress to about 1%). */
const RAISER_ELEMENTS_PER_CIRCLE = { 1: 96, 2: 48 } as const;
/** Elements along a full circle on a convex arc: enough to follow the shape (15 degrees a chord). */
const CONVEX_ELEMENTS_PER_CIRCLE = 24;

const ARC = 0;
const POINT = 1;
const SEGMENT = 2;
const STRIDE = 8;

export class SizeField {
  readonly hGlobal: number;
  readonly hMin: number;
  readonly grading: number;
  /** per source: kind, h, then geometry (arc: cx, cy, r, a0, sweep; point: x, y; segment: x0, y0, x1, y1, h1) */
  private readonly data: Float64Array;
  readonly count: number;
  readonly sources: SizeSource[];

  constructor(hGlobal: number, grading: number, sources: { meta: SizeSource; geom: number[] }[]) {
    this.hGlobal = hGlobal;
    this.grading = grading;
    this.count = sources.length;
    this.sources = sources.map((s) => s.meta);
    this.data = new Float64Array(STRIDE * sources.length);
    let hMin = hGlobal;
    sources.forEach((s, i) => {
      this.data.set(s.geom, STRIDE * i);
      hMin = Math.min(hMin, s.meta.h);
    });
    this.hMin = hMin;
  }

  /** Target edge length at (x, y). */
  at(x: number, y: number): number {
    const d = this.data;
    const g = this.grading;
    let h = this.hGlobal;
    for (let i = 0; i < this.count; i++) {
      const o = STRIDE * i;
      const kind = d[o];
      const hs = d[o + 1];
      if (hs >= h) continue;
      let dist: number;
      let hLocal = hs;
      if (kind === ARC) {
        const cx = d[o + 2];
        const cy = d[o + 3];
        const r = d[o + 4];
        const a0 = d[o + 5];
        const sweep = d[o + 6];
        const dx = x - cx;
        const dy = y - cy;
        const rho = Math.hypot(dx, dy);
        // Is the direction of (x, y) within the arc's angular range?
        let rel = Math.atan2(dy, dx) - a0;
        if (sweep >= 0) {
          rel = rel - 2 * Math.PI * Math.floor(rel / (2 * Math.PI));
          dist = rel <= sweep ? Math.abs(rho - r) : endDistance(x, y, cx, cy, r, a0, sweep);
        } else {
          rel = -rel;
          rel = rel - 2 * Math.PI * Math.floor(rel / (2 * Math.PI));
          dist = rel <= -sweep ? Math.abs(rho - r) : endDistance(x, y, cx, cy, r, a0, sweep);
        }
      } else if (kind === POINT) {
        dist = Math.hypot(x - d[o + 2], y - d[o + 3]);
      } else {
        const x0 = d[o + 2];
        const y0 = d[o + 3];
        const ex = d[o + 4] - x0;
        const ey = d[o + 5] - y0;
        const l2 = ex * ex + ey * ey;
        let t = l2 > 0 ? ((x - x0) * ex + (y - y0) * ey) / l2 : 0;
        t = t < 0 ? 0 : t > 1 ? 1 : t;
        dist = Math.hypot(x - x0 - t * ex, y - y0 - t * ey);
        hLocal = hs + (d[o + 6] - hs) * t;
      }
      const v = hLocal + g * dist;
      if (v < h) h = v;
    }
    return h;
  }
}

function endDistance(x: number, y: number, cx: number, cy: number, r: number, a0: number, sweep: number): number {
  const a1 = a0 + sweep;
  return Math.min(Math.hypot(x - cx - r * Math.cos(a0), y - cy - r * Math.sin(a0)), Math.hypot(x - cx - r * Math.cos(a1), y - cy - r * Math.sin(a1)));
}

/** Default size away from raisers: a twentieth of the longer side, at most a sixth of the shorter. */
export function defaultGlobalSize(domain: Domain, order: 1 | 2): number {
  const [x0, y0, x1, y1] = domain.bbox;
  const w = x1 - x0;
  const hgt = y1 - y0;
  const base = Math.min(Math.max(w, hgt) / 20, Math.min(w, hgt) / 6);
  return order === 2 ? base : base / 1.6;
}

/** Builds the size field of a domain. */
export function buildSizeField(domain: Domain, opts: SizeOptions): SizeField {
  const k = opts.sizeFactor ?? 1;
  const hGlobal = k * (opts.size ?? defaultGlobalSize(domain, opts.order));
  const grading = opts.grading ?? 0.25;
  const perCircle = RAISER_ELEMENTS_PER_CIRCLE[opts.order] / k;
  const raiserSize = opts.raiserSize !== undefined ? k * opts.raiserSize : undefined;
  const sources: { meta: SizeSource; geom: number[] }[] = [];
  const p = [0, 0];
  const q = [0, 0];
  for (const e of domain.edges) {
    const c = e.curve;
    if (c.kind === 'line') continue;
    const concave = curveConcavity(c) > 0;
    if (c.kind === 'arc') {
      const h = concave ? (raiserSize ?? (2 * Math.PI * c.r) / perCircle) : (2 * Math.PI * c.r) / CONVEX_ELEMENTS_PER_CIRCLE;
      if (h >= hGlobal) continue;
      sources.push({ meta: { kind: 'arc', edge: e.id, h }, geom: [ARC, h, c.cx, c.cy, c.r, c.a0, c.sweep] });
    } else {
      // An ellipse: a chain of straight sources whose sizes follow the local radius of curvature.
      const pieces = 64;
      for (let k = 0; k < pieces; k++) {
        const ta = k / pieces;
        const tb = (k + 1) / pieces;
        evaluateCurve(c, ta, p);
        evaluateCurve(c, tb, q);
        const ha = sizeOnCurve(curvatureRadius(c, ta), concave, perCircle, raiserSize);
        const hb = sizeOnCurve(curvatureRadius(c, tb), concave, perCircle, raiserSize);
        if (Math.min(ha, hb) >= hGlobal) continue;
        sources.push({ meta: { kind: 'segment', edge: e.id, h: Math.min(ha, hb) }, geom: [SEGMENT, ha, p[0], p[1], q[0], q[1], hb] });
      }
    }
  }
  for (const corner of domain.corners) {
    if (corner.materialAngle <= Math.PI + 1e-6) continue;
    // A re-entrant sharp corner: the elastic stress is singular there, so no size is right; refine
    // it well enough to show the concentration, and let the convergence check say it diverges.
    const h = raiserSize ?? hGlobal / 12;
    sources.push({ meta: { kind: 'point', edge: -1, h }, geom: [POINT, h, corner.x, corner.y] });
  }
  return new SizeField(hGlobal, grading, sources);
}

function sizeOnCurve(rho: number, concave: boolean, perCircle: number, raiserSize: number | undefined): number {
  if (concave) return raiserSize ?? (2 * Math.PI * rho) / perCircle;
  return (2 * Math.PI * rho) / CONVEX_ELEMENTS_PER_CIRCLE;
}
