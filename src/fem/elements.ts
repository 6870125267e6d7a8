/**
 * Triangle elements for plane elasticity. DOF order within an element: ux0, uy0, ux1, uy1, ...
 * All routines write into caller-owned buffers and allocate nothing per element; they throw a
 * RangeError when det J <= 0 rather than taking its absolute value. Local numbering, shape
 * functions, the Jacobian and the straight-side test come from src/element/triangle.ts.
 */
import { isStraightP2, jacobianP2, shapeP2 } from '../element/triangle.js';

/**
 * Quadrature on the reference triangle (0,0), (1,0), (0,1); weights sum to 1/2.
 * TRI3: degree 2 (exact for straight-sided 6-node stiffness, whose B is linear).
 * TRI6: degree 4, D. A. Dunavant, "High degree efficient symmetrical Gaussian quadrature rules
 * for the triangle", IJNME 21 (1985) 1129-1148, used for curved 6-node elements and loads.
 */
export const TRI3 = {
  xi: Float64Array.of(1 / 6, 2 / 3, 1 / 6),
  eta: Float64Array.of(1 / 6, 1 / 6, 2 / 3),
  w: Float64Array.of(1 / 6, 1 / 6, 1 / 6),
};
const A6 = 0.445948490915965;
const B6 = 0.091576213509771;
const WA6 = 0.223381589678011 / 2;
const WB6 = 0.109951743655322 / 2;
export const TRI6 = {
  xi: Float64Array.of(A6, 1 - 2 * A6, A6, B6, 1 - 2 * B6, B6),
  eta: Float64Array.of(A6, A6, 1 - 2 * A6, B6, B6, 1 - 2 * B6),
  w: Float64Array.of(WA6, WA6, WA6, WB6, WB6, WB6),
};

/**
 * 3-node triangle (constant strain).      2
 * Local nodes 0, 1, 2 counter-clockwise.  | \
 * Writes the 6x6 row-major stiffness      |   \
 * t * A * B^T D B into ke; returns area.  0-----1
 */
export function stiffnessP1(nodes: Float64Array, el: Int32Array, e: number, D: Float64Array, thickness: number, ke: Float64Array, B: Float64Array): number {
  const area = strainMatrixP1(nodes, el, e, B);
  accumulateBtDB(B, D, 6, thickness * area, ke, true);
  return area;
}

/** Writes the 3x6 strain-displacement matrix of a 3-node triangle into B; returns its area. */
export function strainMatrixP1(nodes: Float64Array, el: Int32Array, e: number, B: Float64Array): number {
  const a = el[3 * e];
  const b = el[3 * e + 1];
  const c = el[3 * e + 2];
  const x0 = nodes[2 * a];
  const y0 = nodes[2 * a + 1];
  const x1 = nodes[2 * b];
  const y1 = nodes[2 * b + 1];
  const x2 = nodes[2 * c];
  const y2 = nodes[2 * c + 1];
  const det = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
  if (!(det > 0)) throw new RangeError(`element ${e}: det J = ${det} <= 0`);
  const inv = 1 / det;
  // dN/dx = (y_j - y_k) / 2A, dN/dy = (x_k - x_j) / 2A for (i, j, k) cyclic.
  const bx = [(y1 - y2) * inv, (y2 - y0) * inv, (y0 - y1) * inv];
  const by = [(x2 - x1) * inv, (x0 - x2) * inv, (x1 - x0) * inv];
  B.fill(0, 0, 18);
  for (let i = 0; i < 3; i++) {
    B[2 * i] = bx[i];
    B[6 + 2 * i + 1] = by[i];
    B[12 + 2 * i] = by[i];
    B[12 + 2 * i + 1] = bx[i];
  }
  return det / 2;
}

/** Scratch for the 6-node routines; one per thread of work. */
export class P2Scratch {
  N = new Float64Array(6);
  dxi = new Float64Array(6);
  deta = new Float64Array(6);
  B = new Float64Array(36);
  J = new Float64Array(4);
  g = new P2Gradients();
}

/**
 * Writes the 3x12 strain matrix of a 6-node (isoparametric) triangle at (xi, eta) into s.B and
 * returns det J.
 */
export function strainMatrixP2(nodes: Float64Array, el: Int32Array, e: number, xi: number, eta: number, s: P2Scratch): number {
  shapeP2(xi, eta, s.N, s.dxi, s.deta);
  const J = s.J;
  jacobianP2(nodes, el, 6 * e, s.dxi, s.deta, 0, J);
  const j11 = J[0], j12 = J[1], j21 = J[2], j22 = J[3];
  const det = j11 * j22 - j12 * j21;
  if (!(det > 0)) throw new RangeError(`element ${e}: det J = ${det} <= 0 at (${xi}, ${eta})`);
  const inv = 1 / det;
  const B = s.B;
  for (let i = 0; i < 6; i++) {
    // [dN/dx; dN/dy] = J^-1 [dN/dxi; dN/deta], J = [j11 j12; j21 j22].
    const dx = (j22 * s.dxi[i] - j12 * s.deta[i]) * inv;
    const dy = (-j21 * s.dxi[i] + j11 * s.deta[i]) * inv;
    B[2 * i] = dx;
    B[2 * i + 1] = 0;
    B[12 + 2 * i] = 0;
    B[12 + 2 * i + 1] = dy;
    B[24 + 2 * i] = dy;
    B[24 + 2 * i + 1] = dx;
  }
  return det;
}

/** Reference derivatives of the six shape functions at the points of a rule: [q * 6 + i]. */
function referenceDerivatives(rule: { xi: Float64Array; eta: Float64Array }): { dxi: Float64Array; deta: Float64Array } {
  const nq = rule.xi.length;
  const N = new Float64Array(6);
  const a = new Float64Array(6);
  const b = new Float64Array(6);
  const dxi = new Float64Array(6 * nq);
  const deta = new Float64Array(6 * nq);
  for (let q = 0; q < nq; q++) {
    shapeP2(rule.xi[q], rule.eta[q], N, a, b);
    dxi.set(a, 6 * q);
    deta.set(b, 6 * q);
  }
  return { dxi, deta };
}
const REF3 = referenceDerivatives(TRI3);
const REF6 = referenceDerivatives(TRI6);
/** The six shape functions at the points of TRI6: [q * 6 + i]. */
export const SHAPE_AT_TRI6: Float64Array = (() => {
  const out = new Float64Array(36);
  const N = new Float64Array(6);
  const a = new Float64Array(6);
  const b = new Float64Array(6);
  for (let q = 0; q < 6; q++) {
    shapeP2(TRI6.xi[q], TRI6.eta[q], N, a, b);
    out.set(N, 6 * q);
  }
  return out;
})();

/** Cartesian shape-function gradients of a 6-node element at the points of its rule. */
export class P2Gradients {
  /** dN_i/dx, dN_i/dy at point q: [q * 6 + i] */
  dx = new Float64Array(36);
  dy = new Float64Array(36);
  /** quadrature weight times det J at point q */
  w = new Float64Array(6);
  /** number of points used (3 for straight sides, 6 for curved) */
  nq = 0;
  /** scratch Jacobian */
  J = new Float64Array(4);
}

/**
 * Fills g with the gradients at the stiffness rule's points of element e: the 3-point rule for
 * straight sides (J constant, from the corners), the 6-point rule for curved sides
 * (isoparametric J at each point); with sixPoints, at the 6 points of the degree-4 rule (TRI6)
 * whatever the sides. Throws a RangeError when det J <= 0 anywhere.
 */
export function gradientsP2(nodes: Float64Array, el: Int32Array, e: number, g: P2Gradients, sixPoints = false): void {
  const o = 6 * e;
  if (isStraightP2(nodes, el, e)) {
    const a = el[o];
    const b = el[o + 1];
    const c = el[o + 2];
    const j11 = nodes[2 * b] - nodes[2 * a];
    const j12 = nodes[2 * b + 1] - nodes[2 * a + 1];
    const j21 = nodes[2 * c] - nodes[2 * a];
    const j22 = nodes[2 * c + 1] - nodes[2 * a + 1];
    const det = j11 * j22 - j12 * j21;
    if (!(det > 0)) throw new RangeError(`element ${e}: det J = ${det} <= 0`);
    const inv = 1 / det;
    const ref = sixPoints ? REF6 : REF3;
    const rule = sixPoints ? TRI6 : TRI3;
    const nq = rule.w.length;
    for (let k = 0; k < 6 * nq; k++) {
      g.dx[k] = (j22 * ref.dxi[k] - j12 * ref.deta[k]) * inv;
      g.dy[k] = (-j21 * ref.dxi[k] + j11 * ref.deta[k]) * inv;
    }
    for (let q = 0; q < nq; q++) g.w[q] = rule.w[q] * det;
    g.nq = nq;
    return;
  }
  const J = g.J;
  for (let q = 0; q < 6; q++) {
    jacobianP2(nodes, el, o, REF6.dxi, REF6.deta, 6 * q, J);
    const j11 = J[0], j12 = J[1], j21 = J[2], j22 = J[3];
    const det = j11 * j22 - j12 * j21;
    if (!(det > 0)) throw new RangeError(`element ${e}: det J = ${det} <= 0 at (${TRI6.xi[q]}, ${TRI6.eta[q]})`);
    const inv = 1 / det;
    for (let i = 0; i < 6; i++) {
      const k = 6 * q + i;
      g.dx[k] = (j22 * REF6.dxi[k] - j12 * REF6.deta[k]) * inv;
      g.dy[k] = (-j21 * REF6.dxi[k] + j11 * REF6.deta[k]) * inv;
    }
    g.w[q] = TRI6.w[q] * det;
  }
  g.nq = 6;
}

/**
 * 6-node triangle, plane stress or plane strain.     2
 * Local nodes 0 (0,0), 1 (1,0), 2 (0,1);             | \
 * 3 = mid 0-1, 4 = mid 1-2, 5 = mid 2-0.             5   4
 * Writes the 12x12 row-major stiffness into ke       |     \
 * (ux0, uy0, ux1, ...). Curved sides: isoparametric. 0--3--1
 * Straight sides: 3-point rule (exact, B^T D B is quadratic); curved: 6-point degree-4 rule.
 *
 * Built by 2x2 node blocks rather than as B^T D B with B's zeros: with B_col(ux_i) =
 * (dx_i, 0, dy_i) and B_col(uy_i) = (0, dy_i, dx_i), each block needs only the four weighted sums
 * Sxx = sum w dx_i dx_j, Sxy = sum w dx_i dy_j, Syx = sum w dy_i dx_j, Syy = sum w dy_i dy_j.
 * Only blocks with j >= i are formed; the others are their mirror images (D is symmetric), so
 * ke is symmetric to the last bit.
 */
export function stiffnessP2(nodes: Float64Array, el: Int32Array, e: number, D: Float64Array, thickness: number, ke: Float64Array, s: P2Scratch): void {
  const g = s.g;
  gradientsP2(nodes, el, e, g);
  const { dx, dy, w, nq } = g;
  const d00 = D[0], d01 = D[1], d02 = D[2], d11 = D[4], d12 = D[5], d22 = D[8];
  for (let i = 0; i < 6; i++) {
    for (let j = i; j < 6; j++) {
      let sxx = 0;
      let sxy = 0;
      let syx = 0;
      let syy = 0;
      for (let q = 0; q < nq; q++) {
        const wq = w[q] * thickness;
        const axi = dx[6 * q + i] * wq;
        const ayi = dy[6 * q + i] * wq;
        const bxj = dx[6 * q + j];
        const byj = dy[6 * q + j];
        sxx += axi * bxj;
        sxy += axi * byj;
        syx += ayi * bxj;
        syy += ayi * byj;
      }
      const uu = d00 * sxx + d02 * (sxy + syx) + d22 * syy;
      const uv = d01 * sxy + d02 * sxx + d12 * syy + d22 * syx;
      // on a diagonal block uv and vu are the same entry mirrored (equal but for rounding)
      const vu = i === j ? uv : d01 * syx + d12 * syy + d02 * sxx + d22 * sxy;
      const vv = d11 * syy + d12 * (syx + sxy) + d22 * sxx;
      const r = 24 * i + 2 * j; // row 2i, column 2j
      ke[r] = uu;
      ke[r + 1] = uv;
      ke[r + 12] = vu;
      ke[r + 13] = vv;
      const m = 24 * j + 2 * i; // row 2j, column 2i
      ke[m] = uu;
      ke[m + 1] = vu;
      ke[m + 12] = uv;
      ke[m + 13] = vv;
    }
  }
}

/**
 * Internal nodal forces of a 6-node element, re = t * sum_q w_q det J B_q^T D B_q ue, by the
 * stiffness rule (so re = ke ue) without forming ke. ue and re are in element DOF order.
 */
export function internalForceP2(nodes: Float64Array, el: Int32Array, e: number, D: Float64Array, thickness: number, ue: Float64Array, re: Float64Array, s: P2Scratch): void {
  const g = s.g;
  gradientsP2(nodes, el, e, g);
  const { dx, dy, w, nq } = g;
  re.fill(0, 0, 12);
  for (let q = 0; q < nq; q++) {
    let exx = 0;
    let eyy = 0;
    let gxy = 0;
    for (let i = 0; i < 6; i++) {
      const a = dx[6 * q + i];
      const b = dy[6 * q + i];
      exx += a * ue[2 * i];
      eyy += b * ue[2 * i + 1];
      gxy += b * ue[2 * i] + a * ue[2 * i + 1];
    }
    const f = w[q] * thickness;
    const sxx = (D[0] * exx + D[1] * eyy + D[2] * gxy) * f;
    const syy = (D[3] * exx + D[4] * eyy + D[5] * gxy) * f;
    const sxy = (D[6] * exx + D[7] * eyy + D[8] * gxy) * f;
    for (let i = 0; i < 6; i++) {
      const a = dx[6 * q + i];
      const b = dy[6 * q + i];
      re[2 * i] += a * sxx + b * sxy;
      re[2 * i + 1] += b * syy + a * sxy;
    }
  }
}

/** ke (+)= f * B^T D B for a 3 x n strain matrix B (row-major); clears ke first when `clear`. */
function accumulateBtDB(B: Float64Array, D: Float64Array, n: number, f: number, ke: Float64Array, clear: boolean): void {
  if (clear) ke.fill(0, 0, n * n);
  const d00 = D[0], d01 = D[1], d02 = D[2], d10 = D[3], d11 = D[4], d12 = D[5], d20 = D[6], d21 = D[7], d22 = D[8];
  for (let j = 0; j < n; j++) {
    const b0 = B[j];
    const b1 = B[n + j];
    const b2 = B[2 * n + j];
    // (D B)_j
    const c0 = (d00 * b0 + d01 * b1 + d02 * b2) * f;
    const c1 = (d10 * b0 + d11 * b1 + d12 * b2) * f;
    const c2 = (d20 * b0 + d21 * b1 + d22 * b2) * f;
    for (let i = 0; i < n; i++) ke[i * n + j] += B[i] * c0 + B[n + i] * c1 + B[2 * n + i] * c2;
  }
}
