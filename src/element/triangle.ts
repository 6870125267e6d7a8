/**
 * The reference triangles, stated once: local numbering, shape functions and their derivatives,
 * the isoparametric Jacobian and its determinant, and when a 6-node triangle counts as
 * straight-sided. The mesh checker, the element stiffness, the field probe, the error estimate
 * and the field pictures all read them from here. Layer: after geometry, before mesh.
 *
 * Reference coordinates (xi, eta), L0 = 1 - xi - eta.
 *
 *   3-node triangle            6-node triangle
 *
 *   2 (0,1)                    2 (0,1)
 *   | \                        | \
 *   |   \                      5   4        3 = mid 0-1 (1/2, 0)
 *   |     \                    |     \      4 = mid 1-2 (1/2, 1/2)
 *   0-------1 (1,0)            0--3---1     5 = mid 2-0 (0, 1/2)
 *
 * Corners counter-clockwise (y up); the element routines throw when det J <= 0.
 */

/** 3-node shape functions at (xi, eta) into N[0..2]: N0 = L0, N1 = xi, N2 = eta. */
export function shapeValuesP1(xi: number, eta: number, N: Float64Array): void {
  N[0] = 1 - xi - eta;
  N[1] = xi;
  N[2] = eta;
}

/**
 * 6-node shape functions at (xi, eta) into N[0..5]:
 * N0 = L0(2L0-1), N1 = xi(2xi-1), N2 = eta(2eta-1), N3 = 4 L0 xi, N4 = 4 xi eta, N5 = 4 eta L0.
 */
export function shapeValuesP2(xi: number, eta: number, N: Float64Array): void {
  const l0 = 1 - xi - eta;
  N[0] = l0 * (2 * l0 - 1);
  N[1] = xi * (2 * xi - 1);
  N[2] = eta * (2 * eta - 1);
  N[3] = 4 * l0 * xi;
  N[4] = 4 * xi * eta;
  N[5] = 4 * eta * l0;
}

/** Derivatives of the six shape functions with respect to xi and eta at (xi, eta), into dxi, deta. */
export function shapeDerivativesP2(xi: number, eta: number, dxi: Float64Array, deta: Float64Array): void {
  const l0 = 1 - xi - eta;
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

/** The six shape functions and their reference derivatives at (xi, eta). */
export function shapeP2(xi: number, eta: number, N: Float64Array, dxi: Float64Array, deta: Float64Array): void {
  shapeValuesP2(xi, eta, N);
  shapeDerivativesP2(xi, eta, dxi, deta);
}

/**
 * The isoparametric Jacobian J = [dx/dxi dy/dxi; dx/deta dy/deta] of the 6-node element whose
 * nodes start at el[o], from reference derivatives dxi[off + i], deta[off + i]; into J (row-major).
 */
export function jacobianP2(nodes: Float64Array, el: Int32Array, o: number, dxi: Float64Array, deta: Float64Array, off: number, J: Float64Array): void {
  let j11 = 0;
  let j12 = 0;
  let j21 = 0;
  let j22 = 0;
  for (let i = 0; i < 6; i++) {
    const k = el[o + i];
    const x = nodes[2 * k];
    const y = nodes[2 * k + 1];
    j11 += dxi[off + i] * x;
    j12 += dxi[off + i] * y;
    j21 += deta[off + i] * x;
    j22 += deta[off + i] * y;
  }
  J[0] = j11;
  J[1] = j12;
  J[2] = j21;
  J[3] = j22;
}

/** det of a row-major 2x2 Jacobian. */
export function determinant2(J: Float64Array): number {
  return J[0] * J[3] - J[1] * J[2];
}

/**
 * Straight-edge tolerance: a side counts as straight when its midside node lies within this
 * fraction of the side's extent (|dx| + |dy| of the chord) from the chord midpoint, the offset
 * measured as |dx| + |dy| too. Straight sides then take the 3-point stiffness rule with a
 * constant Jacobian; a side classed curved by rounding alone only costs the 6-point rule, which
 * is exact for it as well. Measured on the examples' meshes: midside offsets run continuously
 * from 1e-14 to 1e-10 of the side (the largest classed straight 9.9e-13, the smallest classed
 * curved 1.0e-12), so any other value reclassifies elements and moves the stiffness at
 * round-off; the field pictures still use their own 1e-9 test (render/field.ts) for that reason.
 */
export const STRAIGHT_EDGE_TOLERANCE = 1e-12;

/** True when every midside node of 6-node element e sits at its chord midpoint (a straight-sided element). */
export function isStraightP2(nodes: Float64Array, el: Int32Array, e: number): boolean {
  const o = 6 * e;
  return isStraightSide(nodes, el[o], el[o + 1], el[o + 3]) && isStraightSide(nodes, el[o + 1], el[o + 2], el[o + 4]) && isStraightSide(nodes, el[o + 2], el[o], el[o + 5]);
}

/** True when midside node im of the side from ia to ib sits at the chord midpoint (to STRAIGHT_EDGE_TOLERANCE). */
function isStraightSide(nodes: Float64Array, ia: number, ib: number, im: number): boolean {
  const dx = nodes[2 * im] - 0.5 * (nodes[2 * ia] + nodes[2 * ib]);
  const dy = nodes[2 * im + 1] - 0.5 * (nodes[2 * ia + 1] + nodes[2 * ib + 1]);
  const l = Math.abs(nodes[2 * ib] - nodes[2 * ia]) + Math.abs(nodes[2 * ib + 1] - nodes[2 * ia + 1]);
  return Math.abs(dx) + Math.abs(dy) <= STRAIGHT_EDGE_TOLERANCE * l;
}
