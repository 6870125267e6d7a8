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
import { curvatureRadius, curveConcavity, curveDerivative, curveLength, curveTurn, evaluateCurve } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';
import type { SizeLimit } from './background.js';

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
  /** a further limit on the size, from an error estimate on an earlier mesh (already scaled) */
  limit?: SizeLimit;
}

export interface SizeSource {
  kind: 'arc' | 'point' | 'segment';
  /** the domain edge it comes from, or -1 for a corner */
  edge: number;
  h: number;
}

/** Elements along a full circle at a concave raiser, by element order (common practice for peak stress to about 1%). */
const RAISER_ELEMENTS_PER_CIRCLE = { 1: 128, 2: 48 } as const;
/** Elements along a full circle on a convex arc: enough to follow the shape (15 degrees a chord). */
const CONVEX_ELEMENTS_PER_CIRCLE = 24;

const ARC = 0;
const POINT = 1;
const SEGMENT = 2;
const STRIDE = 8;
/** queries a field with a deferred grid answers by every source before it builds the grid */
const DEFERRED_QUERIES = 2000;

export class SizeField {
  readonly hGlobal: number;
  readonly hMin: number;
  readonly grading: number;
  /**
   * per source, STRIDE numbers: kind, smallest h, then the geometry
   * (arc: cx, cy, r, a0, sweep; point: x, y; segment: x0, y0, x1, y1, h0, h1)
   */
  private readonly data: Float64Array;
  /** per source: how fast its value can change with position (its Lipschitz constant) */
  private readonly slope: Float64Array;
  /** per source: x0, y0, x1, y1 of its geometry's bounding box */
  private readonly box: Float64Array;
  readonly count: number;
  readonly sources: SizeSource[];
  // Candidate lists on a uniform grid: only sources that can be the least in a cell are kept.
  private gx0 = 0;
  private gy0 = 0;
  private cell = 1;
  private nx = 0;
  private ny = 0;
  private cellStart = new Int32Array(1);
  private cellList = new Int32Array(0);
  private gridN = 0;
  private gridBox?: readonly [number, number, number, number];
  /** queries answered without the grid while it is deferred (see fromFrame); Infinity when it is not */
  private queriesBeforeGrid: number;

  private readonly limit?: SizeLimit;

  /**
   * `deferGrid`: the candidate grid is built only once the field has answered DEFERRED_QUERIES
   * queries, each until then by every source (as beyond the grid), for a field asked a few times.
   */
  constructor(hGlobal: number, grading: number, sources: { meta: SizeSource; geom: number[] }[], bbox?: readonly [number, number, number, number], limit?: SizeLimit, deferGrid = false) {
    this.limit = limit;
    this.queriesBeforeGrid = Infinity;
    this.hGlobal = hGlobal;
    this.grading = grading;
    this.count = sources.length;
    this.sources = sources.map((s) => s.meta);
    this.data = new Float64Array(STRIDE * sources.length);
    this.slope = new Float64Array(sources.length);
    let hMin = hGlobal;
    sources.forEach((s, i) => {
      this.data.set(s.geom, STRIDE * i);
      hMin = Math.min(hMin, s.meta.h);
      let k = grading;
      if (s.geom[0] === SEGMENT) {
        const len = Math.hypot(s.geom[4] - s.geom[2], s.geom[5] - s.geom[3]);
        if (len > 0) k += Math.abs(s.geom[7] - s.geom[6]) / len;
      }
      this.slope[i] = k;
    });
    this.hMin = hMin;
    // per source, the bounding box of its geometry (a whole circle's for an arc)
    this.box = new Float64Array(4 * sources.length);
    sources.forEach((src, i) => {
      const q = src.geom;
      const o = 4 * i;
      if (q[0] === ARC) this.box.set([q[2] - q[4], q[3] - q[4], q[2] + q[4], q[3] + q[4]], o);
      else if (q[0] === POINT) this.box.set([q[2], q[3], q[2], q[3]], o);
      else this.box.set([Math.min(q[2], q[4]), Math.min(q[3], q[5]), Math.max(q[2], q[4]), Math.max(q[3], q[5])], o);
    });
    if (bbox && sources.length > 8) {
      if (deferGrid) {
        this.gridBox = bbox;
        this.queriesBeforeGrid = 0;
      } else this.buildGrid(bbox);
    }
  }

  /**
   * The same field for coordinates x = cx + s xi of a field built in a frame (sizes times s),
   * so that callers in model coordinates can ask it; `limit` is the caller's own, unscaled.
   * Its grid waits for its first DEFERRED_QUERIES queries: the mesh is made, and the analysis
   * asks this field about a few ligaments, so a grid of 3e5 source evaluations would be wasted.
   */
  fromFrame(cx: number, cy: number, s: number, bbox: readonly [number, number, number, number], limit?: SizeLimit): SizeField {
    const sources = this.sources.map((meta, i) => {
      const g = Array.from(this.data.subarray(STRIDE * i, STRIDE * (i + 1)));
      g[1] *= s;
      g[2] = cx + s * g[2];
      g[3] = cy + s * g[3];
      if (g[0] === ARC) g[4] *= s;
      else if (g[0] === SEGMENT) {
        g[4] = cx + s * g[4];
        g[5] = cy + s * g[5];
        g[6] *= s;
        g[7] *= s;
      }
      return { meta: { ...meta, h: meta.h * s }, geom: g };
    });
    return new SizeField(this.hGlobal * s, this.grading, sources, bbox, limit, true);
  }

  /** The value h_s + g dist of source i at (x, y). */
  private value(i: number, x: number, y: number): number {
    const d = this.data;
    const o = STRIDE * i;
    const kind = d[o];
    const g = this.grading;
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
      if (sweep < 0) rel = -rel;
      rel = rel - 2 * Math.PI * Math.floor(rel / (2 * Math.PI));
      const dist = rel <= Math.abs(sweep) ? Math.abs(rho - r) : endDistance(x, y, cx, cy, r, a0, sweep);
      return d[o + 1] + g * dist;
    }
    if (kind === POINT) return d[o + 1] + g * Math.hypot(x - d[o + 2], y - d[o + 3]);
    const x0 = d[o + 2];
    const y0 = d[o + 3];
    const ex = d[o + 4] - x0;
    const ey = d[o + 5] - y0;
    const l2 = ex * ex + ey * ey;
    let t = l2 > 0 ? ((x - x0) * ex + (y - y0) * ey) / l2 : 0;
    t = t < 0 ? 0 : t > 1 ? 1 : t;
    return d[o + 6] + (d[o + 7] - d[o + 6]) * t + g * Math.hypot(x - x0 - t * ex, y - y0 - t * ey);
  }

  /**
   * Sizes the candidate grid for a mesh of about `triangles` triangles: a build of up to two
   * source evaluations per expected triangle (the mesher queries the field several times per
   * triangle), at most 4e6. A no-op for small meshes and fields without a grid.
   */
  tuneGrid(triangles: number): void {
    if (this.gridBox) this.buildGrid(this.gridBox, Math.min(4e6, 2 * triangles));
  }

  /**
   * For each cell of a grid over the part, the sources that can give the least value somewhere
   * in it: v_s(x) lies within slope_s * (half diagonal) of v_s(centre), so a source whose lower
   * bound exceeds the least upper bound (or the global size) is never the minimum there.
   */
  private buildGrid(bbox: readonly [number, number, number, number], budget = 3e5): void {
    const [x0, y0, x1, y1] = bbox;
    const span = Math.max(x1 - x0, y1 - y0) || 1;
    // About `budget` source evaluations to build it: 3e5 (a few milliseconds) at first; a field
    // that will be queried millions of times is given a finer grid by tuneGrid. The grid changes
    // only the speed: every cell keeps every source that can be the least in it.
    this.queriesBeforeGrid = Infinity;
    const n = Math.max(8, Math.min(256, Math.round(Math.sqrt(budget / this.count))));
    if (n <= this.gridN) return;
    this.gridN = n;
    this.gridBox = bbox;
    this.cell = span / n;
    this.gx0 = x0 - this.cell;
    this.gy0 = y0 - this.cell;
    this.nx = Math.ceil((x1 - x0) / this.cell) + 3;
    this.ny = Math.ceil((y1 - y0) / this.cell) + 3;
    const half = (this.cell * Math.SQRT2) / 2;
    const start = new Int32Array(this.nx * this.ny + 1);
    const list: number[] = [];
    const v = new Float64Array(this.count);
    for (let j = 0; j < this.ny; j++) {
      for (let i = 0; i < this.nx; i++) {
        const cx = this.gx0 + (i + 0.5) * this.cell;
        const cy = this.gy0 + (j + 0.5) * this.cell;
        let upper = this.hGlobal;
        for (let s = 0; s < this.count; s++) {
          v[s] = this.value(s, cx, cy);
          upper = Math.min(upper, v[s] + this.slope[s] * half);
        }
        for (let s = 0; s < this.count; s++) if (v[s] - this.slope[s] * half < upper) list.push(s);
        start[j * this.nx + i + 1] = list.length;
      }
    }
    this.cellStart = start;
    this.cellList = Int32Array.from(list);
  }

  /** Target edge length at (x, y), by every source (the reference for the grid lookup). */
  atExhaustive(x: number, y: number): number {
    let h = this.hGlobal;
    for (let s = 0; s < this.count; s++) h = Math.min(h, this.value(s, x, y));
    return h;
  }

  /** Target edge length at (x, y). */
  at(x: number, y: number): number {
    const h = this.atSources(x, y);
    if (!this.limit) return h;
    return Math.min(h, this.limit.at(x, y));
  }

  private atSources(x: number, y: number): number {
    let h = this.hGlobal;
    if (this.queriesBeforeGrid < DEFERRED_QUERIES && ++this.queriesBeforeGrid === DEFERRED_QUERIES) this.buildGrid(this.gridBox!);
    if (this.nx > 0) {
      const i = Math.floor((x - this.gx0) / this.cell);
      const j = Math.floor((y - this.gy0) / this.cell);
      if (i >= 0 && j >= 0 && i < this.nx && j < this.ny) {
        const c = j * this.nx + i;
        for (let p = this.cellStart[c]; p < this.cellStart[c + 1]; p++) {
          const s = this.cellList[p];
          if (this.data[STRIDE * s + 1] >= h) continue;
          const val = this.value(s, x, y);
          if (val < h) h = val;
        }
        return h;
      }
    }
    // Outside the grid (queries beyond the part, such as the quadtree of the triangle
    // estimate): every source, each first bounded below by its smallest size plus the grading
    // times the distance to its bounding box (a shade less, against rounding), which skips
    // the far ones without evaluating them.
    const g = this.grading;
    const box = this.box;
    for (let s = 0; s < this.count; s++) {
      const hs = this.data[STRIDE * s + 1];
      if (hs >= h) continue;
      const o = 4 * s;
      const dx = x < box[o] ? box[o] - x : x > box[o + 2] ? x - box[o + 2] : 0;
      const dy = y < box[o + 1] ? box[o + 1] - y : y > box[o + 3] ? y - box[o + 3] : 0;
      if ((hs + g * Math.sqrt(dx * dx + dy * dy)) * (1 - 1e-12) >= h) continue;
      const val = this.value(s, x, y);
      if (val < h) h = val;
    }
    return h;
  }
}

function endDistance(x: number, y: number, cx: number, cy: number, r: number, a0: number, sweep: number): number {
  const a1 = a0 + sweep;
  return Math.min(Math.hypot(x - cx - r * Math.cos(a0), y - cy - r * Math.sin(a0)), Math.hypot(x - cx - r * Math.cos(a1), y - cy - r * Math.sin(a1)));
}

/** Default size away from raisers: a twentieth of the longer side, at most a sixth of the shorter. */
function defaultGlobalSize(domain: Domain, order: 1 | 2): number {
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
  // 3-node elements need gentler grading for the same stress accuracy (measured on Kirsch).
  const grading = opts.grading ?? (opts.order === 2 ? 0.25 : 0.15);
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
      // An ellipse or a Bezier curve: a chain of straight sources whose sizes follow the local
      // radius of curvature (a Bezier curve from a drawing bends one way only, so its concavity holds throughout).
      const pieces = 64;
      for (let k = 0; k < pieces; k++) {
        const ta = k / pieces;
        const tb = (k + 1) / pieces;
        evaluateCurve(c, ta, p);
        evaluateCurve(c, tb, q);
        const ha = sizeOnCurve(curvatureRadius(c, ta), concave, perCircle, raiserSize);
        const hb = sizeOnCurve(curvatureRadius(c, tb), concave, perCircle, raiserSize);
        if (Math.min(ha, hb) >= hGlobal) continue;
        sources.push({ meta: { kind: 'segment', edge: e.id, h: Math.min(ha, hb) }, geom: [SEGMENT, Math.min(ha, hb), p[0], p[1], q[0], q[1], ha, hb] });
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
  addLigamentSources(domain, hGlobal, ELEMENTS_ACROSS[opts.order] / k, sources);
  return new SizeField(hGlobal, grading, sources, domain.bbox, opts.limit);
}

/** Elements across a narrow ligament or strip, by element order (common practice). */
const ELEMENTS_ACROSS = { 1: 8, 2: 5 } as const;

/**
 * Narrow parts: where two stretches of boundary face each other across the material closer
 * than `across` elements of the global size, a point source asks for elements of gap / across.
 * The gap at a boundary point is the distance to the nearest boundary point that is not its
 * neighbour along the boundary (the path along the boundary is more than 1.5 times longer than
 * the straight line) and lies on the material side of its normal: a local feature size in the
 * sense of J. Ruppert (1995), measured between boundary pieces only.
 */
function addLigamentSources(domain: Domain, hGlobal: number, across: number, sources: { meta: SizeSource; geom: number[] }[]): void {
  const reach = hGlobal * across;
  const step = hGlobal / 3;
  // Boundary samples: position, inward normal, loop, cumulative length along the loop.
  const xs: number[] = [];
  const p = [0, 0];
  const d = [0, 0];
  for (const loop of domain.loops) {
    let s = 0;
    // A straight edge shorter than step / 4 gives its samples only where the last one lies more
    // than step / 8 back along the loop: an outline of thousands of tiny segments is then sampled
    // as finely as its length asks, not twice per segment (which made the search quadratic).
    let last = -Infinity;
    for (const id of loop.edges) {
      const c = domain.edges[id].curve;
      const len = curveLength(c);
      const n = Math.max(2, Math.ceil(len / step), c.kind === 'line' ? 0 : Math.ceil(curveTurn(c) / (Math.PI / 36)));
      const thin = c.kind === 'line' && len < step / 4;
      for (let j = 0; j < n; j++) {
        const t = (j + 0.5) / n;
        if (thin && s + t * len - last < step / 8) continue;
        last = s + t * len;
        evaluateCurve(c, t, p);
        curveDerivative(c, t, d);
        const l = Math.hypot(d[0], d[1]);
        // Material on the left: the inward normal is the left normal (-dy, dx).
        xs.push(p[0], p[1], -d[1] / l, d[0] / l, loop.index, s + t * len);
      }
      s += len;
    }
  }
  const loopLength = domain.loops.map((l) => l.edges.reduce((a, id) => a + curveLength(domain.edges[id].curve), 0));
  const m = xs.length / 6;
  // Samples and kept sources are found through grids of cells much smaller than the reach,
  // searched ring by ring outward until the ring lies beyond what is still wanted: the cost stays
  // near linear when many holes sit within one reach (a grid of cells one reach wide made every
  // sample visit every other, minutes for a few hundred holes).
  const cell = Math.max(reach / 32, step);
  const [bx0, by0] = domain.bbox;
  const samples = new PointGrid(cell, bx0, by0);
  for (let k = 0; k < m; k++) samples.add(k, xs[6 * k], xs[6 * k + 1]);
  const keptGrid = new PointGrid(cell, bx0, by0);
  for (let k = 0; k < m; k++) {
    const x = xs[6 * k];
    const y = xs[6 * k + 1];
    const nx = xs[6 * k + 2];
    const ny = xs[6 * k + 3];
    const loop = xs[6 * k + 4];
    const s = xs[6 * k + 5];
    let gap = reach;
    samples.visit(x, y, () => gap, (q) => {
      const dx = xs[6 * q] - x;
      const dy = xs[6 * q + 1] - y;
      const dist = Math.hypot(dx, dy);
      if (dist >= gap || dist === 0) return;
      if (dx * nx + dy * ny <= 0.5 * dist) return; // not across the material
      if (xs[6 * q + 4] === loop) {
        const L = loopLength[loop];
        let along = Math.abs(xs[6 * q + 5] - s);
        along = Math.min(along, L - along);
        if (along < 1.5 * dist) return; // a neighbour along the boundary
      }
      gap = dist;
    });
    if (gap >= reach) continue;
    const h = gap / across;
    // Thin the sources: skip one whose wish an earlier source already covers.
    let covered = false;
    keptGrid.visit(x, y, () => (covered ? -1 : 4 * h), (o) => {
      const dd = Math.hypot(sources[o].geom[2] - x, sources[o].geom[3] - y);
      if (sources[o].meta.h + 0.25 * dd <= h * 1.05 && dd < 4 * h) covered = true;
    });
    if (covered) continue;
    keptGrid.add(sources.length, x, y);
    sources.push({ meta: { kind: 'point', edge: -1, h }, geom: [POINT, h, x, y] });
  }
}

/** Points in square cells, visited ring by ring outward from a query point. */
class PointGrid {
  private readonly cells = new Map<number, number[]>();
  constructor(
    private readonly cell: number,
    private readonly x0: number,
    private readonly y0: number,
  ) {}

  private key(i: number, j: number): number {
    return i * 2_097_152 + j;
  }

  add(id: number, x: number, y: number): void {
    const k = this.key(Math.floor((x - this.x0) / this.cell), Math.floor((y - this.y0) / this.cell));
    const list = this.cells.get(k);
    if (list) list.push(id);
    else this.cells.set(k, [id]);
  }

  /**
   * Calls f for every point in rings of cells around (x, y), ring r after ring r - 1, while the
   * ring can hold a point nearer than radius() (read again after each ring, so a search that
   * finds something near stops early; a negative radius stops it).
   */
  visit(x: number, y: number, radius: () => number, f: (id: number) => void): void {
    const ci = Math.floor((x - this.x0) / this.cell);
    const cj = Math.floor((y - this.y0) / this.cell);
    for (let r = 0; ; r++) {
      const R = radius();
      if (R < 0 || (r - 1) * this.cell >= R) return;
      for (let i = ci - r; i <= ci + r; i++) {
        const edge = i === ci - r || i === ci + r;
        for (let j = cj - r; j <= cj + r; j += edge ? 1 : 2 * r) {
          const list = this.cells.get(this.key(i, j));
          if (list) for (const id of list) f(id);
          if (r === 0) break;
        }
      }
    }
  }
}

function sizeOnCurve(rho: number, concave: boolean, perCircle: number, raiserSize: number | undefined): number {
  if (concave) return raiserSize ?? (2 * Math.PI * rho) / perCircle;
  return (2 * Math.PI * rho) / CONVEX_ELEMENTS_PER_CIRCLE;
}
