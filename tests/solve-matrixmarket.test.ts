import { describe, it, expect } from 'vitest';
import { readMatrixMarket, readMatrixMarketArray, writeMatrixMarket, writeMatrixMarketArray } from '../src/solve/index.js';
import { cantileverProblem } from '../src/bench/fixtures/cantilever.js';
import { randomVector } from '../src/bench/fixtures/random.js';

describe('Matrix Market', () => {
  it('a symmetric coordinate matrix round-trips exactly', () => {
    const a = cantileverProblem(6, 3, 2).matrix;
    const text = writeMatrixMarket(a, 'plane-stress cantilever\nsecond comment line');
    expect(text.startsWith('%%MatrixMarket matrix coordinate real symmetric\n% plane-stress cantilever\n')).toBe(true);
    const b = readMatrixMarket(text);
    expect(b.n).toBe(a.n);
    expect(Array.from(b.colPtr)).toEqual(Array.from(a.colPtr));
    expect(Array.from(b.rowIndex)).toEqual(Array.from(a.rowIndex));
    expect(Array.from(b.values)).toEqual(Array.from(a.values));
  });

  it('a general file of a symmetric matrix is read as its lower triangle', () => {
    const text = [
      '%%MatrixMarket matrix coordinate real general',
      '% a 3 x 3 symmetric matrix given in full',
      '3 3 7',
      '1 1 4',
      '2 1 -1',
      '1 2 -1',
      '2 2 4.5e0',
      '3 2 -2',
      '2 3 -2',
      '3 3 1E1',
      '',
    ].join('\n');
    const a = readMatrixMarket(text);
    expect(Array.from(a.colPtr)).toEqual([0, 2, 4, 5]);
    expect(Array.from(a.rowIndex)).toEqual([0, 1, 1, 2, 2]);
    expect(Array.from(a.values)).toEqual([4, -1, 4.5, -2, 10]);
  });

  it('a general file of a non-symmetric matrix is rejected', () => {
    const asym = '%%MatrixMarket matrix coordinate real general\n2 2 3\n1 1 1\n2 1 3\n1 2 2\n2 2 1\n';
    expect(() => readMatrixMarket(asym.replace('2 2 3', '2 2 4'))).toThrow(/not symmetric/);
    const missing = '%%MatrixMarket matrix coordinate real general\n2 2 2\n1 1 1\n2 1 3\n';
    expect(() => readMatrixMarket(missing)).toThrow(/not symmetric/);
  });

  it('unsupported fields, symmetries, and bad sizes or indices are rejected with a message', () => {
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate complex symmetric\n1 1 1\n1 1 1 0\n')).toThrow(/complex/);
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real skew-symmetric\n1 1 0\n')).toThrow(/skew/);
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real symmetric\n2 3 0\n')).toThrow(/square/);
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real symmetric\n2 2 1\n3 1 1\n')).toThrow(/out of range/);
    expect(() => readMatrixMarket('%%MatrixMarket matrix coordinate real symmetric\n2 2 2\n1 1 1\n')).toThrow(/end of file/);
    expect(() => readMatrixMarket('not a matrix market file')).toThrow(/MatrixMarket/);
  });

  it('a dense vector round-trips exactly, including extreme values', () => {
    const v = randomVector(50, 3);
    v[0] = 1e-300;
    v[1] = -1.7976931348623157e308;
    v[2] = 0.1 + 0.2;
    const text = writeMatrixMarketArray(v);
    const r = readMatrixMarketArray(text);
    expect(r.rows).toBe(50);
    expect(r.cols).toBe(1);
    expect(Array.from(r.values)).toEqual(Array.from(v));
  });

  it('an array block with several columns is read column-major', () => {
    const r = readMatrixMarketArray('%%MatrixMarket matrix array real general\n% comment\n2 2\n1\n2\n3\n4\n');
    expect(r.rows).toBe(2);
    expect(r.cols).toBe(2);
    expect(Array.from(r.values)).toEqual([1, 2, 3, 4]);
  });
});
