/**
 * Repeated solves with one sparsity pattern and changing values: the fill-reducing ordering and
 * the symbolic analysis (elimination tree, column counts, supernodes) are done once, and every
 * new set of values costs one numeric factorisation and the triangular solves. This is what an
 * active-set iteration needs (src/fem/contact.ts): each iteration changes which rows are
 * prescribed, which changes values (rows and columns set to the identity times their diagonal)
 * but not the pattern.
 *
 * The second thread (threads.ts) is the caller's `workers` when given; otherwise each solve
 * that needs one starts it and closes it after.
 *
 * When the direct factor would not fit in `maxFactorBytes` (see solveSpd), each solve falls back
 * to solveSpd's iterative method on the new values; nothing is reused then but the decision.
 */
import { performance } from 'node:perf_hooks';
import { analyzeCholeskyWithin, type SymbolicFactor } from './symbolic.js';
import { factorCholesky } from './numeric.js';
import { solveCholesky } from './triangular.js';
import { SolverThreads } from './threads.js';
import { chooseOrdering, defaultMaxFactorBytes, estimateFactorBytes, residualMeasures, solveSpd, type OrderingMethod, type SolveOptions, type SolveStats } from './spd.js';
import type { SymmetricCsc } from './sparse.js';

export class RepeatedSolver {
  readonly n: number;
  readonly method: 'cholesky' | 'pcg';
  private readonly symbolic: SymbolicFactor | null;
  private readonly orderingName: OrderingMethod;
  private readonly nnzA: number;
  private readonly nnzL: number;
  private readonly flops: number;
  private readonly estimatedFactorBytes: number;
  private readonly maxFactorBytes: number;
  /** times summed over every solve, seconds */
  readonly seconds = { ordering: 0, symbolic: 0, numeric: 0, solve: 0 };
  /** numeric factorisations (or iterative solves) done */
  factorisations = 0;
  private last: SolveStats | null = null;

  constructor(
    private readonly pattern: SymmetricCsc,
    private readonly options: SolveOptions = {},
  ) {
    this.n = pattern.n;
    const t0 = performance.now();
    const { ordering, method } = chooseOrdering(pattern, options);
    const t1 = performance.now();
    this.maxFactorBytes = options.maxFactorBytes ?? defaultMaxFactorBytes();
    const analysed = analyzeCholeskyWithin(pattern, ordering, options.method === 'cholesky' ? Infinity : this.maxFactorBytes, options.relax);
    const t2 = performance.now();
    this.symbolic = 'superStart' in analysed ? analysed : null;
    this.estimatedFactorBytes = this.symbolic ? estimateFactorBytes(this.symbolic) : 12 * analysed.nnzL;
    this.method = options.method === 'pcg' || (options.method !== 'cholesky' && this.estimatedFactorBytes > this.maxFactorBytes) ? 'pcg' : 'cholesky';
    this.orderingName = method;
    this.nnzA = analysed.nnzA;
    this.nnzL = analysed.nnzL;
    this.flops = analysed.flops;
    this.seconds.ordering = (t1 - t0) / 1e3;
    this.seconds.symbolic = (t2 - t1) / 1e3;
  }

  /**
   * Solves A x = b for A with the pattern given at construction and these values; b holds
   * nrhs right-hand sides one after another. Throws SolverPivotError (direct) or the iterative
   * solver's errors as solveSpd does.
   */
  solve(values: Float64Array, b: Float64Array, nrhs: number): Float64Array {
    const a: SymmetricCsc = { ...this.pattern, values };
    this.factorisations++;
    if (this.method === 'pcg' || this.symbolic === null) {
      const { x, stats } = solveSpd(a, b, { ...this.options, method: 'pcg' });
      this.seconds.numeric += stats.seconds.numeric;
      this.seconds.solve += stats.seconds.solve;
      this.last = stats;
      return x;
    }
    // the caller's second thread when given; otherwise one for this solve, closed after it
    const own = this.options.threads !== 1 && this.options.workers === undefined ? new SolverThreads() : null;
    const workers = this.options.threads === 1 ? undefined : (this.options.workers ?? own ?? undefined);
    const t0 = performance.now();
    let t1: number;
    let t2: number;
    let factor;
    let x: Float64Array;
    const report = { threads: 1 };
    try {
      factor = factorCholesky(a, this.symbolic, { pivotTolerance: this.options.pivotTolerance, workers });
      t1 = performance.now();
      x = solveCholesky(factor, b, nrhs, { workers, report });
      t2 = performance.now();
    } finally {
      own?.close();
    }
    this.seconds.numeric += (t1 - t0) / 1e3;
    this.seconds.solve += (t2 - t1) / 1e3;
    const s = this.symbolic;
    this.last = {
      n: this.n,
      nnzA: this.nnzA,
      nnzL: this.nnzL,
      flops: this.flops,
      ordering: this.orderingName,
      nSupernodes: s.nSuper,
      storedValues: s.storedValues,
      factorBytes: factor.bytes,
      bytesPerNnzL: s.nnzL > 0 ? factor.bytes / s.nnzL : 0,
      workspaceBytes: 8 * (s.stackPeak + s.maxFront * s.maxFront),
      threads: factor.threads,
      solveThreads: report.threads,
      seconds: { ...this.seconds },
      relativeResidual: NaN,
      backwardError: NaN,
      refinementSteps: 0,
      method: 'cholesky',
      estimatedFactorBytes: this.estimatedFactorBytes,
      maxFactorBytes: this.maxFactorBytes,
      iterations: 0,
      preconditioner: '',
    };
    return x;
  }

  /**
   * The statistics of the last solve, with the times summed over all of them and the residual
   * measures of x for A (these values) and b (one right-hand side).
   */
  stats(values: Float64Array, x: Float64Array, b: Float64Array): SolveStats {
    if (!this.last) throw new RangeError('RepeatedSolver.stats: nothing solved yet');
    const measured = residualMeasures({ ...this.pattern, values }, x, b, 1);
    return { ...this.last, seconds: { ...this.seconds }, relativeResidual: measured.relative, backwardError: measured.backward };
  }
}
