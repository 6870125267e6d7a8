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
 *    (Liu 1990), which makes supernodes contiguous;
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
 *    Sparse Linear Systems", SIAM 2006, chapter 4 (row k of L from a sparse
 *    triangular solve whose pattern is the reach in the elimination tree).
 *
 * The numeric loop itself is in multifrontal.ts, which also runs one
 * subtree of the supernodal tree on a worker thread for large problems.
 *
 * Memory of the supernodal factor: 8 bytes per stored value (nnz(L) plus the
 * explicit zeros of relaxed supernodes, 5-20 % here), 4 bytes per row index
 * of a supernode (shared by its columns), and O(n) pointers: 9-11 bytes per
 * nonzero of L on 2D stiffness matrices. The fronts and the update stack
 * live in a WebAssembly memory reused by every factorisation of the process
 * (wasm-kernel.ts); it grows to the largest front plus stack seen and is not
 * returned to the system.
 */

import {
  type SymmetricCsc,
  maxDiagonal,
  nnzFull,
  permuteSymmetric,
  permutedPatterns,
  upperPattern,
} from './sparse.js';
import { type Ordering, invertPermutation } from './ordering.js';
import { PANEL, type SimdKernel } from './dense.js';
import { sharedWasmHeap } from './wasm-kernel.js';
import {
  backwardRange,
  chooseSplit,
  childLists,
  factorRange,
  forwardRange,
  mainThreadKernels,
  startSolveJob,
  startSubtreeWorker,
  type RangeContext,
} from './multifrontal.js';

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
export function columnCounts(c: Pick<SymmetricCsc, 'n' | 'colPtr' | 'rowIndex'>, parent: Int32Array, post: Int32Array): Int32Array {
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
  /**
   * Assembly of A: the entries assembled by supernode s are q in
   * entryPtr[s] .. entryPtr[s+1]-1; entry entryOrder[q] of A's values is added
   * at entryOffset[q] of that supernode's row-major front.
   */
  readonly entryPtr: Int32Array;
  readonly entryOrder: Int32Array;
  readonly entryOffset: Int32Array;
  /** the pattern of the analysed A, to check that a matrix to factorise has it */
  readonly sourceColPtr: Int32Array;
  readonly sourceRowIndex: Int32Array;
}

/**
 * Symbolic analysis of A(p, p) for the given fill-reducing ordering: the
 * ordering is composed with a postorder of the elimination tree, then
 * column counts, nnz(L), flops, supernodes and their row structure are
 * computed.
 */
export function analyzeCholesky(a: SymmetricCsc, ordering: Ordering, relax: RelaxOptions = {}): SymbolicFactor {
  return analyzeCholeskyWithin(a, ordering, Infinity, relax) as SymbolicFactor;
}

/**
 * analyzeCholesky, stopping after the column counts when the factor could not fit in maxBytes:
 * at 12 bytes per nonzero of L (value and row index), a lower bound of what the supernodal factor
 * stores. Then only nnz(L) and the flop count come back, and the supernodal structure, whose
 * arrays are as large as L's row indices, is never built.
 */
export function analyzeCholeskyWithin(a: SymmetricCsc, ordering: Ordering, maxBytes: number, relax: RelaxOptions = {}): SymbolicFactor | { nnzL: number; flops: number; nnzA: number } {
  const n = a.n;
  if (ordering.perm.length !== n) throw new RangeError(`analyzeCholesky: ordering has ${ordering.perm.length} entries, matrix ${n}`);
  // etree of A(q, q) for the given ordering q, its postorder, and the
  // column counts (computed on A(q, q) with that postorder).
  const pat0 = permutedPatterns(a, ordering.invPerm);
  const parent0 = eliminationTree(n, pat0.upperPtr, pat0.upperIdx);
  const post = postorderTree(parent0);
  const count0 = columnCounts({ n, colPtr: pat0.lowerPtr, rowIndex: pat0.lowerIdx }, parent0, post);
  // Renumber in postorder: column k is old column post[k].
  const postInv = invertPermutation(post);
  const parentP = new Int32Array(n);
  const countP = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const p0 = parent0[post[k]];
    parentP[k] = p0 === -1 ? -1 : postInv[p0];
    countP[k] = count0[post[k]];
  }
  let nnzL = 0;
  let flops = 0;
  for (let j = 0; j < n; j++) {
    nnzL += countP[j];
    flops += countP[j] * countP[j];
  }
  if (12 * nnzL > maxBytes) return { nnzL, flops, nnzA: nnzFull(a) };

  // Fundamental supernodes (Liu, Ng & Peyton 1993): j joins j-1 when it is
  // j-1's parent, its only child, and its column is j-1's minus the diagonal.
  const nChild = new Int32Array(n);
  for (let j = 0; j < n; j++) if (parentP[j] !== -1) nChild[parentP[j]]++;
  const fundStartList: number[] = [];
  for (let j = 0; j < n; j++) {
    if (j === 0 || !(parentP[j - 1] === j && countP[j - 1] === countP[j] + 1 && nChild[j] === 1)) fundStartList.push(j);
  }
  const nf = fundStartList.length;
  fundStartList.push(n);
  const fundStart = Int32Array.from(fundStartList);
  const superOfCol = new Int32Array(n);
  for (let s = 0; s < nf; s++) for (let j = fundStart[s]; j < fundStart[s + 1]; j++) superOfCol[j] = s;
  const fParent = new Int32Array(nf);
  for (let s = 0; s < nf; s++) {
    const pc = parentP[fundStart[s + 1] - 1];
    fParent[s] = pc === -1 ? -1 : superOfCol[pc];
  }

  // Relaxed amalgamation (Ashcraft & Grimes 1989) on the supernodal tree: a
  // child group merges into its parent group when the merged front stores
  // few enough explicit zeros. Any child may merge, not only the one
  // numbered just before the parent: the columns are renumbered afterwards
  // by a postorder of the merged tree, a topological reordering of the
  // elimination tree, which leaves the filled graph unchanged (Liu 1990).
  const rules = relax.rules ?? DEFAULT_RELAX_RULES;
  const gCols = new Float64Array(nf); // columns of the group rooted at s
  const gTrue = new Float64Array(nf); // true nonzeros of L in the group
  const belowRows = new Float64Array(nf); // rows below the group (those of its root supernode)
  const mergedInto = new Int32Array(nf).fill(-1);
  const cHead = new Int32Array(nf).fill(-1);
  const cNext = new Int32Array(nf).fill(-1);
  for (let s = nf - 1; s >= 0; s--) {
    const p = fParent[s];
    if (p !== -1) {
      cNext[s] = cHead[p];
      cHead[p] = s;
    }
  }
  for (let s = 0; s < nf; s++) {
    const f = fundStart[s];
    const k = fundStart[s + 1] - f;
    gCols[s] = k;
    belowRows[s] = countP[f] - k;
    let tru = 0;
    for (let j = f; j < f + k; j++) tru += countP[j];
    gTrue[s] += tru;
    if (rules.length === 0) continue;
    for (let c = cHead[s]; c !== -1; c = cNext[c]) {
      const kk = gCols[c] + gCols[s];
      const mm = kk + belowRows[s];
      const stored = (kk * (kk + 1)) / 2 + (mm - kk) * kk;
      const zeroFrac = (stored - gTrue[c] - gTrue[s]) / stored;
      let ok = false;
      for (const [maxCols, maxZero] of rules) {
        if (kk <= maxCols) {
          ok = zeroFrac <= maxZero;
          break;
        }
      }
      if (ok) {
        mergedInto[c] = s;
        gCols[s] = kk;
        gTrue[s] += gTrue[c];
      }
    }
  }
  // Group root of every fundamental supernode (parents have larger numbers).
  const root = new Int32Array(nf);
  for (let s = nf - 1; s >= 0; s--) root[s] = mergedInto[s] === -1 ? s : root[mergedInto[s]];
  // Members of each group, increasing; children groups of each group.
  const memHead = new Int32Array(nf).fill(-1);
  const memNext = new Int32Array(nf).fill(-1);
  const memTail = new Int32Array(nf).fill(-1);
  for (let s = 0; s < nf; s++) {
    const r = root[s];
    if (memTail[r] === -1) memHead[r] = s;
    else memNext[memTail[r]] = s;
    memTail[r] = s;
  }
  const gHead = new Int32Array(nf).fill(-1);
  const gNext = new Int32Array(nf).fill(-1);
  for (let s = nf - 1; s >= 0; s--) {
    if (root[s] !== s || fParent[s] === -1) continue;
    const pg = root[fParent[s]];
    gNext[s] = gHead[pg];
    gHead[pg] = s;
  }
  // Postorder of the group tree; each group lists its members' columns.
  const newToP = new Int32Array(n); // new column -> postordered column
  const starts: number[] = [];
  {
    const stack = new Int32Array(nf);
    let w = 0;
    for (let r0 = 0; r0 < nf; r0++) {
      if (root[r0] !== r0 || fParent[r0] !== -1) continue;
      let top = 0;
      stack[0] = r0;
      while (top >= 0) {
        const g = stack[top];
        const c = gHead[g];
        if (c !== -1) {
          gHead[g] = gNext[c];
          stack[++top] = c;
          continue;
        }
        top--;
        starts.push(w);
        for (let s = memHead[g]; s !== -1; s = memNext[s]) {
          for (let j = fundStart[s]; j < fundStart[s + 1]; j++) newToP[w++] = j;
        }
      }
    }
    if (w !== n) throw new Error('analyzeCholesky: supernode renumbering lost columns');
  }
  const nSuper = starts.length;
  const superStart = new Int32Array(nSuper + 1);
  for (let s = 0; s < nSuper; s++) superStart[s] = starts[s];
  superStart[nSuper] = n;
  const pToNew = invertPermutation(newToP);
  const perm = new Int32Array(n);
  const parent = new Int32Array(n);
  const colCount = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const j = newToP[k];
    perm[k] = ordering.perm[post[j]];
    parent[k] = parentP[j] === -1 ? -1 : pToNew[parentP[j]];
    colCount[k] = countP[j];
  }
  const invPerm = invertPermutation(perm);
  for (let s = 0; s < nSuper; s++) for (let j = superStart[s]; j < superStart[s + 1]; j++) superOfCol[j] = s;
  const superParent = new Int32Array(nSuper);
  for (let s = 0; s < nSuper; s++) {
    const pc = parent[superStart[s + 1] - 1];
    superParent[s] = pc === -1 ? -1 : superOfCol[pc];
    if (superParent[s] !== -1 && superParent[s] <= s) throw new Error('analyzeCholesky: supernodal tree not in postorder');
  }
  // Entries of A bucketed by the supernode that assembles them: entry (I, J)
  // goes to new column min(i, j) and row max(i, j), i = invPerm[I].
  const nzA = a.colPtr[n];
  const entryPtr = new Int32Array(nSuper + 1);
  const entryOrder = new Int32Array(nzA);
  // first the new row, later the offset in the front; shared memory, so a
  // worker thread reads it without a copy
  const entryOffset = new Int32Array(new SharedArrayBuffer(4 * Math.max(1, nzA)), 0, nzA);
  const entryCol = new Int32Array(nzA);
  {
    // A's columns are visited in the new order, so the entries that fall
    // below the diagonal of A(p, p) are written to consecutive slots.
    const ac = a.colPtr;
    const ar = a.rowIndex;
    for (let jn = 0; jn < n; jn++) {
      const jo = perm[jn];
      const sj = superOfCol[jn];
      for (let p = ac[jo]; p < ac[jo + 1]; p++) {
        const inew = invPerm[ar[p]];
        entryPtr[(inew < jn ? superOfCol[inew] : sj) + 1]++;
      }
    }
    for (let s = 0; s < nSuper; s++) entryPtr[s + 1] += entryPtr[s];
    const fill = entryPtr.slice(0, nSuper);
    for (let jn = 0; jn < n; jn++) {
      const jo = perm[jn];
      const sj = superOfCol[jn];
      for (let p = ac[jo]; p < ac[jo + 1]; p++) {
        const inew = invPerm[ar[p]];
        const below = inew >= jn;
        const q = fill[below ? sj : superOfCol[inew]]++;
        entryOrder[q] = p;
        entryOffset[q] = below ? inew : jn;
        entryCol[q] = below ? jn : inew;
      }
    }
  }

  // Row structure of each supernode: its columns, the rows of A below them,
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
    for (let q = entryPtr[s]; q < entryPtr[s + 1]; q++) {
      const i = entryOffset[q];
      if (i >= l && marker[i] !== s) {
        marker[i] = s;
        rows[nr++] = i;
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
    if (nr - below <= 24) {
      // insertion sort: most supernodes have few rows below them, where a typed-array sort call costs more than the sorting
      for (let t = below + 1; t < nr; t++) {
        const v = rows[t];
        let u = t;
        while (u > below && rows[u - 1] > v) {
          rows[u] = rows[u - 1];
          u--;
        }
        rows[u] = v;
      }
    } else rows.subarray(below, nr).sort();
    rowPtr[s + 1] = nr;
    // offsets of this supernode's entries of A in its row-major front
    const m = nr - rowPtr[s];
    if (m * m > 0x7fffffff) throw new RangeError(`analyzeCholesky: a frontal matrix of order ${m} is too large`);
    for (let t = rowPtr[s]; t < nr; t++) marker[rows[t]] = -2 - (t - rowPtr[s]); // local position, encoded
    for (let q = entryPtr[s]; q < entryPtr[s + 1]; q++) {
      const local = -2 - marker[entryOffset[q]];
      entryOffset[q] = local * m + (entryCol[q] - f);
    }
    for (let t = rowPtr[s]; t < nr; t++) marker[rows[t]] = s;
  }
  // shared memory, so a worker thread reads the row structure without a copy
  const superRows = new Int32Array(new SharedArrayBuffer(4 * Math.max(1, nr)), 0, nr);
  superRows.set(rows.subarray(0, nr));

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
    entryPtr,
    entryOrder,
    entryOffset,
    sourceColPtr: a.colPtr,
    sourceRowIndex: a.rowIndex,
  };
}

/** Throws unless a has exactly the pattern the symbolic factor was computed for. */
function checkPattern(a: SymmetricCsc, symbolic: SymbolicFactor, who: string): void {
  if (a.n !== symbolic.n) throw new RangeError(`${who}: matrix order ${a.n}, analysis ${symbolic.n}`);
  const same = (x: Int32Array, y: Int32Array): boolean => {
    if (x === y) return true;
    if (x.length !== y.length) return false;
    for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false;
    return true;
  };
  if (!same(a.colPtr, symbolic.sourceColPtr) || !same(a.rowIndex.subarray(0, a.colPtr[a.n]), symbolic.sourceRowIndex.subarray(0, symbolic.sourceColPtr[a.n]))) {
    throw new RangeError(`${who}: the matrix pattern differs from the analysed one`);
  }
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
  /** threads that factorised it (1, or 2 when a subtree went to a worker) */
  readonly threads: number;
  /** for the triangular solves of a factor made on two threads: the worker's subtree [first, c] */
  readonly split: { readonly first: number; readonly c: number } | null;
}

export interface FactorOptions {
  /** relative pivot tolerance (default DEFAULT_PIVOT_TOLERANCE) */
  readonly pivotTolerance?: number;
  /**
   * Dense update kernel: 'simd' (WebAssembly SIMD, wasm-kernel.ts), 'js'
   * (plain JavaScript), or 'auto' (default): 'simd' when the engine has it
   * and the front and update stack fit in a 32-bit WebAssembly memory.
   * Both compute the same sums in the same order of pairs, so results agree
   * to rounding.
   */
  readonly kernel?: 'auto' | 'simd' | 'js';
  /**
   * 1, or 2 (default): let a worker thread factorise one subtree of the
   * supernodal tree when the factorisation has at least PARALLEL_MIN_FLOPS
   * flops. Results are identical either way (same operations in the same order
   * within each front).
   */
  readonly threads?: 1 | 2;
  /** lower the flop limit for the second thread (tests use it on small matrices) */
  readonly parallelMinFlops?: number;
}

/** Factorisations with fewer flops stay on one thread (measured start-up of a worker: about 30 ms). */
export const PARALLEL_MIN_FLOPS = 5e8;

/**
 * Numeric factorisation by the supernodal multifrontal method. For each
 * supernode, in postorder: its frontal matrix (dense, row-major lower) is
 * assembled from its bucket of A's entries and the children's update
 * matrices (extend-add), its k pivot columns are factorised (dense.ts:
 * panel-blocked Cholesky of the k x k block with the triangular solve of the
 * rows below), its rows are copied to the factor, and the Schur complement
 * is formed by a register-blocked symmetric rank-k update written straight
 * onto the update stack. The first pivot d that is not above
 * pivotTolerance * max diag(A), or not finite, throws SolverPivotError.
 * The analysis can be reused for any matrix with the same pattern.
 */
export function factorCholesky(a: SymmetricCsc, symbolic: SymbolicFactor, options: FactorOptions = {}): CholeskyFactor {
  const { n, perm, nSuper, superStart, superParent, rowPtr, superRows, valuePtr, maxFront, stackPeak } = symbolic;
  checkPattern(a, symbolic, 'factorCholesky');
  const tol = options.pivotTolerance ?? DEFAULT_PIVOT_TOLERANCE;
  const threshold = tol * maxDiagonal(a);
  const { entryPtr, entryOrder, entryOffset } = symbolic;
  const av = a.values;

  // A second thread takes one subtree when the work is large enough to pay
  // for starting it (about 30 ms) and a balanced split exists.
  const threads = options.threads ?? 2;
  const split = threads >= 2 && symbolic.flops >= (options.parallelMinFlops ?? PARALLEL_MIN_FLOPS) ? chooseSplit(superStart, superParent, rowPtr) : null;
  const lBuffer = split !== null ? new SharedArrayBuffer(symbolic.storedValues * 8) : null;
  const L = lBuffer !== null ? new Float64Array(lBuffer) : new Float64Array(symbolic.storedValues);
  let threadsUsed = 1;
  const frontLen = maxFront * maxFront;
  const stackLen = Math.max(1, stackPeak);
  let front: Float64Array;
  let stack: Float64Array;
  let simdFront: SimdKernel | null = null;
  let simdStack: SimdKernel | null = null;
  const kernel = options.kernel ?? 'auto';
  const heap = kernel === 'js' ? null : sharedWasmHeap();
  // heap layout (doubles): [front | update stack | rel as int32]
  const relDoubles = Math.ceil(maxFront / 2) + 1;
  const view = heap === null ? null : heap.reserve(frontLen + stackLen + relDoubles);
  if (kernel === 'simd' && view === null) throw new Error('factorCholesky: the WebAssembly SIMD kernel is not available here');
  let rel: Int32Array;
  const relByte = (frontLen + stackLen) * 8;
  const useHeap = heap !== null && view !== null;
  if (useHeap) {
    front = view.subarray(0, frontLen);
    stack = view.subarray(frontLen, frontLen + stackLen);
    rel = new Int32Array(view.buffer, relByte, maxFront);
    simdFront = { rowBlock4: heap.rowBlock4, fByte: 0, outByte: 0 };
    simdStack = { rowBlock4: heap.rowBlock4, fByte: 0, outByte: frontLen * 8 };
  } else {
    front = new Float64Array(frontLen);
    stack = new Float64Array(stackLen);
    rel = new Int32Array(maxFront);
  }
  // values of A in entry order
  const entryValues = split !== null ? new Float64Array(new SharedArrayBuffer(8 * Math.max(1, entryOrder.length)), 0, entryOrder.length) : new Float64Array(entryOrder.length);
  for (let q = 0; q < entryOrder.length; q++) entryValues[q] = av[entryOrder[q]];
  const { sHead, sNext } = childLists(superParent);
  const ctxFor = (s0: number, s1: number, updStart: Float64Array): RangeContext => ({
    s0,
    s1,
    superStart,
    superParent,
    rowPtr,
    superRows,
    rowBase: 0,
    valuePtr,
    entryPtr,
    entryValues,
    entryOffset,
    entryBase: 0,
    L,
    front,
    stack,
    rel,
    map: new Int32Array(n),
    sHead,
    sNext,
    updStart,
    threshold,
    panelScratch: new Float64Array(PANEL),
    zeroLower: useHeap ? heap.zeroLower : null,
    extendAdd: useHeap ? heap.extendAdd : null,
    relByte,
    stackByte: frontLen * 8,
    simdFront,
    simdStack,
  });
  const kern = mainThreadKernels();
  const updStart = new Float64Array(nSuper);
  const fail = (col: number, pivot: number): SolverPivotError => new SolverPivotError(col, perm[col], pivot, threshold);

  // main: [0, first); worker: [first, c]; then main: (c, nSuper)
  const worker =
    split !== null && lBuffer !== null
      ? startSubtreeWorker({
          n,
          first: split.first,
          c: split.c,
          superStart,
          superParent,
          rowPtr,
          superRows,
          valuePtr,
          entryPtr,
          entryValues,
          entryOffset,
          threshold,
          lBuffer,
          useWasm: useHeap,
        })
      : null;
  if (split !== null && worker !== null) {
    const r1 = factorRange(ctxFor(0, split.first, updStart), kern, 0);
    if (r1.failedColumn >= 0) {
      worker.terminate();
      throw fail(r1.failedColumn, r1.pivot);
    }
    // generous (the worker's part at 1 GFLOP/s plus a minute): a stuck
    // worker is stopped and its part done on this thread
    const j = worker.join(60_000 + symbolic.flops / 1e6);
    let top = r1.top;
    if (j.state === 'pivot') throw fail(j.failedColumn, j.pivot);
    if (j.state === 'done') {
      updStart[split.c] = top;
      stack.set(worker.handoff, top);
      top += worker.handoff.length;
    } else {
      worker.terminate();
      const r2 = factorRange(ctxFor(split.first, split.c + 1, updStart), kern, top);
      if (r2.failedColumn >= 0) throw fail(r2.failedColumn, r2.pivot);
      top = r2.top;
    }
    const r3 = factorRange(ctxFor(split.c + 1, nSuper, updStart), kern, top);
    if (r3.failedColumn >= 0) throw fail(r3.failedColumn, r3.pivot);
    threadsUsed = j.state === 'done' ? 2 : 1;
  } else {
    const r = factorRange(ctxFor(0, nSuper, updStart), kern, 0);
    if (r.failedColumn >= 0) throw fail(r.failedColumn, r.pivot);
  }
  const bytes = L.byteLength + symbolic.superRows.byteLength + symbolic.rowPtr.byteLength + symbolic.valuePtr.byteLength + symbolic.superStart.byteLength + symbolic.perm.byteLength + symbolic.invPerm.byteLength;
  const solveSplit = threadsUsed === 2 ? chooseSplit(superStart, superParent, rowPtr, 'values') : null;
  return { symbolic, values: L, bytes, threads: threadsUsed, split: solveSplit };
}

/**
 * Solves A x = b with the factor of A(p, p) = L L^T: x = P^T L^-T L^-1 P b.
 * b holds nrhs right-hand sides of length n one after another; the result
 * has the same layout. b is not modified.
 */
export function solveCholesky(factor: CholeskyFactor, b: Float64Array, nrhs = 1, options: SolveCholeskyOptions = {}): Float64Array {
  const sym = factor.symbolic;
  const { n, perm } = sym;
  if (b.length !== n * nrhs) throw new RangeError(`solveCholesky: right-hand side length ${b.length}, expected ${n * nrhs}`);
  const x = new Float64Array(n * nrhs);
  const { nSuper, superStart, rowPtr, superRows, valuePtr } = sym;
  const L = factor.values;
  const t = new Float64Array(Math.max(1, sym.maxFront));
  // With a factor split over two threads, the worker's subtree is solved
  // on the worker: forward [0, first) here and [first, c] there, the
  // worker's updates of the shared ancestors kept apart and added after;
  // backward the ancestors here first, then both halves at once.
  const split = factor.split;
  const par =
    split !== null && options.threads !== 1 && L.buffer instanceof SharedArrayBuffer && sym.storedValues >= (options.parallelMinValues ?? PARALLEL_MIN_SOLVE_VALUES)
      ? split
      : null;
  const y = par !== null ? new Float64Array(new SharedArrayBuffer(8 * Math.max(1, n))) : new Float64Array(n);
  let threadsUsed = par !== null && nrhs > 0 ? 2 : 1;
  for (let r = 0; r < nrhs; r++) {
    const off = r * n;
    for (let k = 0; k < n; k++) y[k] = b[off + perm[k]];
    let done = false;
    if (par !== null) {
      const ancestorsFrom = superStart[par.c + 1];
      const delta = new Float64Array(new SharedArrayBuffer(8 * Math.max(1, n)));
      const job = {
        L: L.buffer as SharedArrayBuffer,
        superStart,
        rowPtr,
        superRows,
        valuePtr,
        y: y.buffer as SharedArrayBuffer,
        delta: delta.buffer as SharedArrayBuffer,
        s0: par.first,
        s1: par.c + 1,
        maxFront: sym.maxFront,
      };
      const timeout = 60_000 + sym.storedValues / 1e4;
      const fw = startSolveJob('forward', job);
      if (fw !== null) {
        forwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, par.first, y, n);
        if (fw.join(timeout) === 'done') {
          for (let i = ancestorsFrom; i < n; i++) y[i] += delta[i];
          forwardRange(L, superStart, rowPtr, superRows, valuePtr, y, par.c + 1, nSuper, y, n);
          backwardRange(L, superStart, rowPtr, superRows, valuePtr, y, par.c + 1, nSuper, t);
          const bw = startSolveJob('backward', job);
          if (bw === null) {
            backwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, par.c + 1, t);
            done = true;
          } else {
            backwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, par.first, t);
            if (bw.join(timeout) === 'done') done = true;
            else bw.terminate();
          }
        } else {
          fw.terminate();
        }
      }
      // a worker that failed part-way: this right-hand side again, on one thread
      if (!done) {
        threadsUsed = 1;
        for (let k = 0; k < n; k++) y[k] = b[off + perm[k]];
      }
    }
    if (!done) {
      forwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, nSuper, y, n);
      backwardRange(L, superStart, rowPtr, superRows, valuePtr, y, 0, nSuper, t);
    }
    for (let k = 0; k < n; k++) x[off + perm[k]] = y[k];
  }
  if (options.report !== undefined) options.report.threads = threadsUsed;
  return x;
}

/** Factors with fewer stored values are solved on one thread. */
export const PARALLEL_MIN_SOLVE_VALUES = 4e6;

export interface SolveCholeskyOptions {
  /** 1 keeps the solves on this thread; otherwise a factor made on two threads is solved on two */
  readonly threads?: 1 | 2;
  /** lower the size limit for the second thread (tests use it on small factors) */
  readonly parallelMinValues?: number;
  /** when given, receives the number of threads the solves used */
  readonly report?: { threads: number };
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
