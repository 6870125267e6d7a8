import { describe, it, expect } from 'vitest';
import {
  adjacencyGraph,
  analyzeCholesky,
  applyIncompleteCholesky,
  assembleSymmetric,
  estimateFactorBytes,
  factorIncompleteCholesky,
  IncompleteCholeskyError,
  multiplySymmetric,
  orderAmd,
  orderNatural,
  PcgError,
  solvePcg,
  solveSpd,
} from '../src/solve/index.js';
import { cantileverProblem } from '../src/bench/fixtures/cantilever.js';
import { gridLaplacian, randomSpd, relativeMaxDifference } from './support/matrices.js';
import { randomVector } from '../src/bench/fixtures/random.js';

describe('incomplete Cholesky IC(p)', () => {
  it('with an unlimited fill level equals the complete factor: PCG converges in one iteration', () => {
    const p = cantileverProblem(8, 4, 2);
    const ic = factorIncompleteCholesky(p.matrix, orderAmd(adjacencyGraph(p.matrix)), { fillLevel: 240 });
    const b = randomVector(p.matrix.n, 5);
    const r = solvePcg(ic, b);
    expect(r.iterations).toBe(1);
    expect(r.relativeResidual).toBeLessThan(1e-12);
  });

  it('IC(0) keeps exactly the pattern of A, and more fill levels keep more entries', () => {
    const a = gridLaplacian(7, 6);
    const ord = orderNatural(a.n);
    const nnz = [0, 1, 2, 3].map((p) => factorIncompleteCholesky(a, ord, { fillLevel: p }).nnz);
    expect(nnz[0]).toBe(a.colPtr[a.n]);
    for (let k = 1; k < nnz.length; k++) expect(nnz[k]).toBeGreaterThan(nnz[k - 1]);
  });

  it('IC(0) of the 5-point Laplacian in natural order matches the recurrence of Meijerink and van der Vorst', () => {
    // For the 5-point stencil IC(0) has no fill, and the pivots obey
    // d_j = a_jj - (a_j,j-1)^2 / d_(j-1) - (a_j,j-nx)^2 / d_(j-nx) on the unit-diagonal matrix.
    const nx = 5;
    const a = gridLaplacian(nx, 4);
    const ic = factorIncompleteCholesky(a, orderNatural(a.n), { fillLevel: 0 });
    const d = new Float64Array(a.n);
    for (let j = 0; j < a.n; j++) {
      let v = 1;
      if (j % nx > 0) v -= 0.0625 / d[j - 1];
      if (j >= nx) v -= 0.0625 / d[j - nx];
      d[j] = v;
    }
    for (let j = 0; j < a.n; j++) expect(ic.values[ic.colPtr[j]] ** 2).toBeCloseTo(d[j], 14);
  });

  it('applies (L L^T)^-1: L L^T z reproduces r on the complete factor', () => {
    const a = randomSpd(30, 0.2, 4);
    const ic = factorIncompleteCholesky(a, orderNatural(a.n), { fillLevel: 240 });
    const r = randomVector(a.n, 9);
    const z = new Float64Array(a.n);
    applyIncompleteCholesky(ic, r, z);
    const back = new Float64Array(a.n);
    multiplySymmetric(ic.scaled, z, back);
    expect(relativeMaxDifference(back, r)).toBeLessThan(1e-12);
  });

  it('refuses a matrix with a non-positive diagonal entry, naming it', () => {
    const a = assembleSymmetric(2, Int32Array.of(0, 1), Int32Array.of(0, 1), Float64Array.of(1, -2), 'triangle');
    expect(() => factorIncompleteCholesky(a, orderNatural(2))).toThrow(IncompleteCholeskyError);
    expect(() => factorIncompleteCholesky(a, orderNatural(2))).toThrow(/not positive definite/);
  });
});

describe('preconditioned conjugate gradient', () => {
  it('agrees with the direct solve on a plane-stress stiffness matrix to the tolerance', () => {
    const p = cantileverProblem(30, 15, 11);
    const b = randomVector(p.matrix.n, 3);
    const direct = solveSpd(p.matrix, b, { method: 'cholesky' });
    const iter = solveSpd(p.matrix, b, { method: 'pcg' });
    expect(direct.stats.method).toBe('cholesky');
    expect(iter.stats.method).toBe('pcg');
    expect(iter.factor).toBeNull();
    expect(iter.stats.relativeResidual).toBeLessThanOrEqual(1e-10);
    expect(iter.stats.iterations).toBeGreaterThan(1);
    // ||x - x*|| <= cond(A) ||r|| / ||b|| ||x*||; the tolerance and this matrix's conditioning leave about 1e-6
    expect(relativeMaxDifference(iter.x, direct.x)).toBeLessThan(1e-6);
  });

  it('solves several right-hand sides and sums their iterations', () => {
    const p = cantileverProblem(10, 5, 1);
    const n = p.matrix.n;
    const b = new Float64Array(2 * n);
    b.set(randomVector(n, 1));
    b.set(randomVector(n, 2), n);
    const one = solveSpd(p.matrix, b.subarray(0, n), { method: 'pcg' });
    const two = solveSpd(p.matrix, b, { method: 'pcg' });
    expect(two.stats.iterations).toBeGreaterThan(one.stats.iterations);
    expect(two.stats.relativeResidual).toBeLessThanOrEqual(1e-10);
    expect(Array.from(two.x.subarray(0, n))).toEqual(Array.from(one.x));
  });

  it('needs far fewer iterations with IC(5) than with IC(0)', () => {
    const p = cantileverProblem(40, 20, 4);
    const b = randomVector(p.matrix.n, 8);
    const it0 = solveSpd(p.matrix, b, { method: 'pcg', pcg: { fillLevel: 0 } }).stats.iterations;
    const it5 = solveSpd(p.matrix, b, { method: 'pcg', pcg: { fillLevel: 5 } }).stats.iterations;
    expect(it5).toBeLessThan(0.6 * it0);
  });

  it('an indefinite matrix gives a clear error, not a result', () => {
    // positive diagonal, but [[1, 2], [2, 1]] blocks have eigenvalue -1
    const m = 20;
    const rows: number[] = [];
    const cols: number[] = [];
    const vals: number[] = [];
    for (let i = 0; i < m; i++) {
      rows.push(i);
      cols.push(i);
      vals.push(1);
      if (i % 2 === 1) {
        rows.push(i);
        cols.push(i - 1);
        vals.push(2);
      }
    }
    const a = assembleSymmetric(m, Int32Array.from(rows), Int32Array.from(cols), Float64Array.from(vals), 'triangle');
    const b = randomVector(m, 1);
    let err: unknown;
    try {
      solveSpd(a, b, { method: 'pcg', pcg: { fillLevel: 0 } });
    } catch (e) {
      err = e;
    }
    expect(err instanceof PcgError || err instanceof IncompleteCholeskyError).toBe(true);
    expect((err as Error).message).toMatch(/not positive definite/);
  });

  it('the iteration limit gives a not-converged error with the residual reached', () => {
    const p = cantileverProblem(20, 10, 2);
    const b = randomVector(p.matrix.n, 4);
    let err: unknown;
    try {
      solveSpd(p.matrix, b, { method: 'pcg', pcg: { fillLevel: 0, maxIterations: 3 } });
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(PcgError);
    const pe = err as PcgError;
    expect(pe.reason).toBe('not-converged');
    expect(pe.iterations).toBe(3);
    expect(pe.relativeResidual).toBeGreaterThan(1e-10);
    expect(pe.message).toMatch(/did not reach/);
  });
});

describe('automatic choice between Cholesky and PCG', () => {
  it('switches to PCG exactly when the estimated factor memory exceeds maxFactorBytes', () => {
    const p = cantileverProblem(16, 8, 6);
    const a = p.matrix;
    const est = estimateFactorBytes(analyzeCholesky(a, orderAmd(adjacencyGraph(a))));
    const b = randomVector(a.n, 2);
    const at = solveSpd(a, b, { maxFactorBytes: est });
    const below = solveSpd(a, b, { maxFactorBytes: est - 1 });
    expect(at.stats.estimatedFactorBytes).toBe(est);
    expect(at.stats.method).toBe('cholesky');
    expect(at.stats.iterations).toBe(0);
    expect(below.stats.method).toBe('pcg');
    expect(below.stats.iterations).toBeGreaterThan(0);
    expect(below.stats.relativeResidual).toBeLessThanOrEqual(1e-10);
    expect(relativeMaxDifference(below.x, at.x)).toBeLessThan(1e-6);
  });

  it('a factor far beyond the limit is judged from the column counts alone, without building its structure', () => {
    const p = cantileverProblem(30, 12, 2);
    const a = p.matrix;
    const full = analyzeCholesky(a, orderAmd(adjacencyGraph(a)));
    const b = randomVector(a.n, 3);
    // a limit below even 12 bytes per nonzero of L
    const { stats } = solveSpd(a, b, { maxFactorBytes: 6 * full.nnzL, ordering: 'amd' });
    expect(stats.method).toBe('pcg');
    expect(stats.nnzL).toBe(full.nnzL);
    expect(stats.flops).toBe(full.flops);
    expect(stats.nnzA).toBe(full.nnzA);
    expect(stats.nSupernodes).toBe(0);
    expect(stats.estimatedFactorBytes).toBe(12 * full.nnzL);
    expect(stats.estimatedFactorBytes).toBeLessThanOrEqual(estimateFactorBytes(full));
  });

  it('the estimate covers the factor the direct solve then holds', () => {
    const p = cantileverProblem(30, 15, 2);
    const { stats } = solveSpd(p.matrix, randomVector(p.matrix.n, 1), { method: 'cholesky' });
    expect(stats.estimatedFactorBytes).toBeGreaterThanOrEqual(stats.factorBytes);
    expect(stats.estimatedFactorBytes).toBeLessThan(3 * (stats.factorBytes + stats.workspaceBytes));
  });
});

describe('iterative refinement after the direct solve', () => {
  it('is skipped when the first residual is small, and one forced step does not worsen the residual', () => {
    const p = cantileverProblem(20, 10, 3);
    const b = randomVector(p.matrix.n, 6);
    const plain = solveSpd(p.matrix, b, { method: 'cholesky' });
    expect(plain.stats.refinementSteps).toBe(0);
    const forced = solveSpd(p.matrix, b, { method: 'cholesky', refineAbove: 0 });
    expect(forced.stats.refinementSteps).toBeGreaterThanOrEqual(1);
    expect(forced.stats.relativeResidual).toBeLessThanOrEqual(plain.stats.relativeResidual);
    expect(relativeMaxDifference(forced.x, plain.x)).toBeLessThan(1e-10);
  });
});

describe('PCG stopping on the backward error', () => {
  // Arioli, Duff & Ruiz, SIAM J. Matrix Anal. Appl. 13 (1992): once the normwise backward error
  // is at round-off, no further iteration can improve x in working precision.
  it('a relative-residual tolerance below what doubles can reach still converges, on the backward error, to the direct solution', () => {
    const p = cantileverProblem(40, 10, 2);
    const a = p.matrix;
    const ic = factorIncompleteCholesky(a, orderAmd(adjacencyGraph(a)), { fillLevel: 1 });
    const b = randomVector(a.n, 9);
    const r = solvePcg(ic, b, { tolerance: 1e-30 });
    expect(r.backwardError).toBeLessThanOrEqual(1e-14);
    expect(r.relativeResidual).toBeGreaterThan(1e-30);
    const direct = solveSpd(a, b, { method: 'cholesky' });
    expect(relativeMaxDifference(r.x, direct.x)).toBeLessThan(1e-8);
    // with the backward test switched off the same request cannot be met, and says so
    expect(() => solvePcg(ic, b, { tolerance: 1e-30, backwardTolerance: 0, maxIterations: 400 })).toThrow(PcgError);
  });

  it('solveSpd reports the backward error of both methods', () => {
    const p = cantileverProblem(20, 6, 2);
    const b = randomVector(p.matrix.n, 4);
    for (const method of ['cholesky', 'pcg'] as const) {
      const { stats } = solveSpd(p.matrix, b, { method });
      expect(stats.backwardError).toBeGreaterThan(0);
      // the direct solve is backward stable (a small multiple of 1.1e-16); PCG stops at a relative residual of 1e-10
      expect(stats.backwardError).toBeLessThan(method === 'cholesky' ? 1e-15 : 1e-12);
    }
  });
});
