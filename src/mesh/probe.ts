/**
 * Values of a nodal field at arbitrary points: the element containing the point is found
 * through a uniform grid of element boxes, the point mapped to local coordinates (barycentric
 * for straight-sided elements, Newton iteration on the isoparametric map for curved ones), and
 * the field interpolated with the element's shape functions.
 */
import { shapeP2 } from '../element/triangle.js';
import type { Mesh } from './types.js';

export class FieldProbe {
  private readonly cells: Map<number, number[]> = new Map();
  private readonly x0: number;
  private readonly y0: number;
  private readonly cell: number;
  private readonly per: number;
  private readonly N = new Float64Array(6);
  private readonly dxi = new Float64Array(6);
  private readonly deta = new Float64Array(6);

  constructor(private readonly mesh: Mesh) {
    this.per = mesh.order === 2 ? 6 : 3;
    const n = mesh.nodes;
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
    this.cell = Math.max(xmax - xmin, ymax - ymin) / Math.max(1, Math.ceil(Math.sqrt(mesh.nElements / 2)));
    for (let e = 0; e < mesh.nElements; e++) {
      let ex0 = Infinity;
      let ey0 = Infinity;
      let ex1 = -Infinity;
      let ey1 = -Infinity;
      for (let k = 0; k < this.per; k++) {
        const v = mesh.elements[this.per * e + k];
        ex0 = Math.min(ex0, n[2 * v]);
        ex1 = Math.max(ex1, n[2 * v]);
        ey0 = Math.min(ey0, n[2 * v + 1]);
        ey1 = Math.max(ey1, n[2 * v + 1]);
      }
      for (let i = this.ix(ex0); i <= this.ix(ex1); i++) {
        for (let j = this.iy(ey0); j <= this.iy(ey1); j++) {
          const key = i * 1_000_003 + j;
          let l = this.cells.get(key);
          if (!l) this.cells.set(key, (l = []));
          l.push(e);
        }
      }
    }
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
    const loc = this.locate(x, y);
    if (!loc) return NaN;
    const { e, xi, eta } = loc;
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
    const list = this.cells.get(this.ix(x) * 1_000_003 + this.iy(y));
    if (!list) return null;
    const n = this.mesh.nodes;
    const el = this.mesh.elements;
    let best: { e: number; xi: number; eta: number; out: number } | null = null;
    for (const e of list) {
      const a = el[this.per * e];
      const b = el[this.per * e + 1];
      const cc = el[this.per * e + 2];
      const ax = n[2 * a];
      const ay = n[2 * a + 1];
      const det = (n[2 * b] - ax) * (n[2 * cc + 1] - ay) - (n[2 * cc] - ax) * (n[2 * b + 1] - ay);
      let xi = ((x - ax) * (n[2 * cc + 1] - ay) - (n[2 * cc] - ax) * (y - ay)) / det;
      let eta = ((n[2 * b] - ax) * (y - ay) - (x - ax) * (n[2 * b + 1] - ay)) / det;
      if (this.per === 6) [xi, eta] = this.newton(e, x, y, xi, eta);
      const out = Math.max(0, -xi, -eta, xi + eta - 1);
      if (out <= 1e-9) return { e, xi, eta };
      if (!best || out < best.out) best = { e, xi, eta, out };
    }
    return best && best.out <= 1e-6 ? best : null;
  }

  private newton(e: number, x: number, y: number, xi: number, eta: number): [number, number] {
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
    return [xi, eta];
  }
}
