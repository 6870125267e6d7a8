/**
 * Sparse Cholesky factorisation A(p, p) = L L^T of a symmetric positive
 * definite matrix stored as its lower triangle (see sparse.ts).
 *
 * Phases and their published sources (all code written afresh):
 *  - elimination tree: J. W. H. Liu, "A compact row storage scheme for
 *    Cholesky factors using elimination trees", ACM TOMS 12, 1986, and "The
 *    role of elimination trees in sparse factorization", SIAM J. Matrix Anal.
 *    Appl. 11, 1990 (path-compressed ancestor algorithm);
 *  - postorder of the tree: an equivalent reordering with the same fill
 *    (Liu 1990, section 3), which makes supernodes contiguous;
 *  - column counts of L: J. R. Gilbert, E. G. Ng and B. W. Peyton, "An
 *    efficient algorithm to compute row and column counts for sparse Cholesky
 *    factorization", SIAM J. Matrix Anal. Appl. 15, 1994 (row subtrees, their
 *    leaves and least common ancestors by disjoint sets);
 *  - fundamental supernodes: J. W. H. Liu, E. G. Ng and B. W. Peyton, "On
 *    finding supernodes for sparse matrix computations", SIAM J. Matrix Anal.
 *    Appl. 14, 1993; relaxed amalgamation: C. Ashcraft and R. Grimes, "The
 *    influence of relaxed supernode partitions on the multifrontal method",
 *    ACM TOMS 15, 1989;
 *  - numeric factorisation, supernodal multifrontal: I. S. Duff and J. K.
 *    Reid, "The multifrontal solution of indefinite sparse symmetric linear
 *    equations", ACM TOMS 9, 1983; J. W. H. Liu, "The multifrontal method for
 *    sparse matrix solution: theory and practice", SIAM Review 34, 1992;
 *  - numeric factorisation, simplicial up-looking (kept as the simple,
 *    independently checkable reference): T. A. Davis, "Direct Methods for
 *    Sparse Linear Systems", SIAM 2006, section 4.7 (row k of L from a sparse
 *    triangular solve whose pattern is the reach in the elimination tree).
 */

import {
  type SymmetricCsc,
  maxDiagonal,
  nnzFull,
  permuteSymmetric,
  upperPattern,
} from './sparse.js';
import { type Ordering, invertPermutation } from './ordering.js';
import { PANEL, factorFrontPivots, failedPivotValue, rankUpdate } from './dense.js';

/**
 * Thrown when a pivot is not safely positive: pivot <= tol * max diag(A), or
 * not finite. The matrix is then singular (for a stiffness matrix: a rigid
 * body mode left free, a mechanism) or not positive definite.
 */
export class SolverPivotError extends Error {
  override readonly name = 'SolverPivotError';
  constructor(
    /** column of the permuted matrix A(p, p) where the pivot failed */
    readonly permutedIndex: number,
    /** the same column in the caller's numbering (perm[permutedIndex]) */
    readonly originalIndex: number,
    /** the offending pivot value d (before the square root) */
    readonly pivot: number,
    /** the threshold it was compared with (tol * max diag(A)) */
    readonly threshold: number,
  ) {
    super(
      `Cholesky pivot ${pivot} at permuted column ${permutedIndex} (original index ${originalIndex}) ` +
        `is not above ${threshold}: the matrix is singular or not positive definite`,
    );
  }
}

/** Default relative pivot tolerance: pivot must exceed 1e-13 * max diag(A). */
export const DEFAULT_PIVOT_TOLERANCE = 1e-13;

// ---------------------------------------------------------------------------
// Elimination tree, postorder, column counts
// ---------------------------------------------------------------------------

/**
 * Elimination tree of a symmetric matrix given by its upper-triangle pattern
 * (column j lists rows i <= j): parent[j] = min{ i > j : L(i, j) != 0 } or -1.
 * Liu's algorithm with path compression (ancestor array), O(nnz alpha(n)).
 */
export function eliminationTree(n: number, upperColPtr: Int32Array, upperRowIndex: Int32Array): Int32Array {
  const parent = new Int32Array(n).fill(-1);
  const ancestor = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    for (let p = upperColPtr[k]; p < upperColPtr[k + 1]; p++) {
      let i = upperRowIndex[p];
      // climb from i to the root of its current subtree, pointing the path at k
      while (i !== -1 && i < k) {
        const next = ancestor[i];
        ancestor[i] = k;
        if (next === -1) {
          parent[i] = k;
          break;
        }
        i = next;
      }
    }
  }
  return parent;
}

/**
 * A postorder of the forest given by parent (children visited in increasing
 * order), by an explicit-stack depth-first search. Returns post with
 * post[k] = the k-th node in postorder.
 */
export function postorderTree(parent: Int32Array): Int32Array {
  const n = parent.length;
  const head = new Int32Array(n).fill(-1);
  const next = new Int32Array(n).fill(-1);
  // children lists in increasing order: insert in decreasing order at the head
  for (let j = n - 1; j >= 0; j--) {
    const p = parent[j];
    if (p !== -1) {
      next[j] = head[p];
      head[p] = j;
    }
  }
  const post = new Int32Array(n);
  const stack = new Int32Array(n);
  let k = 0;
  for (let root = 0; root < n; root++) {
    if (parent[root] !== -1) continue;
    let top = 0;
    stack[0] = root;
    while (top >= 0) {
      const v = stack[top];
      const c = head[v];
      if (c === -1) {
        post[k++] = v;
        top--;
      } else {
        head[v] = next[c]; // detach the first child, then descend into it
        stack[++top] = c;
      }
    }
  }
  if (k !== n) throw new Error('postorderTree: parent array has a cycle');
  return post;
}

/**
 * Column counts of L (diagonal included) for the lower-triangle matrix C with
 * elimination tree parent and postorder post, by Gilbert, Ng & Peyton (1994):
 * cc(j) = number of row subtrees T_i containing j. Each T_i is a union of
 * tree paths; weights +1 at its leaves, -1 at least common ancestors of
 * consecutive leaves and -1 at parent(i), summed over subtrees, count it.
 * A node j is a leaf of T_i iff C(i, j) != 0 and no earlier (in postorder)
 * k with C(i, k) != 0 is a descendant of j, i.e. first(j) > prevnbr(i).
 */
export function columnCounts(c: SymmetricCsc, parent: Int32Array, post: Int32Array): Int32Array {
  const { n, colPtr, rowIndex } = c;
  const first = new Int32Array(n).fill(-1);
  const weight = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    let j = post[k];
    weight[j] = first[j] === -1 ? 1 : 0; // an etree leaf: its row subtree is {j}
    while (j !== -1 && first[j] === -1) {
      first[j] = k;
      j = parent[j];
    }
  }
  const prevNbr = new Int32Array(n).fill(-1);
  const prevLeaf = new Int32Array(n).fill(-1);
  const ancestor = new Int32Array(n);
  for (let i = 0; i < n; i++) ancestor[i] = i;
  for (let k = 0; k < n; k++) {
    const j = post[k];
    if (parent[j] !== -1) weight[parent[j]]--;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIndex[p];
      if (i <= j) continue;
      if (first[j] > prevNbr[i]) {
        weight[j]++;
        const pl = prevLeaf[i];
        if (pl !== -1) {
          // least common ancestor of pl and j: root of pl's set
          let q = pl;
          while (q !== ancestor[q]) q = ancestor[q];
          let s = pl;
          while (s !== q) {
            const t = ancestor[s];
            ancestor[s] = q;
            s = t;
          }
          weight[q]--;
        }
        prevLeaf[i] = j;
      }
      prevNbr[i] = k;
    }
    if (parent[j] !== -1) ancestor[j] = parent[j];
  }
  // Sum weights over subtrees, children before parents.
  for (let k = 0; k < n; k++) {
    const j = post[k];
    if (parent[j] !== -1) weight[parent[j]] += weight[j];
  }
  return weight;
}

// ---------------------------------------------------------------------------
// Symbolic analysis
// ---------------------------------------------------------------------------

/** Thresholds for relaxed supernode amalgamation (Ashcraft & Grimes 1989). */
export interface RelaxOptions {
  /**
   * Pairs [maxColumns, maxZeroFraction]: a child supernode is merged into its
   * parent when the merged supernode has at most maxColumns columns and its
   * fraction of explicitly stored zeros stays at most maxZeroFraction, for
   * the first pair that applies. An empty list keeps fundamental supernodes.
   */
  readonly rules?: ReadonlyArray<readonly [number, number]>;
}

const DEFAULT_RELAX_RULES: ReadonlyArray<readonly [number, number]> = [
  [4, 1],
  [16, 0.5],
  [48, 0.1],
  [Infinity, 0.04],
];

/** The result of the symbolic phase, reusable for any matrix of the same pattern. */
export interface SymbolicFactor {
  readonly n: number;
  /** final ordering (the fill-reducing ordering followed by an etree postorder), new -> old */
  readonly perm: Int32Array;
  readonly invPerm: Int32Array;
  /** elimination tree of A(perm, perm) */
  readonly parent: Int32Array;
  /** nnz of each column of L, diagonal included */
  readonly colCount: Int32Array;
  /** nnz(L) including the diagonal */
  readonly nnzL: number;
  /** operation count sum_j colCount[j]^2 (multiply-adds counted as two flops, to leading order) */
  readonly flops: number;
  /** nonzeros of the full symmetric A */
  readonly nnzA: number;
  /** number of supernodes (after relaxation) */
  readonly nSuper: number;
  /** columns of supernode s: superStart[s] .. superStart[s+1]-1 */
  readonly superStart: Int32Array;
  /** parent supernode, -1 for roots; parents come after children */
  readonly superParent: Int32Array;
  /** row indices of supernode s: superRows[rowPtr[s] .. rowPtr[s+1]-1], its own columns first, then increasing */
  readonly rowPtr: Int32Array;
  readonly superRows: Int32Array;
  /** offset of supernode s's values (row-major lower trapezoid) */
  readonly valuePtr: Float64Array;
  /** total stored values of the supernodal factor (>= nnzL because of relaxation) */
  readonly storedValues: number;
  /** largest frontal matrix order */
  readonly maxFront: number;
  /** peak number of doubles on the update-matrix stack of the multifrontal method */
  readonly stackPeak: number;
}

/**
 * Symbolic analysis of A(p, p) for the given fill-reducing ordering: the
 * ordering is composed with a postorder of the elimination tree, then
 * column counts, nnz(L), flops, supernodes and their row structure are
 * computed.
 */
export function analyzeCholesky(a: SymmetricCsc, ordering: Ordering, relax: RelaxOptions = {}): SymbolicFactor {
  const n = a.n;
  if (ordering.perm.length !== n) throw new RangeError(`analyzeCholesky: ordering has ${ordering.perm.length} entries, matrix ${n}`);
  // etree of A(p, p), then its postorder; compose.
  const c0 = permuteSymmetric(a, ordering.perm, ordering.invPerm);
  const up0 = upperPattern(c0);
  const parent0 = eliminationTree(n, up0.colPtr, up0.rowIndex);
  const post = postorderTree(parent0);
  const perm = new Int32Array(n);
  for (let k = 0; k < n; k++) perm[k] = ordering.perm[post[k]];
  const invPerm = invertPermutation(perm);
  const postInv = invertPermutation(post);
  const parent = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const p0 = parent0[post[k]];
    parent[k] = p0 === -1 ? -1 : postInv[p0];
  }
  const c = permuteSymmetric(a, perm, invPerm);
  const identity = new Int32Array(n);
  for (let k = 0; k < n; k++) identity[k] = k;
  const colCount = columnCounts(c, parent, identity);
  let nnzL = 0;
  let flops = 0;
  for (let j = 0; j < n; j++) {
    nnzL += colCount[j];
    flops += colCount[j] * colCount[j];
  }

  // Fundamental supernodes (Liu, Ng & Peyton 1993): j+1 joins j when it is
  // j's parent, its only child, and its column is j's minus the diagonal.
  const nChild = new Int32Array(n);
  for (let j = 0; j < n; j++) if (parent[j] !== -1) nChild[parent[j]]++;
  const fundStart: number[] = [];
  for (let j = 0; j < n; j++) {
    if (j === 0 || !(parent[j - 1] === j && colCount[j - 1] === colCount[j] + 1 && nChild[j] === 1)) fundStart.push(j);
  }
  const nf = fundStart.length;
  fundStart.push(n);
  const superOfCol = new Int32Array(n);
  for (let s = 0; s < nf; s++) for (let j = fundStart[s]; j < fundStart[s + 1]; j++) superOfCol[j] = s;

  // Relaxed amalgamation: walk supernodes in order; the current group may
  // absorb the next supernode when that one is the group's parent.
  const rules = relax.rules ?? DEFAULT_RELAX_RULES;
  const groupStart: number[] = [];
  {
    let gFirst = 0; // first column of the current group
    let gCols = 0;
    let gTrue = 0; // true nonzeros of L in the group
    let gLastSuper = -1;
    for (let s = 0; s < nf; s++) {
      const f = fundStart[s];
      const k = fundStart[s + 1] - f;
      const m = colCount[f];
      let tru = 0;
      for (let j = f; j < f + k; j++) tru += colCount[j];
      let merged = false;
      if (gLastSuper >= 0 && rules.length > 0) {
        const lastCol = fundStart[gLastSuper + 1] - 1;
        if (parent[lastCol] === f) {
          const kk = gCols + k;
          const mm = gCols + m;
          const stored = (kk * (kk + 1)) / 2 + (mm - kk) * kk;
          const zeroFrac = (stored - gTrue - tru) / stored;
          for (const [maxCols, maxZero] of rules) {
            if (kk <= maxCols) {
              merged = zeroFrac <= maxZero;
              break;
            }
          }
          if (merged) {
            gCols = kk;
            gTrue += tru;
            gLastSuper = s;
          }
        }
      }
      if (!merged) {
        if (gLastSuper >= 0) groupStart.push(gFirst);
        gFirst = f;
        gCols = k;
        gTrue = tru;
        gLastSuper = s;
      }
    }
    if (gLastSuper >= 0) groupStart.push(gFirst);
  }
  const nSuper = groupStart.length;
  const superStart = new Int32Array(nSuper + 1);
  for (let s = 0; s < nSuper; s++) superStart[s] = groupStart[s];
  superStart[nSuper] = n;
  for (let s = 0; s < nSuper; s++) for (let j = superStart[s]; j < superStart[s + 1]; j++) superOfCol[j] = s;
  const superParent = new Int32Array(nSuper);
  for (let s = 0; s < nSuper; s++) {
    const pc = parent[superStart[s + 1] - 1];
    superParent[s] = pc === -1 ? -1 : superOfCol[pc];
  }

  // Row structure of each supernode: its columns, the rows of C below them,
  // and the update rows of its children (supernodal symbolic factorisation).
  const sHead = new Int32Array(nSuper).fill(-1);
  const sNext = new Int32Array(nSuper).fill(-1);
  for (let s = nSuper - 1; s >= 0; s--) {
    const p = superParent[s];
    if (p !== -1) {
      sNext[s] = sHead[p];
      sHead[p] = s;
    }
  }
  const rowPtr = new Int32Array(nSuper + 1);
  let rows = new Int32Array(Math.max(16, Math.ceil(nnzL / 2) + n));
  const marker = new Int32Array(n).fill(-1);
  let nr = 0;
  for (let s = 0; s < nSuper; s++) {
    const f = superStart[s];
    const l = superStart[s + 1];
    rowPtr[s] = nr;
    const need = nr + n; // a supernode has at most n rows
    if (need > rows.length) {
      const grown = new Int32Array(Math.max(need, Math.ceil(rows.length * 1.5)));
      grown.set(rows.subarray(0, nr));
      rows = grown;
    }
    for (let j = f; j < l; j++) {
      rows[nr++] = j;
      marker[j] = s;
    }
    const below = nr;
    for (let j = f; j < l; j++) {
      for (let p = c.colPtr[j]; p < c.colPtr[j + 1]; p++) {
        const i = c.rowIndex[p];
        if (i >= l && marker[i] !== s) {
          marker[i] = s;
          rows[nr++] = i;
        }
      }
    }
    for (let ch = sHead[s]; ch !== -1; ch = sNext[ch]) {
      const kc = superStart[ch + 1] - superStart[ch];
      for (let q = rowPtr[ch] + kc; q < rowPtr[ch + 1]; q++) {
        const i = rows[q];
        if (i >= l && marker[i] !== s) {
          marker[i] = s;
          rows[nr++] = i;
        }
      }
    }
    rows.subarray(below, nr).sort();
    rowPtr[s + 1] = nr;
  }
  const superRows = rows.slice(0, nr);

  const valuePtr = new Float64Array(nSuper + 1);
  let maxFront = 0;
  let stackTop = 0;
  let stackPeak = 0;
  const updSize = new Float64Array(nSuper);
  for (let s = 0; s < nSuper; s++) {
    const k = superStart[s + 1] - superStart[s];
    const m = rowPtr[s + 1] - rowPtr[s];
    valuePtr[s + 1] = valuePtr[s] + (k * (k + 1)) / 2 + (m - k) * k;
    if (m > maxFront) maxFront = m;
    for (let ch = sHead[s]; ch !== -1; ch = sNext[ch]) stackTop -= updSize[ch];
    const u = m - k;
    updSize[s] = (u * (u + 1)) / 2;
    stackTop += updSize[s];
    if (stackTop > stackPeak) stackPeak = stackTop;
  }

  return {
    n,
    perm,
    invPerm,
    parent,
    colCount,
    nnzL,
    flops,
    nnzA: nnzFull(a),
    nSuper,
    superStart,
    superParent,
    rowPtr,
    superRows,
    valuePtr,
    storedValues: valuePtr[nSuper],
    maxFront,
    stackPeak,
  };
}

// ---------------------------------------------------------------------------
// Supernodal multifrontal numeric factorisation
// ---------------------------------------------------------------------------

/**
 * A supernodal Cholesky factor. For supernode s with k columns and m rows,
 * the values are the row-major lower trapezoid of its m x k block: row a
 * (a = 0 .. m-1, row index superRows[rowPtr[s] + a]) holds min(a+1, k)
 * entries, starting at valuePtr[s] + offset(a) with
 * offset(a) = a(a+1)/2 for a < k and k(k+1)/2 + (a-k) k otherwise.
 */
export interface CholeskyFactor {
  readonly symbolic: SymbolicFactor;
  readonly values: Float64Array;
  /** bytes held by the factor: values, row indices and pointers */
  readonly bytes: number;
}

export interface FactorOptions {
  /** relative pivot tolerance (default DEFAULT_PIVOT_TOLERANCE) */
  readonly pivotTolerance?: number;
}

/**
 * Numeric factorisation by the supernodal multifrontal method. For each
 * supernode, in postorder: its frontal matrix (dense, row-major lower) is
 * assembled from the columns of A(p, p) and the children's update matrices
 * (extend-add), its k pivot columns are factorised (dense.ts: panel-blocked
 * Cholesky of the k x k block with the triangular solve of the rows below),
 * and the Schur complement is formed by a register-blocked symmetric rank-k
 * update written straight onto the update stack.
 */
export function factorCholesky(a: SymmetricCsc, symbolic: SymbolicFactor, options: FactorOptions = {}): CholeskyFactor {
  const { n, perm, invPerm, nSuper, superStart, superParent, rowPtr, superRows, valuePtr, maxFront, stackPeak } = symbolic;
  if (a.n !== n) throw new RangeError(`factorCholesky: matrix order ${a.n}, analysis ${n}`);
  const tol = options.pivotTolerance ?? DEFAULT_PIVOT_TOLERANCE;
  const threshold = tol * maxDiagonal(a);
  const c = permuteSymmetric(a, perm, invPerm);
  const { colPtr, rowIndex, values: av } = c;

  const L = new Float64Array(symbolic.storedValues);
  const front = new Float64Array(maxFront * maxFront);
  const stack = new Float64Array(Math.max(1, stackPeak));
  const map = new Int32Array(n);
  const rel = new Int32Array(maxFront);
  const panelScratch = new Float64Array(PANEL);
  // Children of each supernode, in order; their updates lie on top of the
  // stack in the same order when the parent is reached (postorder).
  const sHead = new Int32Array(nSuper).fill(-1);
  const sNext = new Int32Array(nSuper).fill(-1);
  for (let s = nSuper - 1; s >= 0; s--) {
    const p = superParent[s];
    if (p !== -1) {
      sNext[s] = sHead[p];
      sHead[p] = s;
    }
  }
  const updStart = new Float64Array(nSuper);
  let top = 0;

  for (let s = 0; s < nSuper; s++) {
    const f = superStart[s];
    const k = superStart[s + 1] - f;
    const r0 = rowPtr[s];
    const m = rowPtr[s + 1] - r0;
    for (let t = 0; t < m; t++) map[superRows[r0 + t]] = t;
    // zero the lower triangle of the front
    for (let t = 0; t < m; t++) front.fill(0, t * m, t * m + t + 1);
    // assemble A(p,p) columns f .. f+k-1
    for (let jj = 0; jj < k; jj++) {
      const j = f + jj;
      for (let p = colPtr[j]; p < colPtr[j + 1]; p++) front[map[rowIndex[p]] * m + jj] += av[p];
    }
    // extend-add the children's update matrices
    let firstChildStart = -1;
    for (let ch = sHead[s]; ch !== -1; ch = sNext[ch]) {
      const kc = superStart[ch + 1] - superStart[ch];
      const rc = rowPtr[ch] + kc;
      const mc = rowPtr[ch + 1] - rc;
      for (let t = 0; t < mc; t++) rel[t] = map[superRows[rc + t]];
      const base = updStart[ch];
      if (firstChildStart < 0) firstChildStart = base;
      extendAdd(front, m, stack, base, rel, mc);
    }
    if (firstChildStart >= 0) top = firstChildStart; // pop all children

    // partial factorisation of the k pivot columns
    const bad = factorFrontPivots(front, m, k, threshold, panelScratch);
    if (bad >= 0) throw new SolverPivotError(f + bad, perm[f + bad], failedPivotValue, threshold);
    // copy the factor rows out
    {
      let dst = valuePtr[s];
      for (let aa = 0; aa < m; aa++) {
        const cnt = aa < k ? aa + 1 : k;
        const src = aa * m;
        for (let t = 0; t < cnt; t++) L[dst + t] = front[src + t];
        dst += cnt;
      }
    }
    // Schur complement into the stack (packed lower, row-major)
    const u = m - k;
    if (u > 0 && superParent[s] !== -1) {
      updStart[s] = top;
      rankUpdate(front, m, k, m, k, m, 0, k, stack, top);
      top += (u * (u + 1)) / 2;
    }
  }
  const bytes = L.byteLength + symbolic.superRows.byteLength + symbolic.rowPtr.byteLength + symbolic.valuePtr.byteLength + symbolic.superStart.byteLength + symbolic.perm.byteLength + symbolic.invPerm.byteLength;
  return { symbolic, values: L, bytes };
}

/** F[rel[a], rel[b]] += U(a, b) for the packed lower mc x mc update U at stack[base]. */
function extendAdd(F: Float64Array, m: number, stack: Float64Array, base: number, rel: Int32Array, mc: number): void {
  let u = base;
  for (let aa = 0; aa < mc; aa++) {
    const row = rel[aa] * m;
    for (let bb = 0; bb <= aa; bb++) F[row + rel[bb]] += stack[u++];
  }
}

/**
 * Solves A x = b with the factor of A(p, p) = L L^T: x = P^T L^-T L^-1 P b.
 * b holds nrhs right-hand sides of length n one after another; the result
 * has the same layout. b is not modified.
 */
export function solveCholesky(factor: CholeskyFactor, b: Float64Array, nrhs = 1): Float64Array {
  const sym = factor.symbolic;
  const { n, perm } = sym;
  if (b.length !== n * nrhs) throw new RangeError(`solveCholesky: right-hand side length ${b.length}, expected ${n * nrhs}`);
  const x = new Float64Array(n * nrhs);
  const y = new Float64Array(n);
  const t = new Float64Array(Math.max(1, sym.maxFront));
  for (let r = 0; r < nrhs; r++) {
    const off = r * n;
    for (let k = 0; k < n; k++) y[k] = b[off + perm[k]];
    forwardSupernodal(factor, y);
    backwardSupernodal(factor, y, t);
    for (let k = 0; k < n; k++) x[off + perm[k]] = y[k];
  }
  return x;
}

/** y := L^-1 y in the permuted numbering. */
function forwardSupernodal(factor: CholeskyFactor, y: Float64Array): void {
  const { nSuper, superStart, rowPtr, superRows, valuePtr } = factor.symbolic;
  const L = factor.values;
  for (let s = 0; s < nSuper; s++) {
    const f = superStart[s];
    const k = superStart[s + 1] - f;
    const r0 = rowPtr[s];
    const m = rowPtr[s + 1] - r0;
    let o = valuePtr[s];
    for (let a = 0; a < k; a++) {
      let sum = y[f + a];
      for (let j = 0; j < a; j++) sum -= L[o + j] * y[f + j];
      y[f + a] = sum / L[o + a];
      o += a + 1;
    }
    for (let a = k; a < m; a++) {
      let sum = 0;
      for (let j = 0; j < k; j++) sum += L[o + j] * y[f + j];
      y[superRows[r0 + a]] -= sum;
      o += k;
    }
  }
}

/** y := L^-T y in the permuted numbering; t is scratch of length >= max supernode columns. */
function backwardSupernodal(factor: CholeskyFactor, y: Float64Array, t: Float64Array): void {
  const { nSuper, superStart, rowPtr, superRows, valuePtr } = factor.symbolic;
  const L = factor.values;
  for (let s = nSuper - 1; s >= 0; s--) {
    const f = superStart[s];
    const k = superStart[s + 1] - f;
    const r0 = rowPtr[s];
    const m = rowPtr[s + 1] - r0;
    for (let j = 0; j < k; j++) t[j] = y[f + j];
    const tri = (k * (k + 1)) / 2;
    let o = valuePtr[s] + tri;
    for (let a = k; a < m; a++) {
      const xa = y[superRows[r0 + a]];
      for (let j = 0; j < k; j++) t[j] -= L[o + j] * xa;
      o += k;
    }
    for (let a = k - 1; a >= 0; a--) {
      const ro = valuePtr[s] + (a * (a + 1)) / 2;
      const xa = t[a] / L[ro + a];
      y[f + a] = xa;
      for (let j = 0; j < a; j++) t[j] -= L[ro + j] * xa;
    }
  }
}

// ---------------------------------------------------------------------------
// Simplicial up-looking factorisation (reference implementation)
// ---------------------------------------------------------------------------

/** L in compressed columns (lower, diagonal first in each column, rows increasing). */
export interface SimplicialFactor {
  readonly symbolic: SymbolicFactor;
  readonly colPtr: Int32Array;
  readonly rowIndex: Int32Array;
  readonly values: Float64Array;
  readonly bytes: number;
}

/**
 * Up-looking Cholesky (Davis 2006, section 4.7): row k of L solves
 * L(0:k-1, 0:k-1) l = A(0:k-1, k), whose nonzero pattern is the set of nodes
 * reached from the entries of A(0:k-1, k) by climbing the elimination tree
 * up to k. Simple and slow (scalar sparse operations); used as a reference.
 */
export function factorCholeskySimplicial(a: SymmetricCsc, symbolic: SymbolicFactor, options: FactorOptions = {}): SimplicialFactor {
  const { n, perm, invPerm, parent, colCount } = symbolic;
  if (a.n !== n) throw new RangeError(`factorCholeskySimplicial: matrix order ${a.n}, analysis ${n}`);
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
    if (fill[j] !== lp[j + 1]) throw new Error(`factorCholeskySimplicial: column ${j} has ${fill[j] - lp[j]} entries, column count said ${colCount[j]}`);
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
