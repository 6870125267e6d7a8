/**
 * The reference triangles (src/element/triangle.ts) against their definitions, the
 * isoparametric construction of the 6-node triangle (O. C. Zienkiewicz, R. L. Taylor, J. Z. Zhu,
 * "The Finite Element Method: Its Basis and Fundamentals", 7th ed., section 6.5 [M] recalled):
 * each shape function is 1 at its own node and 0 at the others, they sum to 1 and their
 * derivatives to 0, the derivatives match central differences of the values, and a straight
 * element's Jacobian is the constant corner Jacobian (det J = twice the area).
 */
import { describe, expect, it } from 'vitest';
import { determinant2, isStraightP2, jacobianP2, shapeDerivativesP2, shapeP2, shapeValuesP1, shapeValuesP2, STRAIGHT_EDGE_TOLERANCE } from '../src/element/triangle.js';

const NODES6: [number, number][] = [
  [0, 0],
  [1, 0],
  [0, 1],
  [0.5, 0],
  [0.5, 0.5],
  [0, 0.5],
];

describe('reference triangles', () => {
  it('6-node shape functions are 1 at their own node and 0 at the other five', () => {
    const N = new Float64Array(6);
    NODES6.forEach(([xi, eta], j) => {
      shapeValuesP2(xi, eta, N);
      for (let i = 0; i < 6; i++) expect(N[i] + 0).toBe(i === j ? 1 : 0); // + 0 folds -0 into 0
    });
  });

  it('3-node and 6-node shape functions sum to 1 and their derivatives to 0; derivatives match central differences', () => {
    const N = new Float64Array(6);
    const dxi = new Float64Array(6);
    const deta = new Float64Array(6);
    const a = new Float64Array(6);
    const b = new Float64Array(6);
    const h = 1e-6;
    for (const [xi, eta] of [
      [0.2, 0.3],
      [0.7, 0.1],
      [1 / 3, 1 / 3],
    ]) {
      shapeP2(xi, eta, N, dxi, deta);
      expect(N.reduce((s, v) => s + v, 0)).toBeCloseTo(1, 14);
      expect(dxi.reduce((s, v) => s + v, 0)).toBeCloseTo(0, 14);
      expect(deta.reduce((s, v) => s + v, 0)).toBeCloseTo(0, 14);
      for (let i = 0; i < 6; i++) {
        shapeValuesP2(xi + h, eta, a);
        shapeValuesP2(xi - h, eta, b);
        expect(dxi[i]).toBeCloseTo((a[i] - b[i]) / (2 * h), 8);
        shapeValuesP2(xi, eta + h, a);
        shapeValuesP2(xi, eta - h, b);
        expect(deta[i]).toBeCloseTo((a[i] - b[i]) / (2 * h), 8);
      }
      shapeValuesP1(xi, eta, N);
      expect(N[0] + N[1] + N[2]).toBeCloseTo(1, 15);
    }
  });

  it('a straight-sided 6-node element has the constant corner Jacobian, det J = twice its area, and is classed straight', () => {
    // corners (1, 1), (5, 2), (2, 4): twice the area = (4)(3) - (1)(1) = 11
    const nodes = Float64Array.of(1, 1, 5, 2, 2, 4, 3, 1.5, 3.5, 3, 1.5, 2.5);
    const el = Int32Array.of(0, 1, 2, 3, 4, 5);
    const dxi = new Float64Array(6);
    const deta = new Float64Array(6);
    const J = new Float64Array(4);
    for (const [xi, eta] of [
      [0.1, 0.2],
      [0.6, 0.3],
    ]) {
      shapeDerivativesP2(xi, eta, dxi, deta);
      jacobianP2(nodes, el, 0, dxi, deta, 0, J);
      // exact up to the rounding of the six-term sums
      [4, 1, 1, 3].forEach((v, k) => expect(J[k]).toBeCloseTo(v, 14));
      expect(determinant2(J)).toBeCloseTo(11, 13);
    }
    expect(isStraightP2(nodes, el, 0)).toBe(true);
  });

  it('a midside node moved off its chord by more than the tolerance makes the element curved', () => {
    const nodes = Float64Array.of(0, 0, 1, 0, 0, 1, 0.5, 0, 0.5, 0.5, 0, 0.5);
    const el = Int32Array.of(0, 1, 2, 3, 4, 5);
    expect(isStraightP2(nodes, el, 0)).toBe(true);
    nodes[7] = 1e3 * STRAIGHT_EDGE_TOLERANCE; // node 3 (mid 0-1) lifted off the side y = 0
    expect(isStraightP2(nodes, el, 0)).toBe(false);
  });
});
