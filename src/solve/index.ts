/**
 * The solve stage's public face: what other stages, the benches and the tests use, each name
 * listed. Everything else in this folder is internal to it.
 *
 * The stage is a linear-algebra layer: it imports no other stage but model/errors.ts. Files:
 *   spd.ts                the entry point solveSpd: ordering, analysis, direct or iterative solve
 *   repeated.ts           many solves of one pattern on one symbolic analysis
 *   sparse.ts             symmetric compressed columns: assembly, products, permutations
 *   ordering.ts           what the orderings share; nested-dissection.ts, minimum-degree.ts
 *                         (its leaves) and amd.ts, one ordering each
 *   etree.ts, symbolic.ts symbolic analysis: elimination tree, column counts, supernodes
 *   numeric.ts            supernodal multifrontal factorisation (loop kernels in multifrontal.ts,
 *                         dense kernels in dense.ts and wasm-kernel.ts, the second thread in
 *                         threads.ts); pivot.ts its failure
 *   triangular.ts         the triangular solves with that factor
 *   simplicial.ts         the simple reference factorisation the tests check against
 *   ic.ts, amg.ts, pcg.ts the iterative fallback: preconditioners and conjugate gradients
 *   matrixmarket.ts       reading and writing Matrix Market files
 *   small.ts              small dense symmetric solves
 */

export type { SymmetricCsc } from './sparse.js';
export { adjacencyGraph, assembleSymmetric, extractPrincipal, multiplySymmetric, nnzFull, permuteSymmetric } from './sparse.js';

export type { CsrGraph, Ordering } from './ordering.js';
export { invertPermutation, isPermutation, orderNatural, restrictOrdering } from './ordering.js';
export { orderNestedDissection, orderNestedDissectionNodes } from './nested-dissection.js';
export { orderAmd } from './amd.js';

export type { SymbolicFactor } from './symbolic.js';
export { analyzeCholesky } from './symbolic.js';
export type { CholeskyFactor } from './numeric.js';
export { factorCholesky } from './numeric.js';
export { solveCholesky } from './triangular.js';
export { factorCholeskySimplicial, solveCholeskySimplicial } from './simplicial.js';
export { DEFAULT_PIVOT_TOLERANCE, SolverPivotError } from './pivot.js';
export { SolverThreads } from './threads.js';

export { applyIncompleteCholesky, factorIncompleteCholesky, IncompleteCholeskyError } from './ic.js';
export { PcgError, solvePcg } from './pcg.js';

export type { OrderingMethod, SolveMethod, SolveOptions, SolveStats } from './spd.js';
export { backwardError, estimateFactorBytes, relativeResidual, solveSpd } from './spd.js';
export { RepeatedSolver } from './repeated.js';
export { solveSymmetricSmall } from './small.js';

export { readMatrixMarket, readMatrixMarketArray, writeMatrixMarket, writeMatrixMarketArray } from './matrixmarket.js';
