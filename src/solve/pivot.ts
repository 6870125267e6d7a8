/**
 * The one numeric failure of a Cholesky factorisation: a pivot that is not safely positive.
 * Both factorisations (numeric.ts, simplicial.ts) throw it; the pipeline turns it into an
 * analysis refusal that names the free node.
 */

/**
 * Thrown when a pivot is not safely positive: pivot <= tol * max diag(A), or
 * not finite. The matrix is then singular (for a stiffness matrix: a rigid
 * body mode left free, a mechanism) or not positive definite.
 */
export class SolverPivotError extends Error {
  override readonly name = 'SolverPivotError';
  constructor(
    /** column of the permuted matrix A(p, p) where the pivot failed */
    readonly permutedIndex: number,
    /** the same column in the caller's numbering (perm[permutedIndex]) */
    readonly originalIndex: number,
    /** the offending pivot value d (before the square root) */
    readonly pivot: number,
    /** the threshold it was compared with (tol * max diag(A)) */
    readonly threshold: number,
  ) {
    super(
      `Cholesky pivot ${pivot} at permuted column ${permutedIndex} (original index ${originalIndex}) ` +
        `is not above ${threshold}: the matrix is singular or not positive definite`,
    );
  }
}

/** Default relative pivot tolerance: pivot must exceed 1e-13 * max diag(A). */
export const DEFAULT_PIVOT_TOLERANCE = 1e-13;
