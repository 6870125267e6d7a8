/**
 * Bench row: repeated solves on one mesh (src/solve/repeated.ts). The first solve pays the
 * fill-reducing ordering, the symbolic analysis, the numeric factorisation and the triangular
 * solves; a repeat with new values of the same pattern (what an active-set contact iteration
 * does) should pay only the last two. The matrices are the plane-stress stiffness of the
 * jittered cantilever fixture (3-node triangles, left edge fixed); the new values are the same
 * matrix with every diagonal entry raised by a tenth (still symmetric positive definite).
 *
 *   npx tsc -p tsconfig.build.json && node dist/bench/repeated.js [--sizes 1e4,1e5] [--runs 3]
 */
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { cantileverProblem } from './fixtures/cantilever.js';
import { randomVector } from './fixtures/random.js';
import { RepeatedSolver } from '../solve/repeated.js';
import type { SymmetricCsc } from '../solve/sparse.js';
import { median } from './stats.js';


/** The values of a with each diagonal entry times 1.1 (the diagonal is the first entry of its column). */
function raisedDiagonal(a: SymmetricCsc): Float64Array {
  const v = a.values.slice();
  for (let j = 0; j < a.n; j++) v[a.colPtr[j]] *= 1.1;
  return v;
}

/**
 * Prints, per size: the first solve split into its stages, a repeat with new values split the
 * same way, and the fractions: the repeat against the first solve, and against the first
 * solve's numeric + solve part (the target: a repeat costs numeric + solve only, so that
 * ratio should be near 1 and ordering + symbolic near 0 in the repeat).
 */
export function runRepeatedSolveBench(log: (s: string) => void, sizes: number[] = [1e4, 1e5], runs = 3): void {
  log('| DOF | first: ordering | symbolic | numeric | solve | total | repeat: numeric | solve | total (ordering + symbolic: none) | repeat / first | repeat / (first numeric + solve) | target |');
  log('|---|---|---|---|---|---|---|---|---|---|---|---|');
  for (const target of sizes) {
    // 2:1 rectangle, nx = 2 ny cells: about 4 ny^2 DOF with 3-node triangles
    const ny = Math.max(2, Math.round(Math.sqrt(target / 4)));
    const a = cantileverProblem(2 * ny, ny, 7).matrix;
    const b = randomVector(a.n, 3);
    const second = raisedDiagonal(a);
    const first = { ordering: [] as number[], symbolic: [] as number[], numeric: [] as number[], solve: [] as number[], total: [] as number[] };
    const again = { numeric: [] as number[], solve: [] as number[], total: [] as number[] };
    for (let r = 0; r <= runs; r++) {
      const t0 = performance.now();
      const solver = new RepeatedSolver(a, { threads: 1 });
      solver.solve(a.values, b, 1);
      const t1 = performance.now();
      const s1 = { ...solver.seconds };
      solver.solve(second, b, 1);
      const t2 = performance.now();
      if (r === 0) continue; // warm-up
      first.ordering.push(s1.ordering);
      first.symbolic.push(s1.symbolic);
      first.numeric.push(s1.numeric);
      first.solve.push(s1.solve);
      first.total.push((t1 - t0) / 1e3);
      again.numeric.push(solver.seconds.numeric - s1.numeric);
      again.solve.push(solver.seconds.solve - s1.solve);
      again.total.push((t2 - t1) / 1e3);
    }
    const f = (x: number[]) => `${median(x).toFixed(3)} s`;
    const ratio = median(again.total) / median(first.total);
    const againstNumeric = median(again.total) / (median(first.numeric) + median(first.solve));
    log(
      `| ${a.n} | ${f(first.ordering)} | ${f(first.symbolic)} | ${f(first.numeric)} | ${f(first.solve)} | ${f(first.total)} | ${f(again.numeric)} | ${f(again.solve)} | ${f(again.total)} | ${ratio.toFixed(2)} | ${againstNumeric.toFixed(2)} | a repeat costs numeric + solve only (ratio <= 1.1): ${againstNumeric <= 1.1 ? 'met' : 'NOT met'} |`,
    );
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const arg = (name: string) => {
    const k = process.argv.indexOf(name);
    return k > 0 ? process.argv[k + 1] : undefined;
  };
  runRepeatedSolveBench(console.log, (arg('--sizes') ?? '1e4,1e5').split(',').map(Number), Number(arg('--runs') ?? 3));
}
