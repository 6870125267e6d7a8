/**
 * Smoothed-aggregation multigrid (src/solve/amg.ts) as the preconditioner of the iterative
 * fallback. Properties from P. Vanek, J. Mandel & M. Brezina, Computing 56 (1996) 179-196:
 *  - the tentative prolongator interpolates the near-null space exactly (P0 Bc = B) and has
 *    orthonormal columns;
 *  - the V-cycle with a forward Gauss-Seidel sweep down and a backward one up is a symmetric
 *    positive definite operator (what conjugate gradients needs);
 *  - conjugate gradients with it converge in a number of iterations that grows slowly with the
 *    mesh (the point of multigrid), to the solution of the direct solve.
 * The sparse kernels are checked against dense products (ml-matrix).
 */
import { describe, expect, it } from 'vitest';
import { Matrix } from 'ml-matrix';
import {
  aggregateBlocks,
  applyAmg,
  buildAmg,
  fullFromLower,
  multiplySparse,
  rigidModes,
  tentativeProlongator,
  transposeCsr,
  type Csr,
} from '../src/solve/amg.js';
import { solveSpd } from '../src/solve/index.js';
import { cantileverProblem } from '../src/bench/fixtures/cantilever.js';
import { cantileverProblemP2 } from '../src/bench/fixtures/cantilever-p2.js';
import { randomSpd, relativeMaxDifference } from './support/matrices.js';
import { randomVector } from '../src/bench/fixtures/random.js';

function dense(a: Csr): Matrix {
  const m = Matrix.zeros(a.rows, a.cols);
  for (let i = 0; i < a.rows; i++) for (let p = a.ptr[i]; p < a.ptr[i + 1]; p++) m.set(i, a.idx[p], m.get(i, a.idx[p]) + a.val[p]);
  return m;
}

function maxAbsDiff(x: Matrix, y: Matrix): number {
  let d = 0;
  for (let i = 0; i < x.rows; i++) for (let j = 0; j < x.columns; j++) d = Math.max(d, Math.abs(x.get(i, j) - y.get(i, j)));
  return d;
}

describe('sparse kernels of the multigrid', () => {
  it('full CSR from the lower triangle, transposes and products equal the dense ones', () => {
    const a = randomSpd(30, 0.2, 4);
    const A = fullFromLower(a);
    const D = dense(A);
    expect(maxAbsDiff(D, D.transpose())).toBe(0);
    const T = transposeCsr(A);
    expect(maxAbsDiff(dense(T), D)).toBe(0);
    const AA = multiplySparse(A, T);
    expect(maxAbsDiff(dense(AA), D.mmul(D))).toBeLessThan(1e-12 * D.norm('frobenius') ** 2);
    for (let i = 0; i < AA.rows; i++) for (let p = AA.ptr[i] + 1; p < AA.ptr[i + 1]; p++) expect(AA.idx[p]).toBeGreaterThan(AA.idx[p - 1]);
  });
});

describe('aggregation and the tentative prolongator', () => {
  const p = cantileverProblem(24, 12, 3);
  const A = fullFromLower(p.matrix);
  const modes = rigidModes(p.mesh.coords, p.fullDofOfRow);

  it('every node lies in one aggregate, and aggregates are far fewer than nodes', () => {
    const { aggOf, nAgg } = aggregateBlocks(A, modes.blockOf, modes.nBlocks);
    for (let k = 0; k < modes.nBlocks; k++) expect(aggOf[k]).toBeGreaterThanOrEqual(0);
    expect(nAgg).toBeLessThan(modes.nBlocks / 4);
  });

  it('P0 has orthonormal columns and interpolates the rigid motions exactly: P0 Bc = B', () => {
    const { aggOf, nAgg } = aggregateBlocks(A, modes.blockOf, modes.nBlocks);
    const aggOfRow = Int32Array.from(modes.blockOf, (k) => aggOf[k]);
    const { P0, Bc, nc } = tentativeProlongator(A.rows, modes.B, 3, aggOfRow, nAgg);
    const P = dense(P0);
    expect(maxAbsDiff(P.transpose().mmul(P), Matrix.eye(nc))).toBeLessThan(1e-12);
    const PB = P.mmul(new Matrix(Array.from({ length: nc }, (_, i) => Array.from(Bc.subarray(3 * i, 3 * i + 3)))));
    const B = new Matrix(Array.from({ length: A.rows }, (_, i) => Array.from(modes.B.subarray(3 * i, 3 * i + 3))));
    expect(maxAbsDiff(PB, B)).toBeLessThan(1e-12);
  });
});

describe('the V-cycle as a preconditioner', () => {
  it('is symmetric and positive definite', () => {
    const p = cantileverProblem(40, 20, 5);
    const modes = rigidModes(p.mesh.coords, p.fullDofOfRow);
    const h = buildAmg(p.matrix, modes.blockOf, modes.nBlocks, modes.B, { coarseSize: 200 });
    expect(h.sizes.length).toBeGreaterThanOrEqual(3);
    const n = p.matrix.n;
    const u = randomVector(n, 1);
    const v = randomVector(n, 2);
    const mu = new Float64Array(n);
    const mv = new Float64Array(n);
    applyAmg(h, u, mu);
    applyAmg(h, v, mv);
    const dot = (x: Float64Array, y: Float64Array) => x.reduce((s, xi, i) => s + xi * y[i], 0);
    expect(Math.abs(dot(u, mv) - dot(v, mu))).toBeLessThan(1e-10 * Math.sqrt(dot(u, mu) * dot(v, mv)));
    expect(dot(u, mu)).toBeGreaterThan(0);
    expect(dot(v, mv)).toBeGreaterThan(0);
  });

  it('conjugate gradients with it reach the direct solution, in iterations that grow slowly with the mesh', () => {
    const its: number[] = [];
    for (const [nx, ny] of [
      [40, 20],
      [80, 40],
      [120, 60],
    ]) {
      const p = cantileverProblemP2(nx, ny, 7);
      const b = randomVector(p.matrix.n, 3);
      const opts = { coords: p.mesh.coords, fullDofOfRow: p.fullDofOfRow, dofsPerNode: 2, nodeAdjacency: p.adjacency };
      const it = solveSpd(p.matrix, b, { ...opts, method: 'pcg', pcg: { preconditioner: 'amg' } });
      const direct = solveSpd(p.matrix, b, { ...opts, method: 'cholesky' });
      expect(it.stats.preconditioner).toMatch(/smoothed-aggregation multigrid/);
      expect(relativeMaxDifference(it.x, direct.x)).toBeLessThan(1e-7);
      its.push(it.stats.iterations);
    }
    // 9 times the unknowns from the first to the last mesh, each above the coarsest level's size
    expect(its[2]).toBeLessThan(2.5 * its[0]);
    expect(its[2]).toBeLessThan(100);
  });
});
