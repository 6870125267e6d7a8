import { describe, it, expect } from 'vitest';
import { Matrix } from 'ml-matrix';
import {
  adjacencyGraph,
  assembleSymmetric,
  extractPrincipal,
  invertPermutation,
  multiplySymmetric,
  nnzFull,
  permuteSymmetric,
  type SymmetricCsc,
} from '../src/solve/index.js';
import { randomSpd } from './support/matrices.js';
import { randomVector, seededRandom } from '../src/bench/fixtures/random.js';

function toDense(a: SymmetricCsc): Matrix {
  const m = Matrix.zeros(a.n, a.n);
  for (let j = 0; j < a.n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      m.set(a.rowIndex[p], j, a.values[p]);
      m.set(j, a.rowIndex[p], a.values[p]);
    }
  }
  return m;
}

function expectSortedLower(a: SymmetricCsc): void {
  for (let j = 0; j < a.n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      expect(a.rowIndex[p]).toBeGreaterThanOrEqual(j);
      if (p > a.colPtr[j]) expect(a.rowIndex[p]).toBeGreaterThan(a.rowIndex[p - 1]);
    }
  }
}

describe('assembleSymmetric', () => {
  it('sums duplicate triplets and stores the lower triangle with sorted rows', () => {
    // full-matrix triplets in scrambled order, (2,0) given twice
    const rows = Int32Array.from([2, 0, 1, 0, 2, 1, 2, 0, 2]);
    const cols = Int32Array.from([0, 0, 1, 2, 2, 0, 0, 1, 1]);
    const vals = Float64Array.from([1.5, 4, 5, -9, 6, -1, 0.5, -1, 7]);
    const a = assembleSymmetric(3, rows, cols, vals, 'full');
    expectSortedLower(a);
    const d = toDense(a);
    expect(d.to2DArray()).toEqual([
      [4, -1, 2],
      [-1, 5, 7],
      [2, 7, 6],
    ]);
    expect(nnzFull(a)).toBe(9);
  });

  it("'triangle' mode folds an upper entry onto its mirror and sums it with the lower one", () => {
    const a = assembleSymmetric(2, Int32Array.from([0, 1, 0, 1]), Int32Array.from([1, 0, 0, 1]), Float64Array.from([1, 2, 3, 4]), 'triangle');
    expect(toDense(a).to2DArray()).toEqual([
      [3, 3],
      [3, 4],
    ]);
  });

  it('rejects an index outside the matrix and mismatched lengths', () => {
    expect(() => assembleSymmetric(2, Int32Array.from([2]), Int32Array.from([0]), Float64Array.from([1]), 'full')).toThrow(RangeError);
    expect(() => assembleSymmetric(2, Int32Array.from([0, 1]), Int32Array.from([0]), Float64Array.from([1]), 'full')).toThrow(RangeError);
  });

  it('does not modify its input arrays', () => {
    const rows = Int32Array.from([0, 1, 0]);
    const cols = Int32Array.from([1, 0, 0]);
    const vals = Float64Array.from([1, 1, 2]);
    assembleSymmetric(2, rows, cols, vals, 'triangle');
    expect(Array.from(rows)).toEqual([0, 1, 0]);
    expect(Array.from(cols)).toEqual([1, 0, 0]);
    expect(Array.from(vals)).toEqual([1, 1, 2]);
  });
});

describe('symmetric matrix operations', () => {
  const a = randomSpd(40, 0.15, 11);
  const d = toDense(a);

  it('multiplySymmetric equals the dense product', () => {
    const x = randomVector(40, 12);
    const y = new Float64Array(40);
    multiplySymmetric(a, x, y);
    const yd = d.mmul(Matrix.columnVector(Array.from(x))).to1DArray();
    for (let i = 0; i < 40; i++) expect(y[i]).toBeCloseTo(yd[i], 12);
  });

  it('extractPrincipal keeps exactly the rows and columns of the mask, in order', () => {
    const rnd = seededRandom(5);
    const keep = new Uint8Array(40);
    for (let i = 0; i < 40; i++) keep[i] = rnd() < 0.6 ? 1 : 0;
    const sub = extractPrincipal(a, keep);
    expectSortedLower(sub.matrix);
    const idx = Array.from(sub.oldOfNew);
    expect(idx).toEqual(Array.from({ length: 40 }, (_, i) => i).filter((i) => keep[i]));
    const ds = toDense(sub.matrix);
    for (let r = 0; r < idx.length; r++) {
      expect(sub.newOfOld[idx[r]]).toBe(r);
      for (let c = 0; c < idx.length; c++) expect(ds.get(r, c)).toBe(d.get(idx[r], idx[c]));
    }
    for (let i = 0; i < 40; i++) if (!keep[i]) expect(sub.newOfOld[i]).toBe(-1);
  });

  it('permuteSymmetric gives C(k, l) = A(perm[k], perm[l]) with sorted rows', () => {
    const rnd = seededRandom(9);
    const perm = Int32Array.from({ length: 40 }, (_, i) => i);
    for (let i = 39; i > 0; i--) {
      const j = Math.floor(rnd() * (i + 1));
      [perm[i], perm[j]] = [perm[j], perm[i]];
    }
    const c = permuteSymmetric(a, perm, invertPermutation(perm));
    expectSortedLower(c);
    const dc = toDense(c);
    for (let k = 0; k < 40; k++) for (let l = 0; l < 40; l++) expect(dc.get(k, l)).toBe(d.get(perm[k], perm[l]));
  });

  it('adjacencyGraph lists each off-diagonal neighbour once in both directions', () => {
    const g = adjacencyGraph(a);
    let count = 0;
    for (let i = 0; i < 40; i++) {
      const nb = Array.from(g.idx.subarray(g.ptr[i], g.ptr[i + 1]));
      expect(new Set(nb).size).toBe(nb.length);
      for (const j of nb) {
        expect(j).not.toBe(i);
        expect(d.get(i, j)).not.toBe(0);
      }
      count += nb.length;
    }
    expect(count).toBe(nnzFull(a) - 40);
  });
});
