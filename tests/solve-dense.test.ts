import { describe, it, expect } from 'vitest';
import { factorFrontPivots, rankUpdate, PANEL } from '../src/solve/dense.js';
import { sharedWasmHeap, wasmKernelAvailable } from '../src/solve/wasm-kernel.js';
import { seededRandom } from '../src/bench/fixtures/random.js';

function randomFront(F: Float64Array, m: number, seed: number): void {
  const rnd = seededRandom(seed);
  for (let a = 0; a < m; a++) {
    for (let b = 0; b < a; b++) F[a * m + b] = 2 * rnd() - 1;
    F[a * m + a] = m + rnd(); // diagonally dominant: positive definite
  }
}

describe('dense front kernels', () => {
  it('the WebAssembly SIMD kernel compiles on this Node version', () => {
    expect(wasmKernelAvailable()).toBe(true);
  });

  it('the SIMD rank update equals the JavaScript one, in place and packed, for odd and even inner lengths', () => {
    const heap = sharedWasmHeap()!;
    for (const [m, a0, b1, t0, t1] of [
      [23, 5, 23, 0, 5],
      [40, 9, 40, 0, 9],
      [37, 12, 20, 4, 12],
      [50, 17, 33, 1, 16],
      [9, 2, 9, 0, 1],
    ]) {
      const H = heap.reserve(3 * m * m)!;
      const F = H.subarray(0, m * m);
      const out = H.subarray(m * m, 2 * m * m);
      randomFront(F, m, m + a0);
      const Fjs = F.slice();
      const outJs = new Float64Array(m * m);
      const packed = b1 === m; // the packed form is used for the full trailing triangle
      if (packed) {
        rankUpdate(Fjs, m, a0, m, a0, m, t0, t1, outJs, 0);
        rankUpdate(F, m, a0, m, a0, m, t0, t1, out, 0, { rowBlock4: heap.rowBlock4, fByte: 0, outByte: m * m * 8 });
        const u = m - a0;
        for (let q = 0; q < (u * (u + 1)) / 2; q++) expect(Math.abs(out[q] - outJs[q])).toBeLessThan(1e-12);
      } else {
        rankUpdate(Fjs, m, a0, m, a0, b1, t0, t1, Fjs, -1);
        rankUpdate(F, m, a0, m, a0, b1, t0, t1, F, -1, { rowBlock4: heap.rowBlock4, fByte: 0, outByte: 0 });
        for (let q = 0; q < m * m; q++) expect(Math.abs(F[q] - Fjs[q])).toBeLessThan(1e-12);
      }
    }
  });

  it('the WebAssembly extend-add and lower-triangle zeroing do exactly what their JavaScript definitions say', () => {
    const heap = sharedWasmHeap()!;
    const m = 13;
    const mc = 6;
    const H = heap.reserve(m * m + 64 + 16)!;
    const relByte = (m * m + 64) * 8;
    const rel = new Int32Array(H.buffer, relByte, mc);
    rel.set([1, 2, 5, 6, 10, 12]);
    const rnd = seededRandom(4);
    for (let q = 0; q < m * m; q++) H[q] = rnd();
    const F0 = H.slice(0, m * m);
    for (let q = 0; q < (mc * (mc + 1)) / 2; q++) H[m * m + q] = q + 1;
    heap.extendAdd(0, m * 8, m * m * 8, relByte, mc);
    const expected = F0.slice();
    let u = 0;
    for (let a = 0; a < mc; a++) for (let b = 0; b <= a; b++) expected[rel[a] * m + rel[b]] += ++u;
    expect(Array.from(H.subarray(0, m * m))).toEqual(Array.from(expected));
    heap.zeroLower(0, m * 8);
    for (let a = 0; a < m; a++) {
      for (let b = 0; b < m; b++) expect(H[a * m + b]).toBe(b <= a ? 0 : expected[a * m + b]);
    }
  });

  it('factorFrontPivots over several panels reproduces the front: L L^T equals the pivot block and L21 L11^T the rows below', () => {
    const m = 3 * PANEL + 7;
    const k = 2 * PANEL + 5;
    const F = new Float64Array(m * m);
    randomFront(F, m, 3);
    const F0 = F.slice();
    expect(factorFrontPivots(F, m, k, 0, new Float64Array(PANEL))).toBe(-1);
    let worst = 0;
    for (let a = 0; a < m; a++) {
      for (let b = 0; b <= Math.min(a, k - 1); b++) {
        let s = 0;
        for (let t = 0; t <= b; t++) s += F[a * m + t] * F[b * m + t];
        worst = Math.max(worst, Math.abs(s - F0[a * m + b]) / m);
      }
    }
    expect(worst).toBeLessThan(1e-14);
    // the trailing block is left untouched
    for (let a = k; a < m; a++) for (let b = k; b <= a; b++) expect(F[a * m + b]).toBe(F0[a * m + b]);
  });
});
