import { describe, it, expect } from 'vitest';
import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { assembleSymmetric, multiplySymmetric, extractPrincipal, type SymmetricCsc } from '../src/solve/sparse.js';
import {
  orderAmd,
  orderNatural,
  orderNestedDissection,
  isPermutation,
  invertPermutation,
  type Ordering,
} from '../src/solve/ordering.js';
import {
  analyzeCholesky,
  factorCholesky,
  factorCholeskySimplicial,
  solveCholesky,
  solveCholeskySimplicial,
  SolverPivotError,
} from '../src/solve/cholesky.js';
import { solveSpd, relativeResidual } from '../src/solve/index.js';
import { adjacencyGraph } from '../src/solve/sparse.js';
import { seededRandom, gridLaplacian, gridGeometry, cantileverProblem, jitteredRectangleMesh, planeStressStiffness, meshNodeAdjacency } from '../src/solve/testing.js';

function toDense(a: SymmetricCsc): Matrix {
  const m = Matrix.zeros(a.n, a.n);
  for (let j = 0; j < a.n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      m.set(a.rowIndex[p], j, a.values[p]);
      m.set(j, a.rowIndex[p], a.values[p]);
    }
  }
  return m;
}

/** Random sparse SPD: random symmetric pattern with density d, made diagonally dominant. */
function randomSpd(n: number, density: number, seed: number): SymmetricCsc {
  const rnd = seededRandom(seed);
  const r: number[] = [];
  const c: number[] = [];
  const v: number[] = [];
  const rowSum = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    for (let i = j + 1; i < n; i++) {
      if (rnd() < density) {
        const x = 2 * rnd() - 1;
        r.push(i);
        c.push(j);
        v.push(x);
        rowSum[i] += Math.abs(x);
        rowSum[j] += Math.abs(x);
      }
    }
  }
  for (let i = 0; i < n; i++) {
    r.push(i);
    c.push(i);
    v.push(rowSum[i] + 0.5 + rnd());
  }
  return assembleSymmetric(n, Int32Array.from(r), Int32Array.from(c), Float64Array.from(v), 'triangle');
}

function randomVector(n: number, seed: number): Float64Array {
  const rnd = seededRandom(seed);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) b[i] = 2 * rnd() - 1;
  return b;
}

describe('smoke', () => {
  it('supernodal solve matches dense on a random SPD matrix', () => {
    const a = randomSpd(60, 0.08, 3);
    const b = randomVector(60, 4);
    const ord = orderAmd(adjacencyGraph(a));
    expect(isPermutation(ord.perm)).toBe(true);
    const sym = analyzeCholesky(a, ord);
    const f = factorCholesky(a, sym);
    const x = solveCholesky(f, b);
    const fs = factorCholeskySimplicial(a, sym);
    const xs = solveCholeskySimplicial(fs, b);
    const xd = new CholeskyDecomposition(toDense(a)).solve(Matrix.columnVector(Array.from(b))).to1DArray();
    let err = 0, errs = 0;
    for (let i = 0; i < 60; i++) { err = Math.max(err, Math.abs(x[i] - xd[i])); errs = Math.max(errs, Math.abs(xs[i] - xd[i])); }
    expect(err).toBeLessThan(1e-12);
    expect(errs).toBeLessThan(1e-12);
    expect(relativeResidual(a, x, b)).toBeLessThan(1e-14);
    expect(fs.colPtr[a.n]).toBe(sym.nnzL);
  });
});
