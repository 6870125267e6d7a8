import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { raiser } from './support/cli.js';
import { cantileverProblem } from '../src/bench/fixtures/cantilever.js';
import { multiplySymmetric, writeMatrixMarket, writeMatrixMarketArray } from '../src/solve/index.js';

let dir = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'raiser-bench-solve-'));
  const p = cantileverProblem(12, 6, 3);
  writeFileSync(join(dir, 'K.mtx'), writeMatrixMarket(p.matrix, 'plane-stress cantilever 12 x 6'));
  // b = A x for x = 1, 2, 3, ... so the solution is known
  const x = Float64Array.from({ length: p.matrix.n }, (_, i) => i + 1);
  const b = new Float64Array(p.matrix.n);
  multiplySymmetric(p.matrix, x, b);
  writeFileSync(join(dir, 'b.mtx'), writeMatrixMarketArray(b));
  writeFileSync(join(dir, 'short.mtx'), writeMatrixMarketArray(b.subarray(0, 5)));
  writeFileSync(join(dir, 'bad.mtx'), '%%MatrixMarket matrix coordinate complex symmetric\n2 2 1\n1 1 1 0\n');
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('raiser bench-solve', () => {
  it('prints the phases, fill, flops, rate, bytes per nnz(L), peak memory and a small residual with b = A * ones', () => {
    const r = raiser(['bench-solve', join(dir, 'K.mtx')]);
    expect(r.code).toBe(0);
    for (const label of ['ordering', 'symbolic', 'numeric', 'solve', 'nnz(L)', 'flops', 'GFLOP/s', 'bytes/nnz(L)', 'peak RSS', 'residual']) {
      expect(r.stdout).toContain(label);
    }
    const res = Number(/residual\s+(\S+)/.exec(r.stdout)![1]);
    expect(res).toBeLessThan(1e-12);
    expect(r.stdout).toMatch(/order n\s+168\b/);
  });

  it('reads b from a file and reports the same figures as JSON, also for the iterative method', () => {
    const direct = raiser(['bench-solve', join(dir, 'K.mtx'), join(dir, 'b.mtx'), '--json']);
    expect(direct.code).toBe(0);
    const d = JSON.parse(direct.stdout);
    expect(d.stats.method).toBe('cholesky');
    expect(d.stats.relativeResidual).toBeLessThan(1e-12);
    expect(d.stats.nnzL).toBeGreaterThan(d.n);
    const iter = raiser(['bench-solve', join(dir, 'K.mtx'), join(dir, 'b.mtx'), '--json', '--method', 'pcg']);
    expect(iter.code).toBe(0);
    const s = JSON.parse(iter.stdout).stats;
    expect(s.method).toBe('pcg');
    expect(s.iterations).toBeGreaterThan(0);
    expect(s.relativeResidual).toBeLessThanOrEqual(1e-10);
  });

  it('names the problem with a bad or mismatched file (exit 2)', () => {
    const bad = raiser(['bench-solve', join(dir, 'bad.mtx')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr).toMatch(/complex/);
    const short = raiser(['bench-solve', join(dir, 'K.mtx'), join(dir, 'short.mtx')]);
    expect(short.code).toBe(2);
    expect(short.stderr).toMatch(/5 rows, the matrix has order 168/);
    const missing = raiser(['bench-solve', join(dir, 'none.mtx')]);
    expect(missing.code).toBe(2);
    expect(missing.stderr).toMatch(/cannot read/);
  });
});
