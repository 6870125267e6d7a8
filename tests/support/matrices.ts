/**
 * Matrices for the solver tests: grid Laplacians with their grid geometry, random sparse
 * symmetric positive definite matrices, the structure of L by dense boolean elimination, and a
 * relative difference of vectors.
 */

import { type CsrGraph, type SymmetricCsc, assembleSymmetric } from '../../src/solve/index.js';
import { seededRandom } from '../../src/bench/fixtures/random.js';

/**
 * 2D grid Laplacian (Dirichlet boundary eliminated) on an nx x ny grid of
 * unknowns, natural (row by row) numbering; stencil 5 (diagonal 4, four -1)
 * or 9 (diagonal 8, eight -1). Both are symmetric positive definite
 * (irreducibly diagonally dominant).
 */
export function gridLaplacian(nx: number, ny: number, stencil: 5 | 9 = 5): SymmetricCsc {
  const n = nx * ny;
  const maxEntries = n * (stencil === 5 ? 3 : 5);
  const rows = new Int32Array(maxEntries);
  const cols = new Int32Array(maxEntries);
  const vals = new Float64Array(maxEntries);
  let w = 0;
  const push = (i: number, j: number, v: number): void => {
    rows[w] = i;
    cols[w] = j;
    vals[w] = v;
    w++;
  };
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) {
      const v = y * nx + x;
      push(v, v, stencil === 5 ? 4 : 8);
      if (x + 1 < nx) push(v + 1, v, -1);
      if (y + 1 < ny) push(v + nx, v, -1);
      if (stencil === 9 && y + 1 < ny) {
        if (x + 1 < nx) push(v + nx + 1, v, -1);
        if (x > 0) push(v + nx - 1, v, -1);
      }
    }
  }
  return assembleSymmetric(n, rows.subarray(0, w), cols.subarray(0, w), vals.subarray(0, w), 'triangle');
}

/** Node coordinates and adjacency of the nx x ny grid used by gridLaplacian (spacing 1). */
export function gridGeometry(nx: number, ny: number, stencil: 5 | 9 = 5): { coords: Float64Array; adjacency: CsrGraph } {
  const a = gridLaplacian(nx, ny, stencil);
  const coords = new Float64Array(2 * nx * ny);
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) {
      coords[2 * (y * nx + x)] = x;
      coords[2 * (y * nx + x) + 1] = y;
    }
  }
  // adjacency = off-diagonal pattern of the Laplacian
  const n = a.n;
  const deg = new Int32Array(n);
  for (let j = 0; j < n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      const i = a.rowIndex[p];
      if (i !== j) {
        deg[i]++;
        deg[j]++;
      }
    }
  }
  const ptr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) ptr[i + 1] = ptr[i] + deg[i];
  const fill = ptr.slice(0, n);
  const idx = new Int32Array(ptr[n]);
  for (let j = 0; j < n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      const i = a.rowIndex[p];
      if (i !== j) {
        idx[fill[i]++] = j;
        idx[fill[j]++] = i;
      }
    }
  }
  return { coords, adjacency: { ptr, idx } };
}

/** Random sparse symmetric matrix with density d off the diagonal, made strictly diagonally dominant (so SPD). */
export function randomSpd(n: number, density: number, seed: number): SymmetricCsc {
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
    v.push(rowSum[i] + 0.1 + rnd());
  }
  return assembleSymmetric(n, Int32Array.from(r), Int32Array.from(c), Float64Array.from(v), 'triangle');
}

/** max_i |x_i - y_i| / max_i |y_i| */
export function relativeMaxDifference(x: ArrayLike<number>, y: ArrayLike<number>): number {
  let d = 0;
  let s = 0;
  for (let i = 0; i < y.length; i++) {
    d = Math.max(d, Math.abs(x[i] - y[i]));
    s = Math.max(s, Math.abs(y[i]));
  }
  return d / s;
}

/**
 * Structure of L by boolean Gaussian elimination on the dense pattern of
 * A(perm, perm) (Parter 1961 / Rose 1972 elimination graph): returns the
 * column counts (diagonal included) and the elimination tree.
 */
export function denseSymbolic(a: SymmetricCsc, perm: Int32Array): { colCount: Int32Array; parent: Int32Array } {
  const n = a.n;
  const inv = new Int32Array(n);
  perm.forEach((old, k) => (inv[old] = k));
  const s = new Uint8Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      const i = inv[a.rowIndex[p]];
      const jj = inv[j];
      s[i * n + jj] = 1;
      s[jj * n + i] = 1;
    }
  }
  const colCount = new Int32Array(n);
  const parent = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    const below: number[] = [];
    for (let i = k + 1; i < n; i++) if (s[i * n + k]) below.push(i);
    colCount[k] = below.length + 1;
    if (below.length > 0) parent[k] = below[0];
    for (const i of below) for (const j of below) s[i * n + j] = 1;
  }
  return { colCount, parent };
}
