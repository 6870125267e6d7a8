/**
 * Symbolic analysis of a sparse Cholesky factorisation A(p, p) = L L^T: everything that
 * depends on the pattern of A and the ordering, and nothing on its values, so one analysis
 * serves every matrix of that pattern (repeated.ts). In order, each a function below:
 *
 *  1. countColumnsInPostorder: the elimination tree of A(q, q) for the fill-reducing ordering
 *     q, its postorder and the column counts of L (etree.ts), renumbered in that postorder;
 *     nnz(L) and the flop count follow, and analyzeCholeskyWithin may stop here;
 *  2. findFundamentalSupernodes: J. W. H. Liu, E. G. Ng and B. W. Peyton, "On finding
 *     supernodes for sparse matrix computations", SIAM J. Matrix Anal. Appl. 14, 1993;
 *  3. amalgamateSupernodes, relaxed: C. Ashcraft and R. Grimes, "The influence of relaxed
 *     supernode partitions on the multifrontal method", ACM TOMS 15, 1989;
 *  4. renumberSupernodes: a postorder of the merged tree, which is a topological reordering of
 *     the elimination tree and leaves the filled graph unchanged (J. W. H. Liu, "The role of
 *     elimination trees in sparse factorization", SIAM J. Matrix Anal. Appl. 11, 1990);
 *  5. bucketEntries: each entry of A goes to the supernode whose front assembles it;
 *  6. buildSupernodeRows: the row structure of each supernode (supernodal symbolic
 *     factorisation), and each entry's offset in its front;
 *  7. sizeFrontsAndStack: value offsets, the largest front and the peak of the update stack
 *     of the multifrontal method (numeric.ts).
 * The code is written afresh from these sources.
 */

import { InternalError } from '../model/errors.js';
import { type SymmetricCsc, nnzFull, permutedPatterns } from './sparse.js';
import { type Ordering, invertPermutation } from './ordering.js';
import { childLists, columnCounts, eliminationTree, postorderTree } from './etree.js';

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
  const counted = countColumnsInPostorder(a, ordering);
  const { nnzL, flops } = counted;
  if (12 * nnzL > maxBytes) return { nnzL, flops, nnzA: nnzFull(a) };
  const fundamental = findFundamentalSupernodes(counted.parent, counted.count);
  const mergedInto = amalgamateSupernodes(fundamental, counted.count, relax.rules ?? DEFAULT_RELAX_RULES);
  const tree = renumberSupernodes(ordering, counted, fundamental, mergedInto);
  const entries = bucketEntries(a, tree);
  const { rowPtr, superRows } = buildSupernodeRows(tree, entries, nnzL);
  const sizes = sizeFrontsAndStack(tree.superStart, tree.superParent, rowPtr);
  return {
    n,
    perm: tree.perm,
    invPerm: tree.invPerm,
    parent: tree.parent,
    colCount: tree.colCount,
    nnzL,
    flops,
    nnzA: nnzFull(a),
    nSuper: tree.nSuper,
    superStart: tree.superStart,
    superParent: tree.superParent,
    rowPtr,
    superRows,
    valuePtr: sizes.valuePtr,
    storedValues: sizes.valuePtr[tree.nSuper],
    maxFront: sizes.maxFront,
    stackPeak: sizes.stackPeak,
    entryPtr: entries.entryPtr,
    entryOrder: entries.entryOrder,
    entryOffset: entries.entryOffset,
    sourceColPtr: a.colPtr,
    sourceRowIndex: a.rowIndex,
  };
}

/** The elimination tree and column counts of A(q, q), renumbered in postorder. */
interface CountedColumns {
  /** post[k]: the column of A(q, q) that comes k-th in the postorder */
  readonly post: Int32Array;
  /** elimination tree in postorder numbering */
  readonly parent: Int32Array;
  /** column counts of L (diagonal included) in postorder numbering */
  readonly count: Int32Array;
  readonly nnzL: number;
  readonly flops: number;
}

/**
 * Phase 1: etree of A(q, q) for the given ordering q, its postorder, and the column counts
 * (computed on A(q, q) with that postorder), then everything renumbered in postorder: column
 * k is old column post[k].
 */
function countColumnsInPostorder(a: SymmetricCsc, ordering: Ordering): CountedColumns {
  const n = a.n;
  const pat0 = permutedPatterns(a, ordering.invPerm);
  const parent0 = eliminationTree(n, pat0.upperPtr, pat0.upperIdx);
  const post = postorderTree(parent0);
  const count0 = columnCounts({ n, colPtr: pat0.lowerPtr, rowIndex: pat0.lowerIdx }, parent0, post);
  const postInv = invertPermutation(post);
  const parent = new Int32Array(n);
  const count = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    const p0 = parent0[post[k]];
    parent[k] = p0 === -1 ? -1 : postInv[p0];
    count[k] = count0[post[k]];
  }
  let nnzL = 0;
  let flops = 0;
  for (let j = 0; j < n; j++) {
    nnzL += count[j];
    flops += count[j] * count[j];
  }
  return { post, parent, count, nnzL, flops };
}

/** Fundamental supernodes: supernode s has columns start[s] .. start[s+1]-1; parent -1 for roots. */
interface FundamentalSupernodes {
  readonly count: number;
  readonly start: Int32Array;
  readonly parent: Int32Array;
}

/**
 * Phase 2, fundamental supernodes (Liu, Ng & Peyton 1993): j joins j-1 when it is j-1's
 * parent, its only child, and its column is j-1's minus the diagonal.
 */
function findFundamentalSupernodes(parentP: Int32Array, countP: Int32Array): FundamentalSupernodes {
  const n = parentP.length;
  const nChild = new Int32Array(n);
  for (let j = 0; j < n; j++) if (parentP[j] !== -1) nChild[parentP[j]]++;
  const startList: number[] = [];
  for (let j = 0; j < n; j++) {
    if (j === 0 || !(parentP[j - 1] === j && countP[j - 1] === countP[j] + 1 && nChild[j] === 1)) startList.push(j);
  }
  const nf = startList.length;
  startList.push(n);
  const start = Int32Array.from(startList);
  const superOfCol = new Int32Array(n);
  for (let s = 0; s < nf; s++) for (let j = start[s]; j < start[s + 1]; j++) superOfCol[j] = s;
  const parent = new Int32Array(nf);
  for (let s = 0; s < nf; s++) {
    const pc = parentP[start[s + 1] - 1];
    parent[s] = pc === -1 ? -1 : superOfCol[pc];
  }
  return { count: nf, start, parent };
}

/**
 * Phase 3, relaxed amalgamation (Ashcraft & Grimes 1989) on the supernodal tree: a child
 * group merges into its parent group when the merged front stores few enough explicit zeros.
 * Any child may merge, not only the one numbered just before the parent: renumberSupernodes
 * puts the columns of a group together afterwards. Returns, for each fundamental supernode,
 * the supernode it merged into, or -1.
 */
function amalgamateSupernodes(fundamental: FundamentalSupernodes, countP: Int32Array, rules: ReadonlyArray<readonly [number, number]>): Int32Array {
  const { count: nf, start: fundStart, parent: fParent } = fundamental;
  const gCols = new Float64Array(nf); // columns of the group rooted at s
  const gTrue = new Float64Array(nf); // true nonzeros of L in the group
  const belowRows = new Float64Array(nf); // rows below the group (those of its root supernode)
  const mergedInto = new Int32Array(nf).fill(-1);
  const { head: cHead, next: cNext } = childLists(fParent);
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
  return mergedInto;
}

/** The final supernodes and the final ordering (fill-reducing, then postorder, then groups). */
interface SupernodalTree {
  readonly n: number;
  readonly perm: Int32Array;
  readonly invPerm: Int32Array;
  readonly parent: Int32Array;
  readonly colCount: Int32Array;
  readonly nSuper: number;
  readonly superStart: Int32Array;
  readonly superParent: Int32Array;
  readonly superOfCol: Int32Array;
}

/**
 * Phase 4: the merged groups become the supernodes, numbered by a postorder of the group tree,
 * each group listing its members' columns; the columns are renumbered to match, and the
 * ordering, elimination tree and column counts with them.
 */
function renumberSupernodes(ordering: Ordering, counted: CountedColumns, fundamental: FundamentalSupernodes, mergedInto: Int32Array): SupernodalTree {
  const { post, parent: parentP, count: countP } = counted;
  const { count: nf, start: fundStart, parent: fParent } = fundamental;
  const n = parentP.length;
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
  if (w !== n) throw new InternalError('analyzeCholesky: supernode renumbering lost columns');
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
  const superOfCol = new Int32Array(n);
  for (let s = 0; s < nSuper; s++) for (let j = superStart[s]; j < superStart[s + 1]; j++) superOfCol[j] = s;
  const superParent = new Int32Array(nSuper);
  for (let s = 0; s < nSuper; s++) {
    const pc = parent[superStart[s + 1] - 1];
    superParent[s] = pc === -1 ? -1 : superOfCol[pc];
    if (superParent[s] !== -1 && superParent[s] <= s) throw new InternalError('analyzeCholesky: supernodal tree not in postorder');
  }
  return { n, perm, invPerm, parent, colCount, nSuper, superStart, superParent, superOfCol };
}

/** A's entries bucketed by supernode (see SymbolicFactor); entryOffset holds the new row until buildSupernodeRows. */
interface EntryBuckets {
  readonly entryPtr: Int32Array;
  readonly entryOrder: Int32Array;
  readonly entryOffset: Int32Array;
  /** new column of each entry (min of its new row and column) */
  readonly entryCol: Int32Array;
}

/**
 * Phase 5, entries of A bucketed by the supernode that assembles them: entry (I, J) goes to
 * new column min(i, j) and row max(i, j), i = invPerm[I]. entryOffset is shared memory, so a
 * worker thread reads it without a copy.
 */
function bucketEntries(a: SymmetricCsc, tree: SupernodalTree): EntryBuckets {
  const { n, perm, invPerm, nSuper, superOfCol } = tree;
  const nzA = a.colPtr[n];
  const entryPtr = new Int32Array(nSuper + 1);
  const entryOrder = new Int32Array(nzA);
  const entryOffset = new Int32Array(new SharedArrayBuffer(4 * Math.max(1, nzA)), 0, nzA);
  const entryCol = new Int32Array(nzA);
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
  return { entryPtr, entryOrder, entryOffset, entryCol };
}

/**
 * Phase 6, row structure of each supernode: its columns, the rows of A below them, and the
 * update rows of its children (supernodal symbolic factorisation). Turns each entry's new row
 * in entries.entryOffset into its offset in the supernode's row-major front. superRows is
 * shared memory, so a worker thread reads the row structure without a copy.
 */
function buildSupernodeRows(tree: SupernodalTree, entries: EntryBuckets, nnzL: number): { rowPtr: Int32Array; superRows: Int32Array } {
  const { n, nSuper, superStart, superParent } = tree;
  const { entryPtr, entryOffset, entryCol } = entries;
  const { head: sHead, next: sNext } = childLists(superParent);
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
  const superRows = new Int32Array(new SharedArrayBuffer(4 * Math.max(1, nr)), 0, nr);
  superRows.set(rows.subarray(0, nr));
  return { rowPtr, superRows };
}

/**
 * Phase 7: where each supernode's values start (row-major lower trapezoid), the largest front,
 * and the peak of the multifrontal update stack (children's updates popped, then this one's
 * pushed, in postorder).
 */
function sizeFrontsAndStack(superStart: Int32Array, superParent: Int32Array, rowPtr: Int32Array): { valuePtr: Float64Array; maxFront: number; stackPeak: number } {
  const nSuper = superParent.length;
  const { head: sHead, next: sNext } = childLists(superParent);
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
  return { valuePtr, maxFront, stackPeak };
}

/** Throws unless a has exactly the pattern the symbolic factor was computed for. */
export function checkPattern(a: SymmetricCsc, symbolic: SymbolicFactor, who: string): void {
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


