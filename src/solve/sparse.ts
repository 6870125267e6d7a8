/**
 * Symmetric sparse matrices stored as the LOWER triangle in compressed sparse
 * column (CSC) form.
 *
 * Layout of a `SymmetricCsc` of order n:
 *   - column j holds the entries A(i, j) with i >= j, in rows
 *     `rowIndex[colPtr[j] .. colPtr[j+1]-1]`, strictly increasing;
 *   - so when the diagonal entry is present it is the first entry of its column;
 *   - `values` is parallel to `rowIndex`.
 * The upper triangle is implied by symmetry and never stored.
 *
 * Compressed column storage and the transpose / symmetric permutation
 * routines follow the descriptions in T. A. Davis, "Direct Methods for Sparse
 * Linear Systems", SIAM 2006, chapter 2 (the code here is written afresh).
 */

/** Lower triangle of a symmetric matrix, compressed columns, sorted rows. */
export interface SymmetricCsc {
  readonly n: number;
  /** length n+1 */
  readonly colPtr: Int32Array;
  /** length colPtr[n]; rows of each column strictly increasing, all >= the column */
  readonly rowIndex: Int32Array;
  /** length colPtr[n] */
  readonly values: Float64Array;
}

/**
 * How coordinate triplets describe the symmetric matrix:
 *  - 'full': the triplets describe the whole matrix (both triangles, as a
 *    finite element assembly of full element matrices produces). Entries with
 *    row < col are ignored; the lower ones are kept. The caller is responsible
 *    for the input being symmetric.
 *  - 'triangle': each triplet (i, j, v) is one entry of one triangle; it is
 *    folded to (max(i,j), min(i,j)) and summed there. Use this for input that
 *    lists each off-diagonal entry once (for example a Matrix Market
 *    symmetric file).
 */
export type TripletSymmetry = 'full' | 'triangle';

/**
 * Assembles a symmetric matrix from coordinate triplets, summing duplicates.
 * rows, cols and values must have the same length (the exact triplet count);
 * every index must be in [0, n). The inputs are not modified.
 * Cost O(nnz + n), two counting passes (no comparison sort).
 */
export function assembleSymmetric(
  n: number,
  rows: Int32Array,
  cols: Int32Array,
  values: Float64Array,
  symmetry: TripletSymmetry,
): SymmetricCsc {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`assembleSymmetric: bad order ${n}`);
  const t = rows.length;
  if (cols.length !== t || values.length !== t) {
    throw new RangeError(
      `assembleSymmetric: rows, cols and values lengths differ (${t}, ${cols.length}, ${values.length})`,
    );
  }
  // Pass 1: count the kept entries per column (after folding / dropping).
  const count = new Int32Array(n + 1);
  let kept = 0;
  for (let k = 0; k < t; k++) {
    let i = rows[k];
    let j = cols[k];
    if (i < 0 || i >= n || j < 0 || j >= n) {
      throw new RangeError(`assembleSymmetric: triplet ${k} index (${i}, ${j}) outside [0, ${n})`);
    }
    if (i < j) {
      if (symmetry === 'full') continue;
      const s = i;
      i = j;
      j = s;
    }
    count[j]++;
    kept++;
  }
  // Bucket the triplets by row first (stable), then by column: the second
  // bucketing visits rows in increasing order, so each column ends sorted.
  const rowCount = new Int32Array(n + 1);
  const tr = new Int32Array(kept);
  const tc = new Int32Array(kept);
  const tv = new Float64Array(kept);
  {
    let q = 0;
    for (let k = 0; k < t; k++) {
      let i = rows[k];
      let j = cols[k];
      if (i < j) {
        if (symmetry === 'full') continue;
        const s = i;
        i = j;
        j = s;
      }
      tr[q] = i;
      tc[q] = j;
      tv[q] = values[k];
      rowCount[i]++;
      q++;
    }
  }
  const rowStart = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) rowStart[i + 1] = rowStart[i] + rowCount[i];
  const byRow = new Int32Array(kept);
  {
    const next = rowStart.slice(0, n);
    for (let q = 0; q < kept; q++) byRow[next[tr[q]]++] = q;
  }
  const colStart = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) colStart[j + 1] = colStart[j] + count[j];
  const sortedRow = new Int32Array(kept);
  const sortedVal = new Float64Array(kept);
  {
    const next = colStart.slice(0, n);
    for (let r = 0; r < kept; r++) {
      const q = byRow[r];
      const dst = next[tc[q]]++;
      sortedRow[dst] = tr[q];
      sortedVal[dst] = tv[q];
    }
  }
  // Sum duplicates (adjacent now) in place.
  const colPtr = new Int32Array(n + 1);
  let w = 0;
  for (let j = 0; j < n; j++) {
    colPtr[j] = w;
    let last = -1;
    for (let p = colStart[j]; p < colStart[j + 1]; p++) {
      const i = sortedRow[p];
      if (i === last) {
        sortedVal[w - 1] += sortedVal[p];
      } else {
        sortedRow[w] = i;
        sortedVal[w] = sortedVal[p];
        w++;
        last = i;
      }
    }
  }
  colPtr[n] = w;
  return {
    n,
    colPtr,
    rowIndex: sortedRow.slice(0, w),
    values: sortedVal.slice(0, w),
  };
}

/** Number of nonzeros of the full symmetric matrix implied by the lower triangle. */
export function nnzFull(a: SymmetricCsc): number {
  let diag = 0;
  for (let j = 0; j < a.n; j++) {
    const p = a.colPtr[j];
    if (p < a.colPtr[j + 1] && a.rowIndex[p] === j) diag++;
  }
  return 2 * a.colPtr[a.n] - diag;
}

/**
 * y = A x for the symmetric A stored as its lower triangle. y is overwritten;
 * x and y must not alias.
 */
export function multiplySymmetric(a: SymmetricCsc, x: Float64Array, y: Float64Array): void {
  const { n, colPtr, rowIndex, values } = a;
  if (x.length < n || y.length < n) throw new RangeError('multiplySymmetric: vector too short');
  y.fill(0, 0, n);
  for (let j = 0; j < n; j++) {
    const xj = x[j];
    let yj = y[j];
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIndex[p];
      const v = values[p];
      if (i === j) {
        yj += v * xj;
      } else {
        y[i] += v * xj;
        yj += v * x[i];
      }
    }
    y[j] = yj;
  }
}

/**
 * ||A||inf of a symmetric matrix stored as its lower triangle: the largest row sum of |a_ij|.
 * With `scale`, of the matrix a_ij / (s_i s_j) (A given already scaled as S A S, s = scale).
 */
export function symmetricInfNorm(a: SymmetricCsc, scale?: Float64Array): number {
  const { n, colPtr, rowIndex, values } = a;
  const rowAbs = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIndex[p];
      const v = scale ? Math.abs(values[p]) / (scale[i] * scale[j]) : Math.abs(values[p]);
      rowAbs[i] += v;
      if (i !== j) rowAbs[j] += v;
    }
  }
  let m = 0;
  for (let i = 0; i < n; i++) m = Math.max(m, rowAbs[i]);
  return m;
}

/** Largest diagonal entry (0 for an empty matrix or one with no diagonal). */
export function maxDiagonal(a: SymmetricCsc): number {
  let m = 0;
  for (let j = 0; j < a.n; j++) {
    const p = a.colPtr[j];
    if (p < a.colPtr[j + 1] && a.rowIndex[p] === j && a.values[p] > m) m = a.values[p];
  }
  return m;
}

/** Result of keeping a principal submatrix. */
export interface PrincipalSubmatrix {
  readonly matrix: SymmetricCsc;
  /** for each row of the submatrix, its index in the original matrix */
  readonly oldOfNew: Int32Array;
  /** for each original index, its row in the submatrix, or -1 if removed */
  readonly newOfOld: Int32Array;
}

/**
 * The principal submatrix A(K, K) with K = { i : keep[i] != 0 }, in the
 * original relative order. Removing the same rows and columns keeps the
 * matrix symmetric (and positive definite if A was), which is how fixed
 * degrees of freedom are eliminated before a Cholesky factorisation.
 */
export function extractPrincipal(a: SymmetricCsc, keep: Uint8Array): PrincipalSubmatrix {
  const { n, colPtr, rowIndex, values } = a;
  if (keep.length !== n) throw new RangeError(`extractPrincipal: keep has length ${keep.length}, expected ${n}`);
  const newOfOld = new Int32Array(n);
  let m = 0;
  for (let i = 0; i < n; i++) newOfOld[i] = keep[i] !== 0 ? m++ : -1;
  const oldOfNew = new Int32Array(m);
  for (let i = 0; i < n; i++) if (newOfOld[i] >= 0) oldOfNew[newOfOld[i]] = i;
  let nz = 0;
  for (let j = 0; j < n; j++) {
    if (newOfOld[j] < 0) continue;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) if (newOfOld[rowIndex[p]] >= 0) nz++;
  }
  const cp = new Int32Array(m + 1);
  const ri = new Int32Array(nz);
  const vv = new Float64Array(nz);
  let w = 0;
  for (let jn = 0; jn < m; jn++) {
    const j = oldOfNew[jn];
    cp[jn] = w;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const inew = newOfOld[rowIndex[p]];
      if (inew >= 0) {
        ri[w] = inew; // monotone renumbering keeps rows sorted
        vv[w] = values[p];
        w++;
      }
    }
  }
  cp[m] = w;
  return { matrix: { n: m, colPtr: cp, rowIndex: ri, values: vv }, oldOfNew, newOfOld };
}

/**
 * C = A(perm, perm) as a lower triangle: C(k, l) = A(perm[k], perm[l]).
 * perm maps new -> old and invPerm old -> new. Rows of each column of C come
 * out sorted (two-pass transpose construction, as in Davis 2006, chapter 2).
 */
export function permuteSymmetric(a: SymmetricCsc, perm: Int32Array, invPerm: Int32Array): SymmetricCsc {
  const { n, colPtr, rowIndex, values } = a;
  if (perm.length !== n || invPerm.length !== n) throw new RangeError('permuteSymmetric: permutation length');
  const nz = colPtr[n];
  // First build the upper triangle of C by columns (unsorted), then transpose
  // it: the transpose of a CSC matrix has sorted rows.
  const cnt = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) {
    const jn = invPerm[j];
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const inew = invPerm[rowIndex[p]];
      cnt[inew > jn ? inew : jn]++; // column max(i,j) of the upper triangle
    }
  }
  const up = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) up[j + 1] = up[j] + cnt[j];
  const next = up.slice(0, n);
  const ui = new Int32Array(nz);
  const uv = new Float64Array(nz);
  for (let j = 0; j < n; j++) {
    const jn = invPerm[j];
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const inew = invPerm[rowIndex[p]];
      const hi = inew > jn ? inew : jn;
      const lo = inew > jn ? jn : inew;
      const q = next[hi]++;
      ui[q] = lo;
      uv[q] = values[p];
    }
  }
  return transposeUpperToLower(n, up, ui, uv);
}

/**
 * The patterns of A(perm, perm) without values: its upper triangle by
 * columns (rows in no particular order) and its lower triangle by columns
 * (rows sorted). Cheaper than permuteSymmetric followed by upperPattern when
 * only the structure is needed (elimination tree, column counts).
 */
export function permutedPatterns(
  a: SymmetricCsc,
  invPerm: Int32Array,
): { upperPtr: Int32Array; upperIdx: Int32Array; lowerPtr: Int32Array; lowerIdx: Int32Array } {
  const { n, colPtr, rowIndex } = a;
  const nz = colPtr[n];
  const upperPtr = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) {
    const jn = invPerm[j];
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const inew = invPerm[rowIndex[p]];
      upperPtr[(inew > jn ? inew : jn) + 1]++;
    }
  }
  for (let j = 0; j < n; j++) upperPtr[j + 1] += upperPtr[j];
  const next = upperPtr.slice(0, n);
  const upperIdx = new Int32Array(nz);
  for (let j = 0; j < n; j++) {
    const jn = invPerm[j];
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const inew = invPerm[rowIndex[p]];
      if (inew > jn) upperIdx[next[inew]++] = jn;
      else upperIdx[next[jn]++] = inew;
    }
  }
  const lowerPtr = new Int32Array(n + 1);
  for (let p = 0; p < nz; p++) lowerPtr[upperIdx[p] + 1]++;
  for (let j = 0; j < n; j++) lowerPtr[j + 1] += lowerPtr[j];
  const lnext = lowerPtr.slice(0, n);
  const lowerIdx = new Int32Array(nz);
  for (let j = 0; j < n; j++) {
    for (let p = upperPtr[j]; p < upperPtr[j + 1]; p++) lowerIdx[lnext[upperIdx[p]]++] = j;
  }
  return { upperPtr, upperIdx, lowerPtr, lowerIdx };
}

/**
 * Transposes an upper-triangular CSC pattern (column j holds rows <= j, any
 * order) into a lower-triangular CSC with sorted rows.
 */
function transposeUpperToLower(n: number, up: Int32Array, ui: Int32Array, uv: Float64Array): SymmetricCsc {
  const nz = up[n];
  const cnt = new Int32Array(n + 1);
  for (let p = 0; p < nz; p++) cnt[ui[p]]++;
  const lp = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) lp[j + 1] = lp[j] + cnt[j];
  const next = lp.slice(0, n);
  const li = new Int32Array(nz);
  const lv = new Float64Array(nz);
  for (let j = 0; j < n; j++) {
    for (let p = up[j]; p < up[j + 1]; p++) {
      const q = next[ui[p]]++;
      li[q] = j;
      lv[q] = uv[p];
    }
  }
  return { n, colPtr: lp, rowIndex: li, values: lv };
}

/**
 * The upper triangle of A in CSC form (equivalently, the rows of the lower
 * triangle): column j lists i <= j with A(i, j) != 0, sorted increasing.
 * Used by the elimination tree and the up-looking factorisation.
 */
export function upperPattern(a: SymmetricCsc): { colPtr: Int32Array; rowIndex: Int32Array; values: Float64Array } {
  const { n, colPtr, rowIndex, values } = a;
  const nz = colPtr[n];
  const cnt = new Int32Array(n + 1);
  for (let p = 0; p < nz; p++) cnt[rowIndex[p]]++;
  const cp = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) cp[i + 1] = cp[i] + cnt[i];
  const next = cp.slice(0, n);
  const ri = new Int32Array(nz);
  const vv = new Float64Array(nz);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const q = next[rowIndex[p]]++;
      ri[q] = j;
      vv[q] = values[p];
    }
  }
  return { colPtr: cp, rowIndex: ri, values: vv };
}

/**
 * The adjacency graph of A without the diagonal, both directions, CSR
 * (ptr length n+1, idx). Used by the graph orderings.
 */
export function adjacencyGraph(a: SymmetricCsc): { ptr: Int32Array; idx: Int32Array } {
  const { n, colPtr, rowIndex } = a;
  const deg = new Int32Array(n);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIndex[p];
      if (i !== j) {
        deg[i]++;
        deg[j]++;
      }
    }
  }
  const ptr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) ptr[i + 1] = ptr[i] + deg[i];
  const next = ptr.slice(0, n);
  const idx = new Int32Array(ptr[n]);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIndex[p];
      if (i !== j) {
        idx[next[i]++] = j;
        idx[next[j]++] = i;
      }
    }
  }
  return { ptr, idx };
}
