/**
 * Values of a nodal field at arbitrary points: the element containing the point is found
 * through a uniform grid of element boxes, the point mapped to local coordinates (barycentric
 * for straight-sided elements, Newton iteration on the isoparametric map for curved ones), and
 * the field interpolated with the element's shape functions.
 *
 * Speed: of the elements listed in the point's grid cell, Newton runs only on those the
 * straight-triangle (corner) coordinates do not already put clearly outside. "Clearly" is a
 * margin per element, its bulge: the 6-node map is the corner triangle's affine map A plus
 * N3 d3 + N4 d4 + N5 d5, d the offset of each midside node from its chord's midpoint (the
 * quadratic shape functions reproduce linear fields). So for a local point q within 1e-6 of the
 * reference triangle (where |N_mid| <= 1 + 4e-6), A^-1(x(q)) lies within sum |J^-1 d_m|_1 of q,
 * and the corner coordinates cannot be further outside than 1e-6 plus that sum. An element
 * skipped this way is one Newton would have put more than 1e-6 outside, which `findElement`
 * never returns, so the element found and its local coordinates are the same as with Newton on
 * every candidate, bit for bit. The one exception is wanted: far outside an element, where the
 * quadratic map folds over, Newton can stop unconverged at a point inside the reference
 * triangle, and such an element (which does not hold the point) is now skipped rather than
 * returned; none of the examples met one (their results are unchanged to the last bit). The
 * grid is flat (cell offsets and element lists in Int32Arrays) and a query allocates nothing.
 */
import { shapeP2 } from '../element/triangle.js';
import type { Mesh } from './types.js';

/** Local coordinates within this of the reference triangle count as inside. */
const INSIDE = 1e-9;
/** The nearest element within this (local coordinates) is taken when none contains the point. */
const NEAR = 1e-6;

export class FieldProbe {
  /** element numbers of grid cell c: cellElements[cellStart[c] .. cellStart[c + 1]), ascending */
  private readonly cellStart: Int32Array;
  private readonly cellElements: Int32Array;
  private readonly nx: number;
  private readonly ny: number;
  private readonly x0: number;
  private readonly y0: number;
  private readonly cell: number;
  /** coarse cells of side `coarse` from (x0, y0), coarseX by coarseY; each element's range of them (i0, i1, j0, j1) */
  private readonly coarse: number;
  private readonly coarseX: number;
  private readonly coarseY: number;
  private readonly coarseBox: Int32Array;
  private readonly per: number;
  /** per element: how far outside (local coordinates) the corner coordinates may put a point Newton puts inside */
  private readonly skipMargin: Float64Array;
  private readonly N = new Float64Array(6);
  private readonly dxi = new Float64Array(6);
  private readonly deta = new Float64Array(6);
  /** local coordinates left by the last `newton` or `findElement` */
  private xi = 0;
  private eta = 0;

  constructor(private readonly mesh: Mesh) {
    this.per = mesh.order === 2 ? 6 : 3;
    const per = this.per;
    const n = mesh.nodes;
    const el = mesh.elements;
    let xmin = Infinity;
    let ymin = Infinity;
    let xmax = -Infinity;
    let ymax = -Infinity;
    for (let i = 0; i < mesh.nNodes; i++) {
      xmin = Math.min(xmin, n[2 * i]);
      xmax = Math.max(xmax, n[2 * i]);
      ymin = Math.min(ymin, n[2 * i + 1]);
      ymax = Math.max(ymax, n[2 * i + 1]);
    }
    this.x0 = xmin;
    this.y0 = ymin;
    // About 8 cells per element over the box: a graded mesh crowds its small elements near the
    // raisers, where a cell of the mean element size held some 40 of them (measured on the strap
    // example's size limits) and now holds about 4; a large element is listed in every cell its
    // box touches. A box without area (no mesh) falls back to one cell per two elements along the longer side.
    this.cell = Math.sqrt(((xmax - xmin) * (ymax - ymin)) / (8 * Math.max(1, mesh.nElements))) || Math.max(xmax - xmin, ymax - ymin) / Math.max(1, Math.ceil(Math.sqrt(mesh.nElements / 2)));
    const nEl = mesh.nElements;
    this.nx = mesh.nNodes > 0 ? this.ix(xmax) + 1 : 0;
    this.ny = mesh.nNodes > 0 ? this.iy(ymax) + 1 : 0;
    // The candidates are those of the coarse cells used before the cells were made finer (one
    // per two elements along the longer side, each element listed in the coarse cells its nodes'
    // box touches), kept so that every answer stays the same to the last bit: the fine cell
    // only narrows the search. Those coarse cells miss a point a rounding outside an element's
    // nodes' box when a coarse cell's side falls there (a boundary node at y = 90 and a coarse
    // cell 10 high; the point at y = 90 - 1e-10 is then outside, though within 1e-9 of the
    // element): kept as it was, see the worktree's report.
    this.coarse = Math.max(xmax - xmin, ymax - ymin) / Math.max(1, Math.ceil(Math.sqrt(nEl / 2)));
    this.coarseX = mesh.nNodes > 0 ? this.cx(xmax) + 1 : 0;
    this.coarseY = mesh.nNodes > 0 ? this.cy(ymax) + 1 : 0;
    this.coarseBox = new Int32Array(4 * nEl);
    // Element boxes in cells, counted then filled (two passes over the same loops).
    const box = new Int32Array(4 * nEl);
    const count = new Int32Array(this.nx * this.ny + 1);
    for (let e = 0; e < nEl; e++) {
      let ex0 = Infinity;
      let ey0 = Infinity;
      let ex1 = -Infinity;
      let ey1 = -Infinity;
      // The region of a 6-node element lies within the box of its corners and of each curved
      // side's control point 2 m - (a + b) / 2 (a quadratic curve lies in the triangle of its
      // control points), padded by what 1e-6 in local coordinates can reach (at most 1e-6 times
      // the two side vectors' lengths): every element that could hold the point is then listed
      // in its cell, however fine the cells.
      for (let k = 0; k < per; k++) {
        const v = el[per * e + k];
        ex0 = Math.min(ex0, n[2 * v]);
        ex1 = Math.max(ex1, n[2 * v]);
        ey0 = Math.min(ey0, n[2 * v + 1]);
        ey1 = Math.max(ey1, n[2 * v + 1]);
      }
      this.coarseBox[4 * e] = this.cx(ex0);
      this.coarseBox[4 * e + 1] = this.cx(ex1);
      this.coarseBox[4 * e + 2] = this.cy(ey0);
      this.coarseBox[4 * e + 3] = this.cy(ey1);
      if (per === 6) {
        for (let m = 0; m < 3; m++) {
          const a = el[6 * e + m];
          const b = el[6 * e + ((m + 1) % 3)];
          const mid = el[6 * e + 3 + m];
          const px = 2 * n[2 * mid] - 0.5 * (n[2 * a] + n[2 * b]);
          const py = 2 * n[2 * mid + 1] - 0.5 * (n[2 * a + 1] + n[2 * b + 1]);
          ex0 = Math.min(ex0, px);
          ex1 = Math.max(ex1, px);
          ey0 = Math.min(ey0, py);
          ey1 = Math.max(ey1, py);
        }
      }
      const pad = 4e-6 * (ex1 - ex0 + ey1 - ey0);
      box[4 * e] = Math.max(0, this.ix(ex0 - pad));
      box[4 * e + 1] = Math.min(this.nx - 1, this.ix(ex1 + pad));
      box[4 * e + 2] = Math.max(0, this.iy(ey0 - pad));
      box[4 * e + 3] = Math.min(this.ny - 1, this.iy(ey1 + pad));
      for (let i = box[4 * e]; i <= box[4 * e + 1]; i++) for (let j = box[4 * e + 2]; j <= box[4 * e + 3]; j++) count[i * this.ny + j + 1]++;
    }
    for (let c = 0; c < this.nx * this.ny; c++) count[c + 1] += count[c];
    this.cellStart = count;
    this.cellElements = new Int32Array(count[this.nx * this.ny]);
    const fill = count.slice(0, this.nx * this.ny);
    for (let e = 0; e < nEl; e++) {
      for (let i = box[4 * e]; i <= box[4 * e + 1]; i++) for (let j = box[4 * e + 2]; j <= box[4 * e + 3]; j++) this.cellElements[fill[i * this.ny + j]++] = e;
    }
    // 1e-8 and 1.01 cover the Newton residual and |N_mid| <= 1 + 4e-6 near the triangle.
    this.skipMargin = new Float64Array(per === 6 ? nEl : 0);
    for (let e = 0; e < this.skipMargin.length; e++) this.skipMargin[e] = NEAR + 1e-8 + 1.01 * this.bulge(e);
  }

  /** sum over the midside nodes of |J^-1 d|_1, d the node's offset from its chord's midpoint (see the file comment) */
  private bulge(e: number): number {
    const n = this.mesh.nodes;
    const el = this.mesh.elements;
    const o = 6 * e;
    const ax = n[2 * el[o]];
    const ay = n[2 * el[o] + 1];
    const j11 = n[2 * el[o + 1]] - ax;
    const j21 = n[2 * el[o + 1] + 1] - ay;
    const j12 = n[2 * el[o + 2]] - ax;
    const j22 = n[2 * el[o + 2] + 1] - ay;
    const det = j11 * j22 - j12 * j21;
    let b = 0;
    for (let m = 0; m < 3; m++) {
      const p = el[o + m];
      const q = el[o + ((m + 1) % 3)];
      const mid = el[o + 3 + m];
      const dx = n[2 * mid] - 0.5 * (n[2 * p] + n[2 * q]);
      const dy = n[2 * mid + 1] - 0.5 * (n[2 * p + 1] + n[2 * q + 1]);
      b += Math.abs(j22 * dx - j12 * dy) / Math.abs(det) + Math.abs(-j21 * dx + j11 * dy) / Math.abs(det);
    }
    // A degenerate corner triangle gives no bound: Newton always runs.
    return Number.isFinite(b) ? b : Infinity;
  }

  /** the local coordinates of the point of the last `findElement` that found an element */
  get foundXi(): number {
    return this.xi;
  }
  get foundEta(): number {
    return this.eta;
  }

  private cx(x: number): number {
    return Math.floor((x - this.x0) / this.coarse);
  }
  private cy(y: number): number {
    return Math.floor((y - this.y0) / this.coarse);
  }
  private ix(x: number): number {
    return Math.floor((x - this.x0) / this.cell);
  }
  private iy(y: number): number {
    return Math.floor((y - this.y0) / this.cell);
  }

  /**
   * Interpolates `field` (stride values per node, component c) at (x, y); NaN outside the mesh.
   * Points on an element edge, within 1e-9 in local coordinates, count as inside.
   */
  value(field: Float64Array, stride: number, c: number, x: number, y: number): number {
    const e = this.findElement(x, y);
    if (e < 0) return NaN;
    const xi = this.xi;
    const eta = this.eta;
    const el = this.mesh.elements;
    if (this.per === 3) {
      const l0 = 1 - xi - eta;
      return l0 * field[stride * el[3 * e] + c] + xi * field[stride * el[3 * e + 1] + c] + eta * field[stride * el[3 * e + 2] + c];
    }
    shapeP2(xi, eta, this.N, this.dxi, this.deta);
    let s = 0;
    for (let k = 0; k < 6; k++) s += this.N[k] * field[stride * el[6 * e + k] + c];
    return s;
  }

  /** The element holding (x, y) and the local coordinates there, or null. */
  locate(x: number, y: number): { e: number; xi: number; eta: number } | null {
    const e = this.findElement(x, y);
    return e < 0 ? null : { e, xi: this.xi, eta: this.eta };
  }

  /**
   * The element holding (x, y), -1 when none does; its local coordinates are then `foundXi`,
   * `foundEta` (until the next query). The first element of the cell's list within 1e-9 of
   * containing the point, else the nearest within 1e-6. Allocates nothing.
   */
  findElement(x: number, y: number): number {
    const ci = this.cx(x);
    const cj = this.cy(y);
    if (!(ci >= 0 && ci < this.coarseX && cj >= 0 && cj < this.coarseY)) return -1;
    const i = Math.min(this.ix(x), this.nx - 1);
    const j = Math.min(this.iy(y), this.ny - 1);
    const c = i * this.ny + j;
    const n = this.mesh.nodes;
    const el = this.mesh.elements;
    const per = this.per;
    let best = -1;
    let bestOut = Infinity;
    let bestXi = 0;
    let bestEta = 0;
    for (let k = this.cellStart[c], end = this.cellStart[c + 1]; k < end; k++) {
      const e = this.cellElements[k];
      const cb = 4 * e;
      if (ci < this.coarseBox[cb] || ci > this.coarseBox[cb + 1] || cj < this.coarseBox[cb + 2] || cj > this.coarseBox[cb + 3]) continue;
      const a = el[per * e];
      const b = el[per * e + 1];
      const cc = el[per * e + 2];
      const ax = n[2 * a];
      const ay = n[2 * a + 1];
      const det = (n[2 * b] - ax) * (n[2 * cc + 1] - ay) - (n[2 * cc] - ax) * (n[2 * b + 1] - ay);
      let xi = ((x - ax) * (n[2 * cc + 1] - ay) - (n[2 * cc] - ax) * (y - ay)) / det;
      let eta = ((n[2 * b] - ax) * (y - ay) - (x - ax) * (n[2 * b + 1] - ay)) / det;
      if (per === 6) {
        if (Math.max(0, -xi, -eta, xi + eta - 1) > this.skipMargin[e]) continue;
        this.newton(e, x, y, xi, eta);
        xi = this.xi;
        eta = this.eta;
      }
      const out = Math.max(0, -xi, -eta, xi + eta - 1);
      if (out <= INSIDE) {
        this.xi = xi;
        this.eta = eta;
        return e;
      }
      if (out < bestOut) {
        best = e;
        bestOut = out;
        bestXi = xi;
        bestEta = eta;
      }
    }
    if (best < 0 || !(bestOut <= NEAR)) return -1;
    this.xi = bestXi;
    this.eta = bestEta;
    return best;
  }

  /** Newton iteration on the isoparametric map of element e from (xi, eta); the result in this.xi, this.eta. */
  private newton(e: number, x: number, y: number, xi: number, eta: number): void {
    const n = this.mesh.nodes;
    const el = this.mesh.elements;
    for (let it = 0; it < 20; it++) {
      shapeP2(xi, eta, this.N, this.dxi, this.deta);
      let fx = -x;
      let fy = -y;
      let j11 = 0;
      let j12 = 0;
      let j21 = 0;
      let j22 = 0;
      for (let k = 0; k < 6; k++) {
        const v = el[6 * e + k];
        fx += this.N[k] * n[2 * v];
        fy += this.N[k] * n[2 * v + 1];
        j11 += this.dxi[k] * n[2 * v];
        j21 += this.dxi[k] * n[2 * v + 1];
        j12 += this.deta[k] * n[2 * v];
        j22 += this.deta[k] * n[2 * v + 1];
      }
      const det = j11 * j22 - j12 * j21;
      const dxi = (j22 * fx - j12 * fy) / det;
      const deta = (-j21 * fx + j11 * fy) / det;
      xi -= dxi;
      eta -= deta;
      if (Math.abs(dxi) + Math.abs(deta) < 1e-13) break;
    }
    this.xi = xi;
    this.eta = eta;
  }
}
