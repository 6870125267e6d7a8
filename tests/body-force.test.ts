/**
 * Consistent body forces (src/fem/body-force.ts) against integrals computed independently on
 * the boundary of the meshed region by Green's theorem (area = closed integral of x dy, and so
 * on), on the same isoparametric boundary edges the elements have, by 5-point Gauss-Legendre
 * quadrature (exact for polynomials of degree 9; the integrands here are of degree 7 at most).
 * Since the shape functions sum to one and reproduce x and y, the nodal forces of a body force b
 * must sum to t * integral b dA and their first moments sum_i x_i f_i to t * integral x b dA:
 * both exact (to round-off) for a constant and a linear b, on curved 6-node elements too.
 * No published values are needed: these are identities of the element (exact).
 */
import { describe, expect, it } from 'vitest';
import { TRI12, addBodyForce } from '../src/fem/body-force.js';
import type { Mesh } from '../src/mesh/types.js';
import type { Geometry } from '../src/model/schema.js';
import { meshGeometry } from './support/fe.js';

/** A plate with a rounded (convex arc) end, a circular hole and an inclined elliptical hole. */
const GEOMETRY: Geometry = {
  outline: {
    shape: 'path',
    path: [[0, 0], { at: [60, 0], arc: { through: [75, 15] } }, [60, 30], [0, 30]],
  },
  holes: [
    { shape: 'circle', center: [20, 15], diameter: 10 },
    { shape: 'ellipse', center: [42, 15], a: 6, b: 3, angle: 30 },
  ],
};

const GL5_X = [-0.906179845938664, -0.5384693101056831, 0, 0.5384693101056831, 0.906179845938664];
const GL5_W = [0.2369268850561891, 0.4786286704993665, 0.5688888888888889, 0.4786286704993665, 0.2369268850561891];

/**
 * Closed integral over the meshed boundary (material on the left) of g(x, y) dy and h(x, y) dx,
 * along the quadratic (or straight) boundary edges of the mesh.
 */
function boundaryIntegral(mesh: Mesh, g: (x: number, y: number) => number, h: (x: number, y: number) => number): number {
  const n = mesh.nodes;
  let s = 0;
  for (let k = 0; k < mesh.nBEdges; k++) {
    const a = mesh.bEdges[3 * k];
    const b = mesh.bEdges[3 * k + 1];
    const m = mesh.bEdges[3 * k + 2];
    for (let q = 0; q < 5; q++) {
      const u = 0.5 + 0.5 * GL5_X[q];
      const w = 0.5 * GL5_W[q];
      let x: number, y: number, dx: number, dy: number;
      if (m >= 0) {
        const na = (1 - u) * (1 - 2 * u);
        const nm = 4 * u * (1 - u);
        const nb = u * (2 * u - 1);
        const da = 4 * u - 3;
        const dm = 4 - 8 * u;
        const db = 4 * u - 1;
        x = na * n[2 * a] + nm * n[2 * m] + nb * n[2 * b];
        y = na * n[2 * a + 1] + nm * n[2 * m + 1] + nb * n[2 * b + 1];
        dx = da * n[2 * a] + dm * n[2 * m] + db * n[2 * b];
        dy = da * n[2 * a + 1] + dm * n[2 * m + 1] + db * n[2 * b + 1];
      } else {
        x = (1 - u) * n[2 * a] + u * n[2 * b];
        y = (1 - u) * n[2 * a + 1] + u * n[2 * b + 1];
        dx = n[2 * b] - n[2 * a];
        dy = n[2 * b + 1] - n[2 * a + 1];
      }
      s += w * (g(x, y) * dy + h(x, y) * dx);
    }
  }
  return s;
}

/** Area moments of the meshed region by Green's theorem. */
function moments(mesh: Mesh) {
  const zero = () => 0;
  return {
    A: boundaryIntegral(mesh, (x) => x, zero),
    Ix: boundaryIntegral(mesh, (x) => (x * x) / 2, zero), // integral x dA
    Iy: boundaryIntegral(mesh, zero, (_x, y) => -(y * y) / 2), // integral y dA
    Ixx: boundaryIntegral(mesh, (x) => (x * x * x) / 3, zero), // integral x^2 dA
    Ixy: boundaryIntegral(mesh, (x, y) => (x * x * y) / 2, zero), // integral x y dA
    Iyy: boundaryIntegral(mesh, zero, (_x, y) => -(y * y * y) / 3), // integral y^2 dA
  };
}

function sums(mesh: Mesh, f: Float64Array) {
  let fx = 0;
  let fy = 0;
  let xfx = 0;
  let yfy = 0;
  let xfy = 0;
  for (let i = 0; i < mesh.nNodes; i++) {
    const x = mesh.nodes[2 * i];
    const y = mesh.nodes[2 * i + 1];
    fx += f[2 * i];
    fy += f[2 * i + 1];
    xfx += x * f[2 * i];
    yfy += y * f[2 * i + 1];
    xfy += x * f[2 * i + 1];
  }
  return { fx, fy, xfx, yfy, xfy };
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('addBodyForce', () => {
  it('TRI12 integrates every monomial of degree <= 6 exactly on the reference triangle', () => {
    const fact = (k: number): number => (k <= 1 ? 1 : k * fact(k - 1));
    let wsum = 0;
    for (const w of TRI12.w) wsum += w;
    expect(Math.abs(wsum - 0.5)).toBeLessThan(1e-14);
    for (let p = 0; p <= 6; p++) {
      for (let q = 0; p + q <= 6; q++) {
        let s = 0;
        for (let k = 0; k < TRI12.w.length; k++) s += TRI12.w[k] * TRI12.xi[k] ** p * TRI12.eta[k] ** q;
        const exact = (fact(p) * fact(q)) / fact(p + q + 2);
        expect(rel(s, exact)).toBeLessThan(1e-13);
      }
    }
  });

  for (const order of [1, 2] as const) {
    const name = order === 2 ? '6-node (curved edges)' : '3-node';
    const { mesh } = meshGeometry(GEOMETRY, order, { size: 4, raiserSize: 1.5 });
    const m = moments(mesh);
    const t = 2.5;

    it(`${name}: ${order === 2 ? 'the mesh has curved boundary elements, and ' : ''}the meshed area is close to the exact area`, () => {
      if (order === 2) {
        let curved = 0;
        for (let k = 0; k < mesh.nBEdges; k++) {
          const [a, b, c] = [mesh.bEdges[3 * k], mesh.bEdges[3 * k + 1], mesh.bEdges[3 * k + 2]];
          const dx = mesh.nodes[2 * c] - 0.5 * (mesh.nodes[2 * a] + mesh.nodes[2 * b]);
          const dy = mesh.nodes[2 * c + 1] - 0.5 * (mesh.nodes[2 * a + 1] + mesh.nodes[2 * b + 1]);
          if (Math.hypot(dx, dy) > 1e-6) curved++;
        }
        expect(curved).toBeGreaterThan(20);
      }
      // Exact area: rectangle + half disc of radius 15 - circle of radius 5 - ellipse 6 x 3.
      const exact = 60 * 30 + (Math.PI * 15 * 15) / 2 - Math.PI * 25 - Math.PI * 18;
      expect(rel(m.A, exact)).toBeLessThan(order === 2 ? 1e-5 : 1e-2);
    });

    it(`${name}: a constant body force gives nodal forces summing to t b A, with first moments t b integral x dA (exact)`, () => {
      const f = new Float64Array(2 * mesh.nNodes);
      addBodyForce(mesh, (_x, _y, out) => ((out[0] = 3), (out[1] = -2)), t, f);
      const s = sums(mesh, f);
      expect(rel(s.fx, 3 * t * m.A)).toBeLessThan(1e-12);
      expect(rel(s.fy, -2 * t * m.A)).toBeLessThan(1e-12);
      expect(rel(s.xfx, 3 * t * m.Ix)).toBeLessThan(1e-12);
      expect(rel(s.yfy, -2 * t * m.Iy)).toBeLessThan(1e-12);
    });

    it(`${name}: a linear body force gives the exact resultant and first moments`, () => {
      // bx = 1 + 2x - y, by = -0.5 + x + 3y.
      const f = new Float64Array(2 * mesh.nNodes);
      addBodyForce(mesh, (x, y, out) => ((out[0] = 1 + 2 * x - y), (out[1] = -0.5 + x + 3 * y)), t, f);
      const s = sums(mesh, f);
      expect(rel(s.fx, t * (m.A + 2 * m.Ix - m.Iy))).toBeLessThan(1e-12);
      expect(rel(s.fy, t * (-0.5 * m.A + m.Ix + 3 * m.Iy))).toBeLessThan(1e-12);
      // sum x_i fx_i = t integral x (1 + 2x - y) dA; sum y_i fy_i, sum x_i fy_i likewise.
      expect(rel(s.xfx, t * (m.Ix + 2 * m.Ixx - m.Ixy))).toBeLessThan(1e-12);
      expect(rel(s.yfy, t * (-0.5 * m.Iy + m.Ixy + 3 * m.Iyy))).toBeLessThan(1e-12);
      expect(rel(s.xfy, t * (-0.5 * m.Ix + m.Ixx + 3 * m.Ixy))).toBeLessThan(1e-12);
    });
  }

  it('single straight elements: a constant load puts A/3 on each node of a 3-node triangle, A/3 on each midside and nothing on the corners of a 6-node one', () => {
    // Element integrals of the shape functions: corners of the 6-node triangle integrate to 0,
    // midsides to A/3 (from the formulas of N_i in src/fem/elements.ts, exact).
    const base = {
      nBEdges: 0,
      bEdges: new Int32Array(0),
      bEdgeDomain: new Int32Array(0),
      bEdgeT: new Float64Array(0),
      nElements: 1,
    };
    const p1: Mesh = {
      ...base,
      order: 1,
      nNodes: 3,
      nVertices: 3,
      nodes: Float64Array.of(1, 1, 5, 2, 2, 4),
      elements: Int32Array.of(0, 1, 2),
      nodeEdge: new Int32Array(3).fill(-1),
      nodeCorner: new Int32Array(3).fill(-1),
    };
    const area = 0.5 * ((5 - 1) * (4 - 1) - (2 - 1) * (2 - 1));
    const f1 = new Float64Array(6);
    addBodyForce(p1, (_x, _y, out) => ((out[0] = 1), (out[1] = 2)), 1, f1);
    for (let i = 0; i < 3; i++) {
      expect(f1[2 * i]).toBeCloseTo(area / 3, 13);
      expect(f1[2 * i + 1]).toBeCloseTo((2 * area) / 3, 13);
    }
    const xy = [1, 1, 5, 2, 2, 4];
    const nodes = [...xy, 3, 1.5, 3.5, 3, 1.5, 2.5];
    const p2: Mesh = {
      ...base,
      order: 2,
      nNodes: 6,
      nVertices: 3,
      nodes: Float64Array.from(nodes),
      elements: Int32Array.of(0, 1, 2, 3, 4, 5),
      nodeEdge: new Int32Array(6).fill(-1),
      nodeCorner: new Int32Array(6).fill(-1),
    };
    const f2 = new Float64Array(12);
    addBodyForce(p2, (_x, _y, out) => ((out[0] = 1), (out[1] = 2)), 1, f2);
    for (let i = 0; i < 3; i++) {
      expect(Math.abs(f2[2 * i])).toBeLessThan(1e-14);
      expect(f2[2 * (i + 3)]).toBeCloseTo(area / 3, 13);
      expect(f2[2 * (i + 3) + 1]).toBeCloseTo((2 * area) / 3, 13);
    }
  });

  it('a clockwise element and a force vector of the wrong length are refused with a RangeError', () => {
    const bad: Mesh = {
      order: 1,
      nNodes: 3,
      nVertices: 3,
      nodes: Float64Array.of(0, 0, 0, 1, 1, 0),
      nElements: 1,
      elements: Int32Array.of(0, 1, 2),
      bEdges: new Int32Array(0),
      nBEdges: 0,
      bEdgeDomain: new Int32Array(0),
      bEdgeT: new Float64Array(0),
      nodeEdge: new Int32Array(3).fill(-1),
      nodeCorner: new Int32Array(3).fill(-1),
    };
    const b = (_x: number, _y: number, out: number[]) => ((out[0] = 1), (out[1] = 0));
    expect(() => addBodyForce(bad, b, 1, new Float64Array(6))).toThrow(RangeError);
    expect(() => addBodyForce(bad, b, 1, new Float64Array(4))).toThrow(/2 x 3 nodes/);
  });
});
