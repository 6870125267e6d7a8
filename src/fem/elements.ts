/**
 * Triangle elements for plane elasticity. DOF order within an element: ux0, uy0, ux1, uy1, ...
 * All routines write into caller-owned buffers and allocate nothing per element; they throw a
 * RangeError when det J <= 0 rather than taking its absolute value.
 */

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

/**
 * Shape function derivatives of the 6-node triangle at (xi, eta) in the reference element:
 * N0 = L0(2L0-1), N1 = xi(2xi-1), N2 = eta(2eta-1), N3 = 4 L0 xi, N4 = 4 xi eta, N5 = 4 eta L0,
 * L0 = 1 - xi - eta.
 */
export function shapeP2(xi: number, eta: number, N: Float64Array, dxi: Float64Array, deta: Float64Array): void {
  const l0 = 1 - xi - eta;
  N[0] = l0 * (2 * l0 - 1);
  N[1] = xi * (2 * xi - 1);
  N[2] = eta * (2 * eta - 1);
  N[3] = 4 * l0 * xi;
  N[4] = 4 * xi * eta;
  N[5] = 4 * eta * l0;
  dxi[0] = 1 - 4 * l0;
  dxi[1] = 4 * xi - 1;
  dxi[2] = 0;
  dxi[3] = 4 * (l0 - xi);
  dxi[4] = 4 * eta;
  dxi[5] = -4 * eta;
  deta[0] = 1 - 4 * l0;
  deta[1] = 0;
  deta[2] = 4 * eta - 1;
  deta[3] = -4 * xi;
  deta[4] = 4 * xi;
  deta[5] = 4 * (l0 - eta);
}

/** Scratch for the 6-node routines; one per thread of work. */
export class P2Scratch {
  N = new Float64Array(6);
  dxi = new Float64Array(6);
  deta = new Float64Array(6);
  B = new Float64Array(36);
}

/**
 * Writes the 3x12 strain matrix of a 6-node (isoparametric) triangle at (xi, eta) into s.B and
 * returns det J.
 */
export function strainMatrixP2(nodes: Float64Array, el: Int32Array, e: number, xi: number, eta: number, s: P2Scratch): number {
  shapeP2(xi, eta, s.N, s.dxi, s.deta);
  const o = 6 * e;
  let j11 = 0;
  let j12 = 0;
  let j21 = 0;
  let j22 = 0;
  for (let i = 0; i < 6; i++) {
    const k = el[o + i];
    const x = nodes[2 * k];
    const y = nodes[2 * k + 1];
    j11 += s.dxi[i] * x;
    j12 += s.dxi[i] * y;
    j21 += s.deta[i] * x;
    j22 += s.deta[i] * y;
  }
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

/** True when every midside node sits at its chord midpoint (a straight-sided element). */
export function isStraightP2(nodes: Float64Array, el: Int32Array, e: number): boolean {
  const o = 6 * e;
  const pairs = [
    [0, 1, 3],
    [1, 2, 4],
    [2, 0, 5],
  ];
  for (const [a, b, m] of pairs) {
    const ia = el[o + a];
    const ib = el[o + b];
    const im = el[o + m];
    const dx = nodes[2 * im] - 0.5 * (nodes[2 * ia] + nodes[2 * ib]);
    const dy = nodes[2 * im + 1] - 0.5 * (nodes[2 * ia + 1] + nodes[2 * ib + 1]);
    const l = Math.abs(nodes[2 * ib] - nodes[2 * ia]) + Math.abs(nodes[2 * ib + 1] - nodes[2 * ia + 1]);
    if (Math.abs(dx) + Math.abs(dy) > 1e-12 * l) return false;
  }
  return true;
}

/**
 * 6-node triangle, plane stress or plane strain.     2
 * Local nodes 0 (0,0), 1 (1,0), 2 (0,1);             | \
 * 3 = mid 0-1, 4 = mid 1-2, 5 = mid 2-0.             5   4
 * Writes the 12x12 row-major stiffness into ke       |     \
 * (ux0, uy0, ux1, ...). Curved sides: isoparametric. 0--3--1
 * Straight sides: 3-point rule (exact, B^T D B is quadratic); curved: 6-point degree-4 rule.
 */
export function stiffnessP2(nodes: Float64Array, el: Int32Array, e: number, D: Float64Array, thickness: number, ke: Float64Array, s: P2Scratch): void {
  const rule = isStraightP2(nodes, el, e) ? TRI3 : TRI6;
  ke.fill(0, 0, 144);
  for (let q = 0; q < rule.w.length; q++) {
    const det = strainMatrixP2(nodes, el, e, rule.xi[q], rule.eta[q], s);
    accumulateBtDB(s.B, D, 12, thickness * det * rule.w[q], ke, false);
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
