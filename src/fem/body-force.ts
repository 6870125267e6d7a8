/**
 * Consistent nodal body forces: f_i += t * integral over the element of N_i b dA, for 3-node and
 * 6-node (isoparametric) triangles. b is a force per unit volume (N/mm^3 in a mm/N model), t the
 * thickness, so f is in force units. DOF 2*node + c, as everywhere.
 *
 * Quadrature, chosen so that a body force that is linear in x and y is integrated exactly on
 * every element the mesher makes:
 *  - 3-node elements: x is linear in (xi, eta) and det J constant, so N_i b is of degree 2 for a
 *    linear b; the 6-point degree-4 rule TRI6 (Dunavant 1985) is used, exact up to a cubic b.
 *  - straight-sided 6-node elements: det J constant, N_i of degree 2, so N_i b is of degree 3 for
 *    a linear b; TRI6 again (exact up to a quadratic b).
 *  - curved 6-node elements (a midside node on a curved boundary): x(xi, eta) is quadratic and
 *    det J quadratic, so N_i * b(x(xi, eta)) * det J is of degree 2 + 2 + 2 = 6 for a linear b;
 *    the 12-point degree-6 rule TRI12 below.
 * For a smooth non-polynomial b the quadrature error is of a higher order in h than the
 * discretisation error of either element, so the rules do not spoil convergence rates.
 */
import type { Mesh } from '../mesh/types.js';
import { isStraightP2, jacobianP2, shapeP2 } from '../element/triangle.js';
import { TRI6 } from './elements.js';

/** b(x, y, out): writes the body force per unit volume (bx, by) at (x, y) into out[0], out[1]. */
export type BodyForceField = (x: number, y: number, out: number[]) => void;

/**
 * 12-point degree-6 rule on the reference triangle (0,0), (1,0), (0,1), weights summing to 1/2:
 * D. A. Dunavant, "High degree efficient symmetrical Gaussian quadrature rules for the triangle",
 * IJNME 21 (1985) 1129-1148, the degree-6 rule (barycentric orbits of 3, 3 and 6 points). The
 * digits were recalled, not read from the paper; tests/body-force.test.ts proves the rule by
 * integrating every monomial xi^p eta^q with p + q <= 6 exactly (p! q! / (p + q + 2)!).
 */
export const TRI12 = buildTri12();

function buildTri12(): { xi: Float64Array; eta: Float64Array; w: Float64Array } {
  const xi: number[] = [];
  const eta: number[] = [];
  const w: number[] = [];
  // Orbit of (l0, l1, l2) barycentric points: (xi, eta) = (l1, l2).
  const orbit3 = (a: number, wt: number) => {
    const b = (1 - a) / 2;
    for (const [p, q] of [[b, b], [a, b], [b, a]]) {
      xi.push(p);
      eta.push(q);
      w.push(wt / 2);
    }
  };
  const orbit6 = (a: number, b: number, wt: number) => {
    const c = 1 - a - b;
    for (const [p, q] of [[a, b], [b, a], [a, c], [c, a], [b, c], [c, b]]) {
      xi.push(p);
      eta.push(q);
      w.push(wt / 2);
    }
  };
  orbit3(0.501426509658179, 0.116786275726379);
  orbit3(0.873821971016996, 0.050844906370207);
  orbit6(0.053145049844817, 0.310352451033784, 0.082851075618374);
  return { xi: Float64Array.from(xi), eta: Float64Array.from(eta), w: Float64Array.from(w) };
}

/**
 * Adds the consistent nodal forces of the body force field b over the whole mesh into f
 * (length 2 * mesh.nNodes): f[2 i + c] += t * integral N_i b_c dA. Throws a RangeError when an
 * element has det J <= 0 (a clockwise or folded element) or f has the wrong length.
 */
export function addBodyForce(mesh: Mesh, b: BodyForceField, thickness: number, f: Float64Array): void {
  if (f.length !== 2 * mesh.nNodes) {
    throw new RangeError(`addBodyForce: the force vector has ${f.length} entries, the mesh needs 2 x ${mesh.nNodes} nodes = ${2 * mesh.nNodes}`);
  }
  if (!(thickness > 0) || !Number.isFinite(thickness)) throw new RangeError(`addBodyForce: thickness must be a positive number, got ${thickness}`);
  const nodes = mesh.nodes;
  const el = mesh.elements;
  const bv = [0, 0];
  if (mesh.order === 1) {
    const rule = TRI6;
    for (let e = 0; e < mesh.nElements; e++) {
      const a = el[3 * e];
      const c1 = el[3 * e + 1];
      const c2 = el[3 * e + 2];
      const x0 = nodes[2 * a];
      const y0 = nodes[2 * a + 1];
      const x1 = nodes[2 * c1];
      const y1 = nodes[2 * c1 + 1];
      const x2 = nodes[2 * c2];
      const y2 = nodes[2 * c2 + 1];
      const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
      if (!(det > 0)) throw new RangeError(`element ${e}: det J = ${det} <= 0`);
      for (let q = 0; q < rule.w.length; q++) {
        const xi = rule.xi[q];
        const eta = rule.eta[q];
        const n0 = 1 - xi - eta;
        b(n0 * x0 + xi * x1 + eta * x2, n0 * y0 + xi * y1 + eta * y2, bv);
        const wq = rule.w[q] * det * thickness;
        f[2 * a] += wq * n0 * bv[0];
        f[2 * a + 1] += wq * n0 * bv[1];
        f[2 * c1] += wq * xi * bv[0];
        f[2 * c1 + 1] += wq * xi * bv[1];
        f[2 * c2] += wq * eta * bv[0];
        f[2 * c2 + 1] += wq * eta * bv[1];
      }
    }
    return;
  }
  const N = new Float64Array(6);
  const dxi = new Float64Array(6);
  const deta = new Float64Array(6);
  const J = new Float64Array(4);
  for (let e = 0; e < mesh.nElements; e++) {
    const rule = isStraightP2(nodes, el, e) ? TRI6 : TRI12;
    const o = 6 * e;
    for (let q = 0; q < rule.w.length; q++) {
      shapeP2(rule.xi[q], rule.eta[q], N, dxi, deta);
      let x = 0;
      let y = 0;
      for (let i = 0; i < 6; i++) {
        const k = el[o + i];
        x += N[i] * nodes[2 * k];
        y += N[i] * nodes[2 * k + 1];
      }
      jacobianP2(nodes, el, o, dxi, deta, 0, J);
      const det = J[0] * J[3] - J[1] * J[2];
      if (!(det > 0)) throw new RangeError(`element ${e}: det J = ${det} <= 0 at (${rule.xi[q]}, ${rule.eta[q]})`);
      b(x, y, bv);
      const wq = rule.w[q] * det * thickness;
      for (let i = 0; i < 6; i++) {
        const k = el[o + i];
        f[2 * k] += wq * N[i] * bv[0];
        f[2 * k + 1] += wq * N[i] * bv[1];
      }
    }
  }
}
