/**
 * The cost of load cases (model.loadCases): N cases solved together on one mesh (one
 * factorisation of the stiffness, N triangular solves, N recoveries: analyseCasesOnMesh)
 * against one case alone and against N separate analyses of the same mesh. The cases are N
 * named cases of the bench strap (src/bench/model.ts), pulled by 1, 2, ... times its load: the
 * work per case does not depend on the value. Medians of the runs after a warm-up.
 *
 * The target: an extra case costs the triangular solves only (and its own recovery of stresses,
 * peak, sections and Kt, which no sharing can save): checked as "extra case <= 1.5 x (triangular
 * solve + recovery of one case)", the 1.5 leaving room for timing noise on a shared machine.
 *
 *   npm run bench            (one of its tables)
 */
import { benchModel } from './model.js';
import { analyseCasesOnMesh, analyseOnMesh, prepareLoadCases, prepareModel, type Analysis } from '../pipeline/analyse.js';
import type { Load, Model } from '../model/schema.js';
import { median } from './stats.js';


/** The bench strap at size factor k with n named cases, case i pulled by i times the bench load. */
function casesModel(k: number, n: number): Model {
  const { loads, ...rest } = benchModel(k);
  const scaled = (i: number): Load[] => loads!.map((l) => (l.type === 'force' ? { ...l, fx: i * (l.fx ?? 0), fy: i * (l.fy ?? 0) } : l));
  return { ...rest, loadCases: Array.from({ length: n }, (_v, i) => ({ name: `pull x${i + 1}`, loads: scaled(i + 1) })) };
}

export function runCasesBench(log: (s: string) => void, runs: number, sizeFactors: readonly number[] = [1, 0.5], n = 4): void {
  log('target: an extra case costs the triangular solves only (and its own recovery); met when extra case <= 1.5 x (triangular solve + recovery of one case)');
  log(`| DOF | one case | ${n} cases together | ${n} separate | per extra case | triangular solve + recovery | factorisations (together) | target |`);
  log('|---|---|---|---|---|---|---|---|');
  for (const k of sizeFactors) {
    const cases = prepareLoadCases(prepareModel(casesModel(k, n)));
    const one = (): Analysis => analyseOnMesh(cases[0]);
    const together = (): Analysis[] => analyseCasesOnMesh(cases);
    const separate = (): Analysis[] => cases.map((c) => analyseOnMesh(c));
    one(); // warm-up
    together();
    const tOne: number[] = [];
    const tTogether: number[] = [];
    const tSeparate: number[] = [];
    const tSolveRecover: number[] = [];
    let last: Analysis[] = [];
    // interleaved, so a change in the machine's load falls on all three alike
    for (let r = 0; r < runs; r++) {
      let t = performance.now();
      const a = one();
      tOne.push(performance.now() - t);
      tSolveRecover.push(1e3 * a.solveStats.seconds.solve + a.timeMs.recover);
      t = performance.now();
      last = together();
      tTogether.push(performance.now() - t);
      t = performance.now();
      separate();
      tSeparate.push(performance.now() - t);
    }
    const extra = (median(tTogether) - median(tOne)) / (n - 1);
    const budget = median(tSolveRecover);
    log(
      `| ${2 * last[0].mesh.nNodes} | ${median(tOne).toFixed(0)} ms | ${median(tTogether).toFixed(0)} ms | ${median(tSeparate).toFixed(0)} ms | ${extra.toFixed(0)} ms | ${budget.toFixed(0)} ms | ${last[0].sharedSolve?.factorisations ?? '-'} | ${extra <= 1.5 * budget ? 'met' : 'NOT met'} |`,
    );
  }
}
