/**
 * Incomplete Cholesky factorisation with a level-of-fill rule, IC(p), as the preconditioner of
 * the conjugate gradient fallback (pcg.ts).
 *
 * Method, from the published descriptions (code written afresh):
 *  - level of fill: an entry of A has level 0; an entry created when column k updates column j
 *    gets level lev(i, k) + lev(j, k) + 1, and the entry's level is the least over all its
 *    updates; entries of level above p are dropped. J. A. Meijerink and H. A. van der Vorst,
 *    "An iterative solution method for linear systems of which the coefficient matrix is a
 *    symmetric M-matrix", Math. Comp. 31, 1977 (IC with extra fill); the level rule as given by
 *    Y. Saad, "Iterative Methods for Sparse Linear Systems", 2nd ed., SIAM 2003, section 10.3.3
 *    (ILU(p)). Every update is accumulated and the entries above level p are dropped at the end
 *    of the column, which keeps exactly the values of the two-pass (symbolic, then numeric)
 *    formulation.
 *  - left-looking column order with linked lists of the columns that update the next column
 *    (as in C.-J. Lin and J. J. More, "Incomplete Cholesky factorizations with limited memory",
 *    SIAM J. Sci. Comput. 21, 1999, whose symmetric scaling is also used here).
 *  - breakdown (a pivot that is not positive, possible for matrices that are not M-matrices, as
 *    stiffness matrices of elasticity are not): the factorisation is restarted on
 *    S A S + alpha I, S = diag(A)^(-1/2), with a growing shift alpha. T. A. Manteuffel, "An
 *    incomplete factorization technique for positive definite linear systems", Math. Comp. 34,
 *    1980.
 *
 * The factor is of the permuted, scaled matrix:  L L^T ~= S P A P^T S + alpha I, where P is the
 * given ordering (row k of P A P^T is row perm[k] of A) and S the unit-diagonal scaling.
 */
import { permuteSymmetric, type SymmetricCsc } from './sparse.js';
import type { Ordering } from './ordering.js';

/** The incomplete factor, in lower CSC (diagonal first in each column), of the permuted, scaled matrix. */
export interface IncompleteCholesky {
  readonly n: number;
  readonly perm: Int32Array;
  readonly invPerm: Int32Array;
  /** S: the scaling 1 / sqrt(A_ii) of each permuted row */
  readonly scale: Float64Array;
  /** S P A P^T S, lower CSC, unit diagonal */
  readonly scaled: SymmetricCsc;
  readonly colPtr: Int32Array;
  readonly rowIndex: Int32Array;
  readonly values: Float64Array;
  /** nonzeros of the incomplete factor, diagonal included */
  readonly nnz: number;
  readonly fillLevel: number;
  /** the diagonal shift alpha that made every pivot positive (0 when none was needed) */
  readonly shift: number;
  /** factorisations tried (1 + the restarts after breakdowns) */
  readonly attempts: number;
  readonly bytes: number;
}

export interface IncompleteCholeskyOptions {
  /** largest kept level of fill p (default 2) */
  readonly fillLevel?: number;
  /** first shift tried after a breakdown (default 1e-3; doubled on every further breakdown) */
  readonly initialShift?: number;
  /** give up when the shift would exceed this (default 1, where the factor is little better than Jacobi) */
  readonly maxShift?: number;
}

/** Thrown when A cannot be preconditioned: a diagonal entry that is not positive, or breakdowns beyond the largest shift. */
export class IncompleteCholeskyError extends Error {
  override readonly name = 'IncompleteCholeskyError';
}

/**
 * Scales and permutes A and computes its IC(p) factor, restarting with a larger shift after a
 * breakdown. Throws IncompleteCholeskyError when a diagonal entry of A is not positive (A is then
 * not positive definite) or the shift limit is reached.
 */
export function factorIncompleteCholesky(a: SymmetricCsc, ordering: Ordering, options: IncompleteCholeskyOptions = {}): IncompleteCholesky {
  const n = a.n;
  const p = options.fillLevel ?? 2;
  if (!(Number.isInteger(p) && p >= 0 && p < 250)) throw new RangeError(`factorIncompleteCholesky: fill level ${p} is not an integer in [0, 250)`);
  const pa = permuteSymmetric(a, ordering.perm, ordering.invPerm);
  const scale = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    const q = pa.colPtr[j];
    const d = q < pa.colPtr[j + 1] && pa.rowIndex[q] === j ? pa.values[q] : 0;
    if (!(d > 0) || !Number.isFinite(d)) {
      throw new IncompleteCholeskyError(
        `diagonal entry ${d} of row ${ordering.perm[j]} is not positive: the matrix is not positive definite`,
      );
    }
    scale[j] = 1 / Math.sqrt(d);
  }
  const sv = new Float64Array(pa.values.length);
  for (let j = 0; j < n; j++) {
    for (let q = pa.colPtr[j]; q < pa.colPtr[j + 1]; q++) sv[q] = pa.values[q] * scale[j] * scale[pa.rowIndex[q]];
  }
  const scaled: SymmetricCsc = { n, colPtr: pa.colPtr, rowIndex: pa.rowIndex, values: sv };
  let shift = 0;
  const maxShift = options.maxShift ?? 1;
  for (let attempt = 1; ; attempt++) {
    const f = factorLevels(scaled, p, shift);
    if (f !== null) {
      const bytes = f.colPtr.byteLength + f.rowIndex.byteLength + f.values.byteLength + scale.byteLength + sv.byteLength + pa.rowIndex.byteLength + pa.colPtr.byteLength + 8 * n;
      return { n, perm: ordering.perm, invPerm: ordering.invPerm, scale, scaled, ...f, nnz: f.colPtr[n], fillLevel: p, shift, attempts: attempt, bytes };
    }
    shift = shift === 0 ? (options.initialShift ?? 1e-3) : 2 * shift;
    if (shift > maxShift) {
      throw new IncompleteCholeskyError(
        `incomplete Cholesky broke down with every diagonal shift up to ${maxShift}: the matrix is probably not positive definite`,
      );
    }
  }
}

/** Smallest accepted pivot of the scaled matrix (unit diagonal): below it the column counts as broken down. */
const BREAKDOWN_PIVOT = 1e-8;

/** One IC(p) factorisation of the scaled matrix plus shift * I; null on breakdown. */
function factorLevels(s: SymmetricCsc, p: number, shift: number): { colPtr: Int32Array; rowIndex: Int32Array; values: Float64Array } | null {
  const n = s.n;
  const { colPtr: ap, rowIndex: ai, values: ax } = s;
  let cap = Math.max(16, 2 * ap[n]);
  let li = new Int32Array(cap);
  let lx = new Float64Array(cap);
  let ll = new Uint8Array(cap);
  const lp = new Int32Array(n + 1);
  // dense work column: values, levels (255 = not present), touched rows
  const x = new Float64Array(n);
  const lev = new Uint8Array(n).fill(255);
  const touched = new Int32Array(n);
  // head[j]: first column k whose next unused entry is in row j; nextCol links them
  const head = new Int32Array(n).fill(-1);
  const nextCol = new Int32Array(n);
  const pos = new Int32Array(n);
  let nz = 0;
  for (let j = 0; j < n; j++) {
    lp[j] = nz; // also ends column j - 1, which updates this one
    let nt = 0;
    for (let q = ap[j]; q < ap[j + 1]; q++) {
      const i = ai[q];
      x[i] = ax[q];
      lev[i] = 0;
      touched[nt++] = i;
    }
    if (lev[j] === 255) {
      lev[j] = 0;
      x[j] = 0;
      touched[nt++] = j;
    }
    let k = head[j];
    head[j] = -1;
    while (k !== -1) {
      const knext = nextCol[k];
      const q0 = pos[k];
      const ljk = lx[q0];
      const levjk = ll[q0];
      const end = lp[k + 1];
      for (let q = q0; q < end; q++) {
        const i = li[q];
        const nl = ll[q] + levjk + 1;
        if (lev[i] === 255) {
          x[i] = -lx[q] * ljk;
          lev[i] = nl > 254 ? 254 : nl;
          touched[nt++] = i;
        } else {
          x[i] -= lx[q] * ljk;
          if (nl < lev[i]) lev[i] = nl;
        }
      }
      if (q0 + 1 < end) {
        pos[k] = q0 + 1;
        const r = li[q0 + 1];
        nextCol[k] = head[r];
        head[r] = k;
      }
      k = knext;
    }
    const d = x[j] + shift;
    if (!(d > BREAKDOWN_PIVOT)) return null;
    const ljj = Math.sqrt(d);
    // keep the rows below j with level <= p, sorted
    let nk = 0;
    for (let t = 0; t < nt; t++) {
      const i = touched[t];
      if (i > j && lev[i] <= p) touched[nk++] = i;
      else {
        if (i !== j) {
          lev[i] = 255;
          x[i] = 0;
        }
      }
    }
    const keep = touched.subarray(0, nk).sort();
    if (nz + nk + 1 > cap) {
      cap = Math.max(2 * cap, nz + nk + 1);
      const li2 = new Int32Array(cap);
      li2.set(li.subarray(0, nz));
      li = li2;
      const lx2 = new Float64Array(cap);
      lx2.set(lx.subarray(0, nz));
      lx = lx2;
      const ll2 = new Uint8Array(cap);
      ll2.set(ll.subarray(0, nz));
      ll = ll2;
    }
    li[nz] = j;
    lx[nz] = ljj;
    ll[nz] = 0;
    nz++;
    const inv = 1 / ljj;
    for (let t = 0; t < nk; t++) {
      const i = keep[t];
      li[nz] = i;
      lx[nz] = x[i] * inv;
      ll[nz] = lev[i];
      nz++;
      lev[i] = 255;
      x[i] = 0;
    }
    lev[j] = 255;
    x[j] = 0;
    if (nk > 0) {
      pos[j] = lp[j] + 1;
      const r = li[lp[j] + 1];
      nextCol[j] = head[r];
      head[r] = j;
    }
  }
  lp[n] = nz;
  return { colPtr: lp, rowIndex: li.slice(0, nz), values: lx.slice(0, nz) };
}

/**
 * z = (L L^T)^(-1) r in the permuted, scaled space (z and r of length n; z may alias r):
 * forward substitution by columns of L, backward by the same columns as rows of L^T.
 */
export function applyIncompleteCholesky(f: IncompleteCholesky, r: Float64Array, z: Float64Array): void {
  const { n, colPtr, rowIndex, values } = f;
  if (z !== r) z.set(r.subarray(0, n));
  for (let j = 0; j < n; j++) {
    const q0 = colPtr[j];
    const zj = z[j] / values[q0];
    z[j] = zj;
    if (zj !== 0) for (let q = q0 + 1; q < colPtr[j + 1]; q++) z[rowIndex[q]] -= values[q] * zj;
  }
  for (let j = n - 1; j >= 0; j--) {
    const q0 = colPtr[j];
    let s = z[j];
    for (let q = q0 + 1; q < colPtr[j + 1]; q++) s -= values[q] * z[rowIndex[q]];
    z[j] = s / values[q0];
  }
}
