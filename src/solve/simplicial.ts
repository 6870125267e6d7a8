/**
 * Simplicial up-looking Cholesky factorisation, kept as the simple, independently checkable
 * reference for the supernodal one (numeric.ts): T. A. Davis, "Direct Methods for Sparse Linear
 * Systems", SIAM 2006, chapter 4 (row k of L from a sparse triangular solve whose pattern is the
 * reach in the elimination tree). The code is written afresh.
 */

import { InternalError } from '../model/errors.js';
import { type SymmetricCsc, maxDiagonal, permuteSymmetric, upperPattern } from './sparse.js';
import { checkPattern, type SymbolicFactor } from './symbolic.js';
import { DEFAULT_PIVOT_TOLERANCE, SolverPivotError } from './pivot.js';
import type { FactorOptions } from './numeric.js';

/** L in compressed columns (lower, diagonal first in each column, rows increasing). */
export interface SimplicialFactor {
  readonly symbolic: SymbolicFactor;
  readonly colPtr: Int32Array;
  readonly rowIndex: Int32Array;
  readonly values: Float64Array;
  readonly bytes: number;
}

/**
 * Up-looking Cholesky (Davis 2006, chapter 4): row k of L solves
 * L(0:k-1, 0:k-1) l = A(0:k-1, k), whose nonzero pattern is the set of nodes
 * reached from the entries of A(0:k-1, k) by climbing the elimination tree
 * up to k. Simple and slow (scalar sparse operations); used as a reference.
 */
export function factorCholeskySimplicial(a: SymmetricCsc, symbolic: SymbolicFactor, options: FactorOptions = {}): SimplicialFactor {
  const { n, perm, invPerm, parent, colCount } = symbolic;
  checkPattern(a, symbolic, 'factorCholeskySimplicial');
  const tol = options.pivotTolerance ?? DEFAULT_PIVOT_TOLERANCE;
  const threshold = tol * maxDiagonal(a);
  const c = permuteSymmetric(a, perm, invPerm);
  const up = upperPattern(c);
  const lp = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) lp[j + 1] = lp[j] + colCount[j];
  const li = new Int32Array(lp[n]);
  const lx = new Float64Array(lp[n]);
  const fill = lp.slice(0, n); // next free slot of each column
  const x = new Float64Array(n);
  const flag = new Int32Array(n).fill(-1);
  const stack = new Int32Array(n);
  const path = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    // pattern of row k: reach of the entries of column k of the upper part
    let top = n;
    flag[k] = k;
    let d = 0;
    for (let p = up.colPtr[k]; p < up.colPtr[k + 1]; p++) {
      let i = up.rowIndex[p];
      if (i === k) {
        d = up.values[p];
        continue;
      }
      x[i] = up.values[p];
      let len = 0;
      while (flag[i] !== k) {
        path[len++] = i;
        flag[i] = k;
        i = parent[i];
      }
      while (len > 0) stack[--top] = path[--len];
    }
    // sparse triangular solve in topological order
    for (let q = top; q < n; q++) {
      const i = stack[q];
      const lki = x[i] / lx[lp[i]];
      x[i] = 0;
      for (let p = lp[i] + 1; p < fill[i]; p++) x[li[p]] -= lx[p] * lki;
      d -= lki * lki;
      const slot = fill[i]++;
      li[slot] = k;
      lx[slot] = lki;
    }
    if (!(d > threshold) || !Number.isFinite(d)) throw new SolverPivotError(k, perm[k], d, threshold);
    const slot = fill[k]++;
    li[slot] = k;
    lx[slot] = Math.sqrt(d);
  }
  for (let j = 0; j < n; j++) {
    if (fill[j] !== lp[j + 1]) throw new InternalError(`factorCholeskySimplicial: column ${j} has ${fill[j] - lp[j]} entries, column count said ${colCount[j]}`);
  }
  const bytes = lp.byteLength + li.byteLength + lx.byteLength + perm.byteLength + invPerm.byteLength;
  return { symbolic, colPtr: lp, rowIndex: li, values: lx, bytes };
}

/** Solves A x = b with a simplicial factor; layout as in solveCholesky. */
export function solveCholeskySimplicial(factor: SimplicialFactor, b: Float64Array, nrhs = 1): Float64Array {
  const { n, perm } = factor.symbolic;
  if (b.length !== n * nrhs) throw new RangeError(`solveCholeskySimplicial: right-hand side length ${b.length}, expected ${n * nrhs}`);
  const { colPtr, rowIndex, values } = factor;
  const x = new Float64Array(n * nrhs);
  const y = new Float64Array(n);
  for (let r = 0; r < nrhs; r++) {
    const off = r * n;
    for (let k = 0; k < n; k++) y[k] = b[off + perm[k]];
    for (let j = 0; j < n; j++) {
      const yj = (y[j] /= values[colPtr[j]]);
      for (let p = colPtr[j] + 1; p < colPtr[j + 1]; p++) y[rowIndex[p]] -= values[p] * yj;
    }
    for (let j = n - 1; j >= 0; j--) {
      let s = y[j];
      for (let p = colPtr[j] + 1; p < colPtr[j + 1]; p++) s -= values[p] * y[rowIndex[p]];
      y[j] = s / values[colPtr[j]];
    }
    for (let k = 0; k < n; k++) x[off + perm[k]] = y[k];
  }
  return x;
}
