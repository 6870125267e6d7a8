/**
 * The numeric loop of the supernodal multifrontal Cholesky over a range of supernodes (see
 * numeric.ts for the method and its sources), the forward and backward substitutions over a
 * range, and the choice of the subtree a second thread takes.
 *
 * Independent subtrees of the elimination tree can be factorised in any order or at the same
 * time (J. W. H. Liu, "The role of elimination trees in sparse factorization", SIAM J. Matrix
 * Anal. Appl. 11, 1990; "subtree-to-subcube" mapping of A. George, J. W. H. Liu and E. Ng,
 * "Communication results for parallel sparse Cholesky factorization on a hypercube", Parallel
 * Computing 10, 1989). With a postordered tree a subtree is a contiguous range of supernodes,
 * so the split is: main thread [0, first(c)), worker subtree(c) = [first(c), c], then the main
 * thread takes c's update matrix and does (c, nSuper).
 *
 * `factorRange`, `forwardRange` and `backwardRange` reference nothing outside their arguments,
 * so the worker (threads.ts) runs the very same code from their source text.
 */

import { factorFrontPivots, failedPivotValue, rankUpdate, type SimdKernel } from './dense.js';
import type { ExtendAdd, ZeroLower } from './wasm-kernel.js';

/** Everything factorRange reads and writes. Index bases let a thread hold only its slice. */
export interface RangeContext {
  readonly s0: number;
  readonly s1: number;
  readonly superStart: Int32Array;
  readonly superParent: Int32Array;
  readonly rowPtr: Int32Array;
  /** rows of supernodes s0..s1-1, superRows[rowPtr[s] - rowBase + t] */
  readonly superRows: Int32Array;
  readonly rowBase: number;
  readonly valuePtr: Float64Array;
  readonly entryPtr: Int32Array;
  /** values of A in entry order and their front offsets, index q - entryBase */
  readonly entryValues: Float64Array;
  readonly entryOffset: Int32Array;
  readonly entryBase: number;
  /** the factor values (full length; supernode s at valuePtr[s]) */
  readonly L: Float64Array;
  readonly front: Float64Array;
  readonly stack: Float64Array;
  readonly rel: Int32Array;
  readonly map: Int32Array;
  readonly sHead: Int32Array;
  readonly sNext: Int32Array;
  readonly updStart: Float64Array;
  readonly threshold: number;
  readonly panelScratch: Float64Array;
  /** WebAssembly helpers and SIMD kernels, or null for plain JavaScript */
  readonly zeroLower: ZeroLower | null;
  readonly extendAdd: ExtendAdd | null;
  readonly relByte: number;
  readonly stackByte: number;
  readonly simdFront: SimdKernel | null;
  readonly simdStack: SimdKernel | null;
}

/** The dense kernels, passed in so that factorRange has no free references. */
export interface RangeKernels {
  readonly factorFrontPivots: typeof factorFrontPivots;
  readonly rankUpdate: typeof rankUpdate;
  readonly lastPivot: () => number;
}

/** Outcome of factorRange: the stack top after it, or the first failed pivot. */
export interface RangeResult {
  top: number;
  /** permuted column of the first failed pivot, or -1 */
  failedColumn: number;
  pivot: number;
}

/**
 * Factorises supernodes ctx.s0 .. ctx.s1-1 in order, starting with `top`
 * doubles already on the update stack (the updates of earlier supernodes).
 * Stops at the first pivot that fails the threshold.
 */
export function factorRange(ctx: RangeContext, kern: RangeKernels, top: number): RangeResult {
  const { superStart, superParent, rowPtr, superRows, rowBase, valuePtr, entryPtr, entryValues, entryOffset, entryBase } = ctx;
  const { L, front, stack, rel, map, sHead, sNext, updStart, threshold, panelScratch } = ctx;
  const { zeroLower, extendAdd, relByte, stackByte, simdFront, simdStack } = ctx;
  for (let s = ctx.s0; s < ctx.s1; s++) {
    const f = superStart[s];
    const k = superStart[s + 1] - f;
    const r0 = rowPtr[s] - rowBase;
    const m = rowPtr[s + 1] - rowPtr[s];
    for (let t = 0; t < m; t++) map[superRows[r0 + t]] = t;
    // zero the lower triangle of the front
    if (zeroLower !== null) zeroLower(0, m * 8);
    else for (let t = 0; t < m; t++) front.fill(0, t * m, t * m + t + 1);
    // assemble the entries of A(p,p) in columns f .. f+k-1
    for (let q = entryPtr[s] - entryBase; q < entryPtr[s + 1] - entryBase; q++) front[entryOffset[q]] += entryValues[q];
    // extend-add the children's update matrices, then pop them
    let firstChildStart = -1;
    for (let ch = sHead[s]; ch !== -1; ch = sNext[ch]) {
      const kc = superStart[ch + 1] - superStart[ch];
      const rc = rowPtr[ch] - rowBase + kc;
      const mc = rowPtr[ch + 1] - rowBase - rc;
      for (let t = 0; t < mc; t++) rel[t] = map[superRows[rc + t]];
      const base = updStart[ch];
      if (firstChildStart < 0) firstChildStart = base;
      if (extendAdd !== null) {
        extendAdd(0, m * 8, stackByte + base * 8, relByte, mc);
      } else {
        let u = base;
        for (let aa = 0; aa < mc; aa++) {
          const row = rel[aa] * m;
          for (let bb = 0; bb <= aa; bb++) front[row + rel[bb]] += stack[u++];
        }
      }
    }
    if (firstChildStart >= 0) top = firstChildStart;
    // partial factorisation of the k pivot columns
    const bad = kern.factorFrontPivots(front, m, k, threshold, panelScratch, simdFront);
    if (bad >= 0) return { top, failedColumn: f + bad, pivot: kern.lastPivot() };
    // copy the factor rows out
    let dst = valuePtr[s];
    for (let aa = 0; aa < m; aa++) {
      const cnt = aa < k ? aa + 1 : k;
      const src = aa * m;
      for (let t = 0; t < cnt; t++) L[dst + t] = front[src + t];
      dst += cnt;
    }
    // Schur complement onto the stack (packed lower, row-major)
    const u = m - k;
    if (u > 0 && superParent[s] !== -1) {
      updStart[s] = top;
      kern.rankUpdate(front, m, k, m, k, m, 0, k, stack, top, simdStack);
      top += (u * (u + 1)) / 2;
    }
  }
  return { top, failedColumn: -1, pivot: 0 };
}

/**
 * Forward substitution y := L^-1 y over supernodes s0 .. s1-1 (permuted
 * numbering). Updates of rows >= deltaFrom go to delta instead of y (the
 * rows a worker shares with the other thread); pass delta = y and
 * deltaFrom = n for a plain pass. Rows below a supernode's diagonal block
 * are taken four at a time.
 */
export function forwardRange(
  L: Float64Array,
  superStart: Int32Array,
  rowPtr: Int32Array,
  superRows: Int32Array,
  valuePtr: Float64Array,
  y: Float64Array,
  s0: number,
  s1: number,
  delta: Float64Array,
  deltaFrom: number,
): void {
  for (let s = s0; s < s1; s++) {
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
    let a = k;
    for (; a + 3 < m; a += 4) {
      const o1 = o + k;
      const o2 = o1 + k;
      const o3 = o2 + k;
      let t0 = 0;
      let t1 = 0;
      let t2 = 0;
      let t3 = 0;
      for (let j = 0; j < k; j++) {
        const yj = y[f + j];
        t0 += L[o + j] * yj;
        t1 += L[o1 + j] * yj;
        t2 += L[o2 + j] * yj;
        t3 += L[o3 + j] * yj;
      }
      const i0 = superRows[r0 + a];
      const i1 = superRows[r0 + a + 1];
      const i2 = superRows[r0 + a + 2];
      const i3 = superRows[r0 + a + 3];
      if (i0 < deltaFrom) y[i0] -= t0;
      else delta[i0] -= t0;
      if (i1 < deltaFrom) y[i1] -= t1;
      else delta[i1] -= t1;
      if (i2 < deltaFrom) y[i2] -= t2;
      else delta[i2] -= t2;
      if (i3 < deltaFrom) y[i3] -= t3;
      else delta[i3] -= t3;
      o += 4 * k;
    }
    for (; a < m; a++) {
      let t0 = 0;
      for (let j = 0; j < k; j++) t0 += L[o + j] * y[f + j];
      const i0 = superRows[r0 + a];
      if (i0 < deltaFrom) y[i0] -= t0;
      else delta[i0] -= t0;
      o += k;
    }
  }
}

/**
 * Back substitution y := L^-T y over supernodes s1-1 down to s0; t is
 * scratch of at least the largest supernode's column count.
 */
export function backwardRange(
  L: Float64Array,
  superStart: Int32Array,
  rowPtr: Int32Array,
  superRows: Int32Array,
  valuePtr: Float64Array,
  y: Float64Array,
  s0: number,
  s1: number,
  t: Float64Array,
): void {
  for (let s = s1 - 1; s >= s0; s--) {
    const f = superStart[s];
    const k = superStart[s + 1] - f;
    const r0 = rowPtr[s];
    const m = rowPtr[s + 1] - r0;
    for (let j = 0; j < k; j++) t[j] = y[f + j];
    let o = valuePtr[s] + (k * (k + 1)) / 2;
    let a = k;
    for (; a + 3 < m; a += 4) {
      const x0 = y[superRows[r0 + a]];
      const x1 = y[superRows[r0 + a + 1]];
      const x2 = y[superRows[r0 + a + 2]];
      const x3 = y[superRows[r0 + a + 3]];
      const o1 = o + k;
      const o2 = o1 + k;
      const o3 = o2 + k;
      for (let j = 0; j < k; j++) t[j] -= L[o + j] * x0 + L[o1 + j] * x1 + L[o2 + j] * x2 + L[o3 + j] * x3;
      o += 4 * k;
    }
    for (; a < m; a++) {
      const x0 = y[superRows[r0 + a]];
      for (let j = 0; j < k; j++) t[j] -= L[o + j] * x0;
      o += k;
    }
    for (let a2 = k - 1; a2 >= 0; a2--) {
      const ro = valuePtr[s] + (a2 * (a2 + 1)) / 2;
      const xa = t[a2] / L[ro + a2];
      y[f + a2] = xa;
      for (let j = 0; j < a2; j++) t[j] -= L[ro + j] * xa;
    }
  }
}

/** The kernels of this thread. */
export function mainThreadKernels(): RangeKernels {
  return { factorFrontPivots, rankUpdate, lastPivot: () => failedPivotValue };
}

/**
 * The subtree to give the worker: the supernode c (not a root) maximising
 * min(work of subtree(c), work of the supernodes numbered before it), so
 * both threads are busy as long as possible. Work is the factorisation's
 * (dense operations per front) or the solves' (values and rows). Returns c and first(c), or
 * null when no split leaves each thread at least a fifth of the work.
 */
export function chooseSplit(
  superStart: Int32Array,
  superParent: Int32Array,
  rowPtr: Int32Array,
  measure: 'flops' | 'values' = 'flops',
): { c: number; first: number } | null {
  const nSuper = superParent.length;
  const work = new Float64Array(nSuper);
  const subtree = new Float64Array(nSuper);
  const first = new Int32Array(nSuper);
  for (let s = 0; s < nSuper; s++) first[s] = s;
  let total = 0;
  for (let s = 0; s < nSuper; s++) {
    const k = superStart[s + 1] - superStart[s];
    const m = rowPtr[s + 1] - rowPtr[s];
    work[s] = measure === 'flops' ? (k * k * k) / 3 + (m - k) * k * k + (m - k) * (m - k) * k + m * m : m * k + m;
    total += work[s];
  }
  for (let s = 0; s < nSuper; s++) {
    subtree[s] += work[s];
    const p = superParent[s];
    if (p !== -1) {
      subtree[p] += subtree[s];
      if (first[s] < first[p]) first[p] = first[s];
    }
  }
  const prefix = new Float64Array(nSuper + 1);
  for (let s = 0; s < nSuper; s++) prefix[s + 1] = prefix[s] + work[s];
  let best = -1;
  let bestScore = 0;
  for (let c = 0; c < nSuper; c++) {
    if (superParent[c] === -1) continue;
    const score = Math.min(subtree[c], prefix[first[c]]);
    if (score > bestScore) {
      bestScore = score;
      best = c;
    }
  }
  if (best < 0 || bestScore < 0.2 * total) return null;
  return { c: best, first: first[best] };
}
