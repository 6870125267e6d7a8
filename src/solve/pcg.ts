/**
 * Preconditioned conjugate gradient for a symmetric positive definite A (lower CSC), with the
 * incomplete Cholesky preconditioner of ic.ts: the iterative fallback of solveSpd for systems
 * whose direct factor would not fit in memory.
 *
 * M. R. Hestenes and E. Stiefel, "Methods of conjugate gradients for solving linear systems",
 * J. Res. Nat. Bur. Standards 49, 1952; the preconditioned form as in Y. Saad, "Iterative
 * Methods for Sparse Linear Systems", 2nd ed., SIAM 2003, algorithm 9.1. The iteration runs on
 * the permuted, unit-diagonal matrix S P A P^T S of the preconditioner (so the matrix-vector
 * products and triangular solves use one cache-friendly ordering), and the stopping test is on
 * the residual of the caller's system, ||b - A x|| / ||b|| (the scaled residual r^ = S P r gives
 * ||r|| = ||S^-1 r^|| at no extra cost). When the recursive residual meets the tolerance the true
 * residual is computed from x; if rounding has made them drift apart, the iteration restarts
 * from the true residual (at most a few times).
 *
 * The relative residual of a stiffness matrix loaded at a few nodes has a floor of about
 * u ||A|| ||x|| / ||b|| (u = 1.1e-16 the unit round-off), which for large meshes lies above
 * 1e-10: no x held in doubles does better. The iteration therefore also stops, converged, when
 * the normwise backward error ||b - A x|| / (||A|| ||x|| + ||b||) (infinity norms) is at most
 * `backwardTolerance` (default 1e-14): x then solves exactly a system within 1e-14 of the given
 * one (M. Arioli, I. S. Duff & D. Ruiz, "Stopping criteria for iterative solvers", SIAM J.
 * Matrix Anal. Appl. 13 (1992) 138-144; N. J. Higham, Accuracy and Stability of Numerical
 * Algorithms, 2nd ed., SIAM 2002, sec. 17.5).
 *
 * Errors are never silent: a direction p with p^T A p <= 0 means A is not positive definite
 * (PcgError with reason 'indefinite'); the iteration limit reached without the tolerance gives
 * PcgError with reason 'not-converged', the iterations done and the residual reached.
 */
import { multiplySymmetric, symmetricInfNorm, type SymmetricCsc } from './sparse.js';
import { applyIncompleteCholesky, type IncompleteCholesky } from './ic.js';

/**
 * Any symmetric positive definite preconditioner for the iteration: it runs on the permuted,
 * scaled matrix `scaled` = S P A P^T S and applies z = M^-1 r there. The incomplete Cholesky
 * factor is one (its own permutation and unit-diagonal scaling); the multigrid of amg.ts runs
 * on A itself (identity permutation, unit scale).
 */
export interface PcgPreconditioner {
  readonly n: number;
  readonly perm: Int32Array;
  readonly scale: Float64Array;
  readonly scaled: SymmetricCsc;
  apply(r: Float64Array, z: Float64Array): void;
}

export class PcgError extends Error {
  override readonly name = 'PcgError';
  constructor(
    readonly reason: 'indefinite' | 'not-converged',
    readonly iterations: number,
    /** ||b - A x|| / ||b|| when the iteration stopped */
    readonly relativeResidual: number,
    message: string,
  ) {
    super(message);
  }
}

export interface PcgOptions {
  /** stop when ||b - A x|| / ||b|| <= tolerance (default 1e-10) */
  readonly tolerance?: number;
  /** iteration limit (default 20000) */
  readonly maxIterations?: number;
  /** also stop when the normwise backward error is at most this (default 1e-14) */
  readonly backwardTolerance?: number;
}

export interface PcgResult {
  readonly x: Float64Array;
  readonly iterations: number;
  /** the true ||b - A x|| / ||b|| of the returned x */
  readonly relativeResidual: number;
  /** the true ||b - A x|| / (||A|| ||x|| + ||b||) of the returned x, infinity norms */
  readonly backwardError: number;
}

function dot(a: Float64Array, b: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) s += a[i] * b[i];
  return s;
}

/** ||S^-1 v|| for v in the scaled space. */
function unscaledNorm(v: Float64Array, scale: Float64Array, n: number): number {
  let s = 0;
  for (let i = 0; i < n; i++) {
    const t = v[i] / scale[i];
    s += t * t;
  }
  return Math.sqrt(s);
}

/**
 * Solves A x = b (one right-hand side of length n) by conjugate gradients preconditioned with
 * the incomplete factor f of A. Throws PcgError when A is found indefinite or the tolerance is
 * not met within the iteration limit.
 */
export function solvePcg(f: IncompleteCholesky | PcgPreconditioner, b: Float64Array, options: PcgOptions = {}): PcgResult {
  const n = f.n;
  const tol = options.tolerance ?? 1e-10;
  const etaTol = options.backwardTolerance ?? 1e-14;
  const maxIt = options.maxIterations ?? 20000;
  const { perm, scale, scaled } = f;
  const precondition = 'apply' in f ? (r: Float64Array, z: Float64Array) => f.apply(r, z) : (r: Float64Array, z: Float64Array) => applyIncompleteCholesky(f, r, z);
  if (b.length !== n) throw new RangeError(`solvePcg: right-hand side length ${b.length}, matrix order ${n}`);
  // scaled right-hand side b^ = S P b; the solution y of A^ y = b^ gives x = P^T S y
  const bs = new Float64Array(n);
  for (let k = 0; k < n; k++) bs[k] = b[perm[k]] * scale[k];
  const bnorm = unscaledNorm(bs, scale, n);
  const x = new Float64Array(n);
  const unscale = (y: Float64Array): Float64Array => {
    for (let k = 0; k < n; k++) x[perm[k]] = y[k] * scale[k];
    return x;
  };
  if (n === 0 || bnorm === 0) return { x, iterations: 0, relativeResidual: 0, backwardError: 0 };
  const normA = symmetricInfNorm(f.scaled, scale); // of the caller's matrix, a_ij = a^_ij / (s_i s_j)
  let bMax = 0;
  for (let k = 0; k < n; k++) bMax = Math.max(bMax, Math.abs(b[k]));
  const y = new Float64Array(n);
  const r = bs.slice();
  const z = new Float64Array(n);
  const p = new Float64Array(n);
  const q = new Float64Array(n);
  let it = 0;
  let rel = 1;
  for (let restart = 0; restart < 4; restart++) {
    precondition(r, z);
    p.set(z);
    let rz = dot(r, z, n);
    while (it < maxIt) {
      multiplySymmetric(scaled, p, q);
      const pq = dot(p, q, n);
      if (!(pq > 0)) {
        const res = trueResidual(scaled, y, bs, scale, q) / bnorm;
        throw new PcgError(
          'indefinite',
          it,
          res,
          `conjugate gradient found a direction of non-positive curvature (p^T A p = ${pq.toExponential(3)}) at iteration ${it + 1}: the matrix is not positive definite`,
        );
      }
      const alpha = rz / pq;
      for (let i = 0; i < n; i++) {
        y[i] += alpha * p[i];
        r[i] -= alpha * q[i];
      }
      it++;
      rel = unscaledNorm(r, scale, n) / bnorm;
      if (rel <= tol) break;
      precondition(r, z);
      const rz1 = dot(r, z, n);
      const beta = rz1 / rz;
      rz = rz1;
      for (let i = 0; i < n; i++) p[i] = z[i] + beta * p[i];
    }
    // the true residual of the iterate, into r for a restart
    multiplySymmetric(scaled, y, q);
    for (let i = 0; i < n; i++) r[i] = bs[i] - q[i];
    rel = unscaledNorm(r, scale, n) / bnorm;
    // backward error in the caller's variables: r = S^-1 r^, x = S y (the permutation does not change max norms)
    let rMax = 0;
    let xMax = 0;
    for (let k = 0; k < n; k++) {
      rMax = Math.max(rMax, Math.abs(r[k] / scale[k]));
      xMax = Math.max(xMax, Math.abs(y[k] * scale[k]));
    }
    const eta = rMax / (normA * xMax + bMax);
    if (rel <= tol || eta <= etaTol) return { x: unscale(y), iterations: it, relativeResidual: rel, backwardError: eta };
    if (it >= maxIt) break;
  }
  throw new PcgError(
    'not-converged',
    it,
    rel,
    `conjugate gradient did not reach the relative residual ${tol.toExponential(1)} (or the backward error ${etaTol.toExponential(1)}) in ${it} iterations (reached ${rel.toExponential(2)})`,
  );
}

function trueResidual(a: SymmetricCsc, y: Float64Array, bs: Float64Array, scale: Float64Array, work: Float64Array): number {
  multiplySymmetric(a, y, work);
  for (let i = 0; i < a.n; i++) work[i] = bs[i] - work[i];
  return unscaledNorm(work, scale, a.n);
}
