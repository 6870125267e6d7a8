/**
 * Dense kernels for the frontal matrices of the multifrontal Cholesky.
 *
 * A front F of order m is stored row-major with row stride m, and only its
 * lower triangle (b <= a in F[a*m + b]) is used. Row a's first k entries are
 * the row of L in the pivot columns, contiguous, so every inner product
 * below runs over contiguous memory.
 *
 * The pivot columns are factorised in panels of `PANEL` columns, left-
 * looking across panels (each panel is first updated by all earlier
 * columns in one rank update with long inner products, then factorised)
 * and Crout (dot-product form) inside a panel: a block Cholesky as in G. H.
 * Golub and C. F. Van Loan, "Matrix Computations", 4th ed., Johns Hopkins
 * 2013, section 4.2. The symmetric rank-w updates are register-blocked,
 * 4 rows x 2 columns of the output per pass over the inner index, so each
 * pair of loads feeds more than one multiply-add (the register-blocking idea
 * of K. Goto and R. van de Geijn, "Anatomy of high-performance matrix
 * multiplication", ACM TOMS 34, 2008): in scalar JavaScript here, and with
 * two-lane SIMD for the full 4 x 2 blocks in wasm-kernel.ts.
 */

import type { RowBlock4 } from './wasm-kernel.js';

/**
 * The WebAssembly SIMD body of rankUpdate (wasm-kernel.ts) with the byte
 * offsets of F[0] and out[0] in its memory; F and out must be views of it.
 */
export interface SimdKernel {
  readonly rowBlock4: RowBlock4;
  readonly fByte: number;
  readonly outByte: number;
}

/**
 * Source text of the kernels below, for a worker thread (threads.ts):
 * their bodies refer only to each other and to PANEL and failedPivotValue.
 */
export function denseKernelSource(): string {
  return [
    `const PANEL = ${PANEL};`,
    'let failedPivotValue = 0;',
    factorFrontPivots.toString(),
    factorPanel.toString(),
    rankUpdate.toString(),
  ].join('\n');
}

/** Width of a panel of pivot columns. */
export const PANEL = 8;

/** Value of the pivot that factorFrontPivots last reported as failed. */
export let failedPivotValue = 0;

/**
 * Factorises the first k columns of the front in place: F11 = L11 L11^T
 * and L21 = F21 L11^-T, leaving F22 untouched. Returns -1, or the local
 * column of the first pivot d with !(d > threshold) or d not finite (its
 * value in failedPivotValue). scratch needs PANEL entries.
 */
export function factorFrontPivots(F: Float64Array, m: number, k: number, threshold: number, scratch: Float64Array, simd: SimdKernel | null = null): number {
  for (let p0 = 0; p0 < k; p0 += PANEL) {
    const p1 = p0 + PANEL < k ? p0 + PANEL : k;
    // left-looking: bring the panel up to date with all earlier columns at
    // once (long inner products), then factorise it
    if (p0 > 0) rankUpdate(F, m, p0, m, p0, p1, 0, p0, F, -1, simd);
    const bad = factorPanel(F, m, p0, p1, threshold, scratch);
    if (bad >= 0) return bad;
  }
  return -1;
}

/**
 * Panel p0..p1-1 (all earlier columns already subtracted): Crout on the
 * diagonal block, then rows below in groups of four sharing each pivot row.
 */
function factorPanel(F: Float64Array, m: number, p0: number, p1: number, threshold: number, inv: Float64Array): number {
  for (let a = p0; a < p1; a++) {
    const ra = a * m;
    for (let j = p0; j <= a; j++) {
      const rj = j * m;
      let s = F[ra + j];
      for (let t = p0; t < j; t++) s -= F[ra + t] * F[rj + t];
      if (j === a) {
        if (!(s > threshold) || !Number.isFinite(s)) {
          failedPivotValue = s;
          return a;
        }
        const d = Math.sqrt(s);
        F[ra + a] = d;
        inv[a - p0] = 1 / d;
      } else {
        F[ra + j] = s * inv[j - p0];
      }
    }
  }
  let a = p1;
  for (; a + 3 < m; a += 4) {
    const r0 = a * m;
    const r1 = r0 + m;
    const r2 = r1 + m;
    const r3 = r2 + m;
    for (let j = p0; j < p1; j++) {
      const rj = j * m;
      let s0 = F[r0 + j];
      let s1 = F[r1 + j];
      let s2 = F[r2 + j];
      let s3 = F[r3 + j];
      for (let t = p0; t < j; t++) {
        const l = F[rj + t];
        s0 -= F[r0 + t] * l;
        s1 -= F[r1 + t] * l;
        s2 -= F[r2 + t] * l;
        s3 -= F[r3 + t] * l;
      }
      const d = inv[j - p0];
      F[r0 + j] = s0 * d;
      F[r1 + j] = s1 * d;
      F[r2 + j] = s2 * d;
      F[r3 + j] = s3 * d;
    }
  }
  for (; a < m; a++) {
    const ra = a * m;
    for (let j = p0; j < p1; j++) {
      const rj = j * m;
      let s = F[ra + j];
      for (let t = p0; t < j; t++) s -= F[ra + t] * F[rj + t];
      F[ra + j] = s * inv[j - p0];
    }
  }
  return -1;
}

/**
 * For a in [a0, a1) and b in [b0, min(a, b1 - 1)]:
 *     out[row(a) + b] = F[a*m + b] - sum_{t = t0}^{t1 - 1} F[a*m + t] F[b*m + t]
 * where row(a) = a*m when packedBase < 0 (in place, out = F), and otherwise
 * out is the packed row-major lower triangle of the rows and columns from a0
 * on, starting at packedBase: row(a) = packedBase + (a-a0)(a-a0+1)/2 - a0.
 */
export function rankUpdate(
  F: Float64Array,
  m: number,
  a0: number,
  a1: number,
  b0: number,
  b1: number,
  t0: number,
  t1: number,
  out: Float64Array,
  packedBase: number,
  simd: SimdKernel | null = null,
): void {
  const packed = packedBase >= 0;
  const m8 = m * 8;
  let a = a0;
  for (; a + 3 < a1; a += 4) {
    const r0 = a * m;
    const r1 = r0 + m;
    const r2 = r1 + m;
    const r3 = r2 + m;
    let o0: number;
    if (packed) {
      const q = a - a0;
      o0 = packedBase + (q * (q + 1)) / 2 - a0;
    } else {
      o0 = r0;
    }
    // rows of the packed triangle grow by one entry each
    const o1 = packed ? o0 + (a - a0) + 1 : r1;
    const o2 = packed ? o1 + (a - a0) + 2 : r2;
    const o3 = packed ? o2 + (a - a0) + 3 : r3;
    const bFull = a < b1 - 1 ? a : b1 - 1; // columns valid for all four rows
    let b = b0;
    if (simd !== null && bFull > b0) {
      const nPairs = (bFull - b0 + 1) >> 1;
      const fb = simd.fByte;
      const ob = simd.outByte;
      simd.rowBlock4(fb + (r0 + t0) * 8, m8, fb + (b0 * m + t0) * 8, nPairs, t1 - t0, fb + (r0 + b0) * 8, ob + (o0 + b0) * 8, ob + (o1 + b0) * 8, ob + (o2 + b0) * 8, ob + (o3 + b0) * 8);
      b = b0 + 2 * nPairs;
    }
    for (; b + 1 <= bFull; b += 2) {
      const q0 = b * m;
      const q1 = q0 + m;
      let s00 = 0;
      let s01 = 0;
      let s10 = 0;
      let s11 = 0;
      let s20 = 0;
      let s21 = 0;
      let s30 = 0;
      let s31 = 0;
      for (let t = t0; t < t1; t++) {
        const y0 = F[q0 + t];
        const y1 = F[q1 + t];
        const x0 = F[r0 + t];
        s00 += x0 * y0;
        s01 += x0 * y1;
        const x1 = F[r1 + t];
        s10 += x1 * y0;
        s11 += x1 * y1;
        const x2 = F[r2 + t];
        s20 += x2 * y0;
        s21 += x2 * y1;
        const x3 = F[r3 + t];
        s30 += x3 * y0;
        s31 += x3 * y1;
      }
      out[o0 + b] = F[r0 + b] - s00;
      out[o0 + b + 1] = F[r0 + b + 1] - s01;
      out[o1 + b] = F[r1 + b] - s10;
      out[o1 + b + 1] = F[r1 + b + 1] - s11;
      out[o2 + b] = F[r2 + b] - s20;
      out[o2 + b + 1] = F[r2 + b + 1] - s21;
      out[o3 + b] = F[r3 + b] - s30;
      out[o3 + b + 1] = F[r3 + b + 1] - s31;
    }
    for (; b <= bFull; b++) {
      const q0 = b * m;
      let s0 = 0;
      let s1 = 0;
      let s2 = 0;
      let s3 = 0;
      for (let t = t0; t < t1; t++) {
        const y = F[q0 + t];
        s0 += F[r0 + t] * y;
        s1 += F[r1 + t] * y;
        s2 += F[r2 + t] * y;
        s3 += F[r3 + t] * y;
      }
      out[o0 + b] = F[r0 + b] - s0;
      out[o1 + b] = F[r1 + b] - s1;
      out[o2 + b] = F[r2 + b] - s2;
      out[o3 + b] = F[r3 + b] - s3;
    }
    // the small triangle above the diagonal of rows a+1 .. a+3
    const bStart = bFull + 1 > b0 ? bFull + 1 : b0;
    for (let r = 1; r < 4; r++) {
      const ar = a + r;
      const rr = ar * m;
      const oo = r === 1 ? o1 : r === 2 ? o2 : o3;
      const bEnd = ar < b1 - 1 ? ar : b1 - 1;
      for (let bb = bStart; bb <= bEnd; bb++) {
        const q = bb * m;
        let s = 0;
        for (let t = t0; t < t1; t++) s += F[rr + t] * F[q + t];
        out[oo + bb] = F[rr + bb] - s;
      }
    }
  }
  for (; a < a1; a++) {
    const ra = a * m;
    let oa: number;
    if (packed) {
      const q = a - a0;
      oa = packedBase + (q * (q + 1)) / 2 - a0;
    } else {
      oa = ra;
    }
    const bEnd = a < b1 - 1 ? a : b1 - 1;
    let b = b0;
    for (; b + 1 <= bEnd; b += 2) {
      const q0 = b * m;
      const q1 = q0 + m;
      let s0 = 0;
      let s1 = 0;
      for (let t = t0; t < t1; t++) {
        const x = F[ra + t];
        s0 += x * F[q0 + t];
        s1 += x * F[q1 + t];
      }
      out[oa + b] = F[ra + b] - s0;
      out[oa + b + 1] = F[ra + b + 1] - s1;
    }
    for (; b <= bEnd; b++) {
      const q = b * m;
      let s = 0;
      for (let t = t0; t < t1; t++) s += F[ra + t] * F[q + t];
      out[oa + b] = F[ra + b] - s;
    }
  }
}
