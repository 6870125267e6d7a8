/**
 * `npm run bench`: the stage times of raiser at a few sizes, medians of several runs after a
 * warm-up. Speed targets live here, never in the tests.
 *
 *   npm run bench              mesher and whole-analysis tables, solver at 1e4 and 1e5 DOF
 *   npm run bench -- --large   also the mesher at 1e6 triangles, the assembly and the solver at
 *                              5e5 and 1e6 DOF, and a whole 1e6-DOF analysis with its peak memory
 *   npm run bench -- --scaling only the scaling study (every stage, 1e4 to 1e6 DOF, exponents)
 */
import os from 'node:os';
import { performance } from 'node:perf_hooks';
import { buildDomain } from '../geometry/domain.js';
import { generateMesh } from '../mesh/generate.js';
import { benchModel } from './model.js';
import { analyseModel, type Analysis } from '../pipeline/analyse.js';
import type { MeshStats } from '../mesh/types.js';
import { runSolveBench } from './solve.js';
import { runAdaptiveBench } from './adaptive.js';
import { runContactBench } from './contact.js';
import { runProcessBench } from './process.js';
import { runMatrixMarketBench } from './matrixmarket.js';
import { runRepeatedSolveBench } from './repeated.js';
import { runSweepBench } from './sweep.js';
import { runSeriesBench } from './series.js';
import { runPicturesBench } from './pictures.js';
import { runCasesBench } from './cases.js';
import { benchAssembly, benchMesherAt, benchScaling, benchWholeMillion } from './scale.js';
import { median } from './stats.js';


function mb(bytes: number): string {
  return (bytes / 2 ** 20).toFixed(0);
}

function benchMesher(runs: number, log: (s: string) => void, large: boolean): void {
  log('\nMesher (graded constrained Delaunay refinement, minimum angle 25 deg, linear triangles)');
  log('| triangles | vertices | boundary | triangulate | refine | finish + check | total | min angle | peak RSS MB |');
  log('|---|---|---|---|---|---|---|---|---|');
  for (const k of [1, 0.4, 0.2, 0.1, 0.08]) {
    const model = benchModel(k);
    const domain = buildDomain(model.geometry);
    const opts = { order: 1 as const, size: model.mesh!.size, raiserSize: model.mesh!.raiserSize };
    generateMesh(domain, opts); // warm-up
    const rows: MeshStats[] = [];
    for (let r = 0; r < runs; r++) rows.push(generateMesh(domain, opts).stats);
    const t = (f: (s: (typeof rows)[number]) => number) => `${median(rows.map(f)).toFixed(0)} ms`;
    const s = rows[0];
    log(
      `| ${s.triangles} | ${s.vertices} | ${t((x) => x.timeMs.boundary)} | ${t((x) => x.timeMs.triangulate)} | ${t((x) => x.timeMs.refine)} | ${t((x) => x.timeMs.finish)} | ${t((x) => x.timeMs.total)} | ${s.minAngleUnforcedDeg.toFixed(1)} | ${mb(process.memoryUsage().rss)} |`,
    );
  }
  if (large) benchMesherAt(1e6, runs, log);
}

function benchAnalysis(runs: number, log: (s: string) => void): void {
  log('\nWhole analysis (6-node triangles): mesh, stiffness assembly, sparse Cholesky, recovery');
  log('| DOF | elements | mesh | assembly | solve (order + factor + solve) | recovery + Kt | total | nnz(L) | peak RSS MB |');
  log('|---|---|---|---|---|---|---|---|---|');
  for (const k of [1, 0.5, 0.25]) {
    const model = benchModel(k);
    analyseModel(model);
    const rows: Analysis[] = [];
    for (let r = 0; r < runs; r++) rows.push(analyseModel(model));
    const t = (f: (a: (typeof rows)[number]) => number) => `${median(rows.map(f)).toFixed(0)} ms`;
    const a = rows[0];
    log(
      `| ${2 * a.mesh.nNodes} | ${a.mesh.nElements} | ${t((x) => x.timeMs.mesh)} | ${t((x) => x.timeMs.assemble)} | ${t((x) => x.timeMs.solve)} | ${t((x) => x.timeMs.recover)} | ${t((x) => x.timeMs.total)} | ${a.solveStats.nnzL} | ${mb(process.memoryUsage().rss)} |`,
    );
  }
}

function runBench(args: string[], log: (s: string) => void = console.log): void {
  const runs = 3;
  const t0 = performance.now();
  const large = args.includes('--large');
  log(`raiser bench: node ${process.version}, ${process.platform} ${process.arch}, ${os.cpus().length} cores (${os.cpus()[0]?.model ?? 'unknown'}); medians of ${runs} runs after a warm-up`);
  if (args.includes('--scaling')) {
    log('command: npm run bench -- --scaling');
    benchScaling(log);
    log(`\nbench finished in ${((performance.now() - t0) / 1e3).toFixed(1)} s`);
    return;
  }
  log('command: npm run bench' + (large ? ' -- --large' : ''));
  log('\nWhole process from the shell (start-up included; node dist/bench/process.js)');
  runProcessBench(log);
  log('\nPictures and report of the strap example (the -o overhead apart from the solve; node dist/bench/pictures.js)');
  runPicturesBench(log);
  benchMesher(runs, log, large);
  benchAnalysis(runs, log);
  benchAssembly(large ? [1e5, 5e5, 1e6] : [1e5], runs, log);
  log('\nCertified Kt: adaptive series against uniform refinement (same accuracy, true error against the reference)');
  runAdaptiveBench(log);
  log('\nCertified Kt in a fresh process (the analysis only; each run a new Node process, compilation included)');
  runSeriesBench(log);
  log('\nPin contact: a lug (lug template, W 40, d 20 mm) with a rigid pin, against one linear solve of the same mesh');
  runContactBench(log, runs);
  log('\nLoad cases: 4 cases of the bench strap on one mesh (one factorisation) against one case and 4 separate analyses');
  runCasesBench(log, runs);
  log('\nSparse Cholesky on plane-stress stiffness matrices of a jittered rectangle, left edge fixed');
  runSolveBench({ sizes: large ? [1e4, 1e5, 5e5, 1e6] : [1e4, 1e5], runs, log });
  log('\nRepeated solves on one pattern (RepeatedSolver, one thread): the first solve against a repeat with new values');
  runRepeatedSolveBench(log, [1e4, 1e5], runs);
  log('\nSweeps, whole processes (raiser sweep of an invented plate with a hole, certified 1% cases)');
  runSweepBench(log, 5, runs);
  log('\nMatrix Market reading: a ~200 MB stiffness file (block-diagonal copies of a 6-node cantilever matrix, written to the temporary folder and deleted after)');
  runMatrixMarketBench(log, 200, runs);
  if (large) benchWholeMillion(log);
  log(`\nbench finished in ${((performance.now() - t0) / 1e3).toFixed(1)} s`);
}

runBench(process.argv.slice(2));
