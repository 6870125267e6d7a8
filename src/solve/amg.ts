/**
 * Smoothed-aggregation algebraic multigrid for the stiffness matrices of plane elasticity, used
 * as the preconditioner of the conjugate gradient fallback (pcg.ts) when the direct factor would
 * not fit in memory.
 *
 * Method, from the published descriptions (code written afresh): P. Vanek, J. Mandel and
 * M. Brezina, "Algebraic multigrid by smoothed aggregation for second and fourth order elliptic
 * problems", Computing 56 (1996) 179-196.
 *  - aggregation of the nodes (the DOF blocks) over the matrix graph: a node whose neighbours are
 *    all free starts an aggregate with them; the rest join the aggregate of a neighbour; what is
 *    left forms aggregates of its own (the three passes of Vanek et al., sec. 4);
 *  - the tentative prolongator interpolates the near-null space exactly: the plane rigid motions
 *    (ux = 1, uy = 1, rotation (-y, x)) on each aggregate, orthonormalised, so P0 has orthonormal
 *    columns and the coarse near-null space is the triangular factor R of each aggregate;
 *  - the prolongator P = (I - omega D^-1 A) P0 with omega = 4 / (3 rho(D^-1 A)), rho estimated by
 *    power iteration; the coarse matrix is the Galerkin product P^T A P;
 *  - a V-cycle with one forward Gauss-Seidel sweep before and one backward sweep after the coarse
 *    correction, so the preconditioner is symmetric positive definite as CG needs; the coarsest
 *    level (a few thousand unknowns) is solved by the sparse Cholesky factor.
 *
 * Matrices are held as full (both triangles) CSR, rows sorted; all arrays are typed.
 */
import { adjacencyGraph, type SymmetricCsc } from './sparse.js';
import { analyzeCholesky } from './symbolic.js';
import { factorCholesky, type CholeskyFactor } from './numeric.js';
import { solveCholesky } from './triangular.js';
import { orderAmd } from './amd.js';
import type { PcgPreconditioner } from './pcg.js';

/** A sparse matrix in compressed rows. */
export interface Csr {
  readonly rows: number;
  readonly cols: number;
  readonly ptr: Int32Array;
  readonly idx: Int32Array;
  readonly val: Float64Array;
}

interface Level {
  A: Csr;
  /** prolongator to this level from the next coarser one (absent on the coarsest) */
  P?: Csr;
  /** its transpose, the restriction */
  R?: Csr;
  invDiag: Float64Array;
  /** work vectors: residual, correction */
  r: Float64Array;
  x: Float64Array;
  b: Float64Array;
}

export interface AmgHierarchy {
  readonly levels: Level[];
  readonly coarse: CholeskyFactor;
  /** unknowns per level, finest first */
  readonly sizes: number[];
  /** total stored nonzeros of the level matrices over that of the finest (operator complexity) */
  readonly complexity: number;
  readonly bytes: number;
}

export interface AmgOptions {
  /** stop coarsening at this many unknowns (default 3000) */
  readonly coarseSize?: number;
  /** at most this many levels (default 12) */
  readonly maxLevels?: number;
}

/** The full symmetric matrix of a lower CSC, as CSR (rows sorted). */
export function fullFromLower(a: SymmetricCsc): Csr {
  const { n, colPtr, rowIndex, values } = a;
  const cnt = new Int32Array(n + 1);
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIndex[p];
      cnt[i + 1]++;
      if (i !== j) cnt[j + 1]++;
    }
  }
  for (let i = 0; i < n; i++) cnt[i + 1] += cnt[i];
  const ptr = cnt;
  const next = ptr.slice(0, n);
  const idx = new Int32Array(ptr[n]);
  const val = new Float64Array(ptr[n]);
  // Row i gets, in column order j = 0, 1, ...: entries (i, j) for j < i from column j (lower part of
  // column j), then its own column i (rows >= i). Both arrive in increasing column order.
  for (let j = 0; j < n; j++) {
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIndex[p];
      if (i !== j) {
        const q = next[i]++;
        idx[q] = j;
        val[q] = values[p];
      }
    }
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIndex[p];
      const q = next[j]++;
      idx[q] = i;
      val[q] = values[p];
    }
  }
  return { rows: n, cols: n, ptr, idx, val };
}

/** The lower CSC of a symmetric CSR: column j holds the entries (i >= j) of row j. */
function lowerFromFull(a: Csr): SymmetricCsc {
  const n = a.rows;
  const colPtr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) {
    let c = 0;
    for (let p = a.ptr[i]; p < a.ptr[i + 1]; p++) if (a.idx[p] >= i) c++;
    colPtr[i + 1] = colPtr[i] + c;
  }
  const rowIndex = new Int32Array(colPtr[n]);
  const values = new Float64Array(colPtr[n]);
  for (let i = 0; i < n; i++) {
    let w = colPtr[i];
    for (let p = a.ptr[i]; p < a.ptr[i + 1]; p++) {
      if (a.idx[p] < i) continue;
      rowIndex[w] = a.idx[p];
      values[w] = a.val[p];
      w++;
    }
  }
  return { n, colPtr, rowIndex, values };
}

/** y = A x. */
function multiplyCsr(a: Csr, x: Float64Array, y: Float64Array): void {
  const { ptr, idx, val } = a;
  for (let i = 0; i < a.rows; i++) {
    let s = 0;
    for (let p = ptr[i]; p < ptr[i + 1]; p++) s += val[p] * x[idx[p]];
    y[i] = s;
  }
}

/** The transpose of a CSR matrix (rows of the result sorted). */
export function transposeCsr(a: Csr): Csr {
  const ptr = new Int32Array(a.cols + 1);
  for (let p = 0; p < a.ptr[a.rows]; p++) ptr[a.idx[p] + 1]++;
  for (let j = 0; j < a.cols; j++) ptr[j + 1] += ptr[j];
  const next = ptr.slice(0, a.cols);
  const idx = new Int32Array(ptr[a.cols]);
  const val = new Float64Array(ptr[a.cols]);
  for (let i = 0; i < a.rows; i++) {
    for (let p = a.ptr[i]; p < a.ptr[i + 1]; p++) {
      const q = next[a.idx[p]]++;
      idx[q] = i;
      val[q] = a.val[p];
    }
  }
  return { rows: a.cols, cols: a.rows, ptr, idx, val };
}

/**
 * C = A B by rows (F. G. Gustavson, "Two fast algorithms for sparse matrices: multiplication and
 * permuted transposition", ACM TOMS 4, 1978): a dense accumulator over the columns of B and the
 * list of columns touched; each row of C is sorted before it is stored.
 */
export function multiplySparse(a: Csr, b: Csr): Csr {
  if (a.cols !== b.rows) throw new RangeError(`multiplySparse: ${a.rows}x${a.cols} times ${b.rows}x${b.cols}`);
  const acc = new Float64Array(b.cols);
  const mark = new Int32Array(b.cols).fill(-1);
  const touched = new Int32Array(b.cols);
  let cap = Math.max(16, a.ptr[a.rows] + b.ptr[b.rows]);
  let idx = new Int32Array(cap);
  let val = new Float64Array(cap);
  const ptr = new Int32Array(a.rows + 1);
  let nz = 0;
  for (let i = 0; i < a.rows; i++) {
    let nt = 0;
    for (let p = a.ptr[i]; p < a.ptr[i + 1]; p++) {
      const k = a.idx[p];
      const v = a.val[p];
      for (let q = b.ptr[k]; q < b.ptr[k + 1]; q++) {
        const j = b.idx[q];
        if (mark[j] !== i) {
          mark[j] = i;
          acc[j] = 0;
          touched[nt++] = j;
        }
        acc[j] += v * b.val[q];
      }
    }
    if (nz + nt > cap) {
      cap = Math.max(2 * cap, nz + nt);
      const i2 = new Int32Array(cap);
      i2.set(idx.subarray(0, nz));
      idx = i2;
      const v2 = new Float64Array(cap);
      v2.set(val.subarray(0, nz));
      val = v2;
    }
    const row = touched.subarray(0, nt).sort();
    for (let t = 0; t < nt; t++) {
      idx[nz] = row[t];
      val[nz] = acc[row[t]];
      nz++;
    }
    ptr[i + 1] = nz;
  }
  return { rows: a.rows, cols: b.cols, ptr, idx: idx.slice(0, nz), val: val.slice(0, nz) };
}

/**
 * Aggregates of the blocks (nodes) over the graph of A: block of each unknown in, aggregate of
 * each block out (-1 for a block with no unknowns), and the aggregate count.
 */
export function aggregateBlocks(a: Csr, blockOf: Int32Array, nBlocks: number): { aggOf: Int32Array; nAgg: number } {
  // block graph from the matrix pattern
  const deg = new Int32Array(nBlocks + 1);
  const has = new Uint8Array(nBlocks);
  for (let i = 0; i < a.rows; i++) has[blockOf[i]] = 1;
  // neighbours per block, deduplicated with a marker
  const mark = new Int32Array(nBlocks).fill(-1);
  const firstRow = new Int32Array(nBlocks + 1);
  for (let i = 0; i < a.rows; i++) firstRow[blockOf[i] + 1]++;
  for (let k = 0; k < nBlocks; k++) firstRow[k + 1] += firstRow[k];
  const rowList = new Int32Array(a.rows);
  const fill = firstRow.slice(0, nBlocks);
  for (let i = 0; i < a.rows; i++) rowList[fill[blockOf[i]]++] = i;
  /** Calls visit(m) once for every block m != k coupled to block k. */
  const forEachNeighbour = (k: number, visit: (m: number) => void) => {
    for (let t = firstRow[k]; t < firstRow[k + 1]; t++) {
      const i = rowList[t];
      for (let p = a.ptr[i]; p < a.ptr[i + 1]; p++) {
        const m = blockOf[a.idx[p]];
        if (m !== k && mark[m] !== k) {
          mark[m] = k;
          visit(m);
        }
      }
    }
  };
  for (let k = 0; k < nBlocks; k++) forEachNeighbour(k, () => deg[k + 1]++);
  for (let k = 0; k < nBlocks; k++) deg[k + 1] += deg[k];
  const gptr = deg;
  const gidx = new Int32Array(gptr[nBlocks]);
  mark.fill(-1);
  const gfill = gptr.slice(0, nBlocks);
  for (let k = 0; k < nBlocks; k++) forEachNeighbour(k, (m) => (gidx[gfill[k]++] = m));
  const aggOf = new Int32Array(nBlocks).fill(-1);
  let nAgg = 0;
  // pass 1: a block with every neighbour free starts an aggregate with them
  for (let k = 0; k < nBlocks; k++) {
    if (!has[k] || aggOf[k] >= 0) continue;
    let free = true;
    for (let p = gptr[k]; p < gptr[k + 1]; p++) if (aggOf[gidx[p]] >= 0) free = false;
    if (!free) continue;
    aggOf[k] = nAgg;
    for (let p = gptr[k]; p < gptr[k + 1]; p++) aggOf[gidx[p]] = nAgg;
    nAgg++;
  }
  // pass 2: the rest join a neighbour's aggregate (one formed in pass 1)
  const pass1 = aggOf.slice();
  for (let k = 0; k < nBlocks; k++) {
    if (!has[k] || aggOf[k] >= 0) continue;
    for (let p = gptr[k]; p < gptr[k + 1]; p++) {
      if (pass1[gidx[p]] >= 0) {
        aggOf[k] = pass1[gidx[p]];
        break;
      }
    }
  }
  // pass 3: what is left forms aggregates with its free neighbours
  for (let k = 0; k < nBlocks; k++) {
    if (!has[k] || aggOf[k] >= 0) continue;
    aggOf[k] = nAgg;
    for (let p = gptr[k]; p < gptr[k + 1]; p++) if (aggOf[gidx[p]] < 0) aggOf[gidx[p]] = nAgg;
    nAgg++;
  }
  return { aggOf, nAgg };
}

/**
 * The tentative prolongator of one level: per aggregate, the rows of the near-null space B
 * (n x nb, row-major) of its unknowns, orthonormalised by modified Gram-Schmidt; columns that
 * come out dependent (an aggregate of one node cannot rotate) are dropped. Returns P0 (n x nc)
 * and the coarse near-null space (nc x nb) and the coarse block of each coarse unknown.
 */
export function tentativeProlongator(n: number, B: Float64Array, nb: number, aggOfRow: Int32Array, nAgg: number): { P0: Csr; Bc: Float64Array; blockOfCoarse: Int32Array; nc: number } {
  const start = new Int32Array(nAgg + 1);
  for (let i = 0; i < n; i++) start[aggOfRow[i] + 1]++;
  for (let g = 0; g < nAgg; g++) start[g + 1] += start[g];
  const rowsOf = new Int32Array(n);
  const fill = start.slice(0, nAgg);
  for (let i = 0; i < n; i++) rowsOf[fill[aggOfRow[i]]++] = i;
  const q = new Float64Array(n * nb); // orthonormal columns, stored by row
  const keep = new Uint8Array(nAgg * nb);
  const Rg = new Float64Array(nAgg * nb * nb);
  let nc = 0;
  const coarseStart = new Int32Array(nAgg + 1);
  for (let g = 0; g < nAgg; g++) {
    const r0 = start[g];
    const r1 = start[g + 1];
    for (let t = r0; t < r1; t++) for (let c = 0; c < nb; c++) q[rowsOf[t] * nb + c] = B[rowsOf[t] * nb + c];
    // scale of the aggregate's columns, for the dependence test
    let scale = 0;
    for (let t = r0; t < r1; t++) for (let c = 0; c < nb; c++) scale = Math.max(scale, Math.abs(q[rowsOf[t] * nb + c]));
    let kept = 0;
    for (let c = 0; c < nb; c++) {
      // against the kept columns
      for (let d = 0; d < c; d++) {
        if (!keep[g * nb + d]) continue;
        let dot = 0;
        for (let t = r0; t < r1; t++) dot += q[rowsOf[t] * nb + d] * q[rowsOf[t] * nb + c];
        Rg[(g * nb + d) * nb + c] = dot;
        for (let t = r0; t < r1; t++) q[rowsOf[t] * nb + c] -= dot * q[rowsOf[t] * nb + d];
      }
      let norm = 0;
      for (let t = r0; t < r1; t++) norm += q[rowsOf[t] * nb + c] ** 2;
      norm = Math.sqrt(norm);
      if (norm > 1e-10 * scale * Math.sqrt(r1 - r0)) {
        keep[g * nb + c] = 1;
        kept++;
        Rg[(g * nb + c) * nb + c] = norm;
        for (let t = r0; t < r1; t++) q[rowsOf[t] * nb + c] /= norm;
      } else for (let t = r0; t < r1; t++) q[rowsOf[t] * nb + c] = 0;
    }
    coarseStart[g + 1] = coarseStart[g] + kept;
    nc += kept;
  }
  // P0 rows: each row of aggregate g has the kept columns of g
  const ptr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) ptr[i + 1] = ptr[i] + (coarseStart[aggOfRow[i] + 1] - coarseStart[aggOfRow[i]]);
  const idx = new Int32Array(ptr[n]);
  const val = new Float64Array(ptr[n]);
  for (let i = 0; i < n; i++) {
    const g = aggOfRow[i];
    let w = ptr[i];
    let col = coarseStart[g];
    for (let c = 0; c < nb; c++) {
      if (!keep[g * nb + c]) continue;
      idx[w] = col++;
      val[w] = q[i * nb + c];
      w++;
    }
  }
  // coarse near-null space: the rows of R for the kept columns
  const Bc = new Float64Array(nc * nb);
  const blockOfCoarse = new Int32Array(nc);
  for (let g = 0; g < nAgg; g++) {
    let row = coarseStart[g];
    for (let c = 0; c < nb; c++) {
      if (!keep[g * nb + c]) continue;
      for (let d = 0; d < nb; d++) Bc[row * nb + d] = d >= c ? Rg[(g * nb + c) * nb + d] : 0;
      blockOfCoarse[row] = g;
      row++;
    }
  }
  return { P0: { rows: n, cols: nc, ptr, idx, val }, Bc, blockOfCoarse, nc };
}

function diagonalOf(a: Csr): Float64Array {
  const d = new Float64Array(a.rows);
  for (let i = 0; i < a.rows; i++) for (let p = a.ptr[i]; p < a.ptr[i + 1]; p++) if (a.idx[p] === i) d[i] = a.val[p];
  return d;
}

/** rho(D^-1 A) by a few power iterations from a fixed start (an estimate from below, enlarged 5%). */
function spectralRadius(a: Csr, invDiag: Float64Array): number {
  const n = a.rows;
  let x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = 1 + ((i * 7919) % 13) / 13;
  let y = new Float64Array(n);
  let lambda = 1;
  for (let it = 0; it < 15; it++) {
    multiplyCsr(a, x, y);
    let norm = 0;
    for (let i = 0; i < n; i++) {
      y[i] *= invDiag[i];
      norm += y[i] * y[i];
    }
    norm = Math.sqrt(norm);
    let xn = 0;
    for (let i = 0; i < n; i++) xn += x[i] * x[i];
    lambda = norm / Math.sqrt(xn);
    for (let i = 0; i < n; i++) y[i] /= norm;
    const t = x;
    x = y;
    y = t;
  }
  return 1.05 * lambda;
}

/**
 * Builds the hierarchy for the lower-CSC matrix `a`. `blockOf` gives each unknown's node and
 * `B` (n x 3, row-major) the plane rigid motions at each unknown.
 */
export function buildAmg(a: SymmetricCsc, blockOf: Int32Array, nBlocks: number, B: Float64Array, options: AmgOptions = {}): AmgHierarchy {
  const coarseSize = options.coarseSize ?? 3000;
  const maxLevels = options.maxLevels ?? 12;
  const nb = 3;
  const levels: Level[] = [];
  let A = fullFromLower(a);
  let block = blockOf;
  let nBlk = nBlocks;
  let Bl = B;
  const sizes = [A.rows];
  let bytes = 0;
  const nnz0 = A.ptr[A.rows];
  let nnzSum = nnz0;
  while (A.rows > coarseSize && levels.length < maxLevels - 1) {
    const d = diagonalOf(A);
    const invDiag = Float64Array.from(d, (v) => (v > 0 ? 1 / v : 0));
    const { aggOf, nAgg } = aggregateBlocks(A, block, nBlk);
    const aggOfRow = Int32Array.from(block, (k) => aggOf[k]);
    const { P0, Bc, blockOfCoarse, nc } = tentativeProlongator(A.rows, Bl, nb, aggOfRow, nAgg);
    if (nc >= 0.8 * A.rows) break; // coarsening stalled
    const omega = 4 / (3 * spectralRadius(A, invDiag));
    // P = P0 - omega D^-1 A P0
    const AP0 = multiplySparse(A, P0);
    const P = smoothProlongator(P0, AP0, invDiag, omega);
    const R = transposeCsr(P);
    const Ac = multiplySparse(R, multiplySparse(A, P));
    levels.push({ A, P, R, invDiag, r: new Float64Array(A.rows), x: new Float64Array(A.rows), b: new Float64Array(A.rows) });
    bytes += csrBytes(A) + csrBytes(P) + csrBytes(R) + 8 * 4 * A.rows;
    A = Ac;
    block = blockOfCoarse; // the coarse unknowns of one aggregate form one block
    nBlk = nAgg;
    Bl = Bc;
    sizes.push(A.rows);
    nnzSum += A.ptr[A.rows];
  }
  const d = diagonalOf(A);
  levels.push({ A, invDiag: Float64Array.from(d, (v) => (v > 0 ? 1 / v : 0)), r: new Float64Array(A.rows), x: new Float64Array(A.rows), b: new Float64Array(A.rows) });
  const lower = lowerFromFull(A);
  const coarse = factorCholesky(lower, analyzeCholesky(lower, orderAmd(adjacencyGraph(lower))));
  bytes += csrBytes(A) + coarse.bytes;
  return { levels, coarse, sizes, complexity: nnzSum / nnz0, bytes };
}

function csrBytes(a: Csr): number {
  return a.ptr.byteLength + a.idx.byteLength + a.val.byteLength;
}

/** P0 - omega D^-1 (A P0), merging the two patterns row by row (both sorted). */
function smoothProlongator(P0: Csr, AP0: Csr, invDiag: Float64Array, omega: number): Csr {
  const n = P0.rows;
  const ptr = new Int32Array(n + 1);
  const idx = new Int32Array(P0.ptr[n] + AP0.ptr[n]);
  const val = new Float64Array(idx.length);
  let w = 0;
  for (let i = 0; i < n; i++) {
    let p = P0.ptr[i];
    let q = AP0.ptr[i];
    const pe = P0.ptr[i + 1];
    const qe = AP0.ptr[i + 1];
    const f = omega * invDiag[i];
    while (p < pe || q < qe) {
      const cp = p < pe ? P0.idx[p] : Infinity;
      const cq = q < qe ? AP0.idx[q] : Infinity;
      if (cp === cq) {
        idx[w] = cp;
        val[w++] = P0.val[p++] - f * AP0.val[q++];
      } else if (cp < cq) {
        idx[w] = cp;
        val[w++] = P0.val[p++];
      } else {
        idx[w] = cq;
        val[w++] = -f * AP0.val[q++];
      }
    }
    ptr[i + 1] = w;
  }
  return { rows: n, cols: P0.cols, ptr, idx: idx.slice(0, w), val: val.slice(0, w) };
}

/** One forward (or backward) Gauss-Seidel sweep on A x = b. */
function gaussSeidel(a: Csr, invDiag: Float64Array, b: Float64Array, x: Float64Array, forward: boolean): void {
  const { ptr, idx, val } = a;
  const n = a.rows;
  for (let k = 0; k < n; k++) {
    const i = forward ? k : n - 1 - k;
    let s = b[i];
    let d = 0;
    for (let p = ptr[i]; p < ptr[i + 1]; p++) {
      const j = idx[p];
      if (j === i) d = val[p];
      else s -= val[p] * x[j];
    }
    x[i] = d > 0 ? s / d : 0;
  }
}

/**
 * The hierarchy as a preconditioner of pcg.ts for the lower-CSC `a` it was built from (which
 * the iteration then multiplies by as it is: identity permutation, unit scale).
 */
export function amgPreconditioner(a: SymmetricCsc, h: AmgHierarchy): PcgPreconditioner {
  const n = a.n;
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[i] = i;
  return { n, perm, scale: new Float64Array(n).fill(1), scaled: a, apply: (r, z) => applyAmg(h, r, z) };
}

/**
 * The blocks (nodes) and plane rigid motions of the unknowns of a reduced stiffness matrix: row r
 * is full DOF fullDofOfRow[r] = 2 node + component. Rotation about the centre of the nodes, so
 * the three columns are of one magnitude.
 */
export function rigidModes(coords: Float64Array, fullDofOfRow: Int32Array): { blockOf: Int32Array; nBlocks: number; B: Float64Array } {
  const n = fullDofOfRow.length;
  const nNodes = coords.length >> 1;
  const blockOfNode = new Int32Array(nNodes).fill(-1);
  const blockOf = new Int32Array(n);
  let nBlocks = 0;
  let cx = 0;
  let cy = 0;
  let x0 = Infinity;
  let x1 = -Infinity;
  let y0 = Infinity;
  let y1 = -Infinity;
  for (let v = 0; v < nNodes; v++) {
    cx += coords[2 * v] / nNodes;
    cy += coords[2 * v + 1] / nNodes;
    x0 = Math.min(x0, coords[2 * v]);
    x1 = Math.max(x1, coords[2 * v]);
    y0 = Math.min(y0, coords[2 * v + 1]);
    y1 = Math.max(y1, coords[2 * v + 1]);
  }
  const L = Math.max(x1 - x0, y1 - y0) || 1;
  const B = new Float64Array(3 * n);
  for (let r = 0; r < n; r++) {
    const d = fullDofOfRow[r];
    const v = d >> 1;
    if (blockOfNode[v] < 0) blockOfNode[v] = nBlocks++;
    blockOf[r] = blockOfNode[v];
    const x = (coords[2 * v] - cx) / L;
    const y = (coords[2 * v + 1] - cy) / L;
    if (d & 1) {
      B[3 * r + 1] = 1;
      B[3 * r + 2] = x;
    } else {
      B[3 * r] = 1;
      B[3 * r + 2] = -y;
    }
  }
  return { blockOf, nBlocks, B };
}

/** z = M^-1 r by one V-cycle from zero: symmetric (forward sweep down, backward sweep up). */
export function applyAmg(h: AmgHierarchy, r: Float64Array, z: Float64Array): void {
  const L = h.levels;
  L[0].b.set(r);
  for (let l = 0; l < L.length - 1; l++) {
    const lv = L[l];
    lv.x.fill(0);
    gaussSeidel(lv.A, lv.invDiag, lv.b, lv.x, true);
    multiplyCsr(lv.A, lv.x, lv.r);
    for (let i = 0; i < lv.r.length; i++) lv.r[i] = lv.b[i] - lv.r[i];
    multiplyCsr(lv.R!, lv.r, L[l + 1].b);
  }
  const last = L[L.length - 1];
  last.x.set(solveCholesky(h.coarse, last.b));
  for (let l = L.length - 2; l >= 0; l--) {
    const lv = L[l];
    multiplyCsr(lv.P!, L[l + 1].x, lv.r);
    for (let i = 0; i < lv.x.length; i++) lv.x[i] += lv.r[i];
    gaussSeidel(lv.A, lv.invDiag, lv.b, lv.x, false);
  }
  z.set(L[0].x);
}
