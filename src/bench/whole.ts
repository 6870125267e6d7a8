/**
 * One whole analysis of the bench strap (src/bench/run.ts, benchModel) at about a given number
 * of degrees of freedom, 6-node triangles by default, in a process of its own so that its peak
 * memory is its own: prints one JSON line with the stage times (medians of the timed runs) and
 * the process's peak resident memory.
 *
 *   node dist/bench/whole.js --dof 1e6 [--runs 1] [--warmups 0] [--element linear]
 *
 * Stages: mesh (size field, boundary, triangulation, refinement, quadratic upgrade, mesh check),
 * assembly (element stiffness, loads and supports), the solver's ordering, symbolic analysis,
 * numeric factorisation and triangular solves, and recovery (stresses, peak, sections, Kt).
 */
import { fileURLToPath } from 'node:url';
import { benchModel } from './model.js';
import { peakResidentBytes } from './memory.js';
import { analyseModel, type Analysis } from '../pipeline/analyse.js';
import { buildDomain } from '../geometry/domain.js';
import { generateMesh } from '../mesh/generate.js';
import { median } from './stats.js';

/** DOF of the bench strap with 6-node triangles at sizeFactor 1 (measured: 21,876). */
const DOF_AT_UNIT_SIZE = { quadratic: 21876, linear: 5600 } as const;

export interface WholeRow {
  dof: number;
  elements: number;
  element: 'linear' | 'quadratic';
  seconds: { mesh: number; assembly: number; ordering: number; symbolic: number; numeric: number; solve: number; recovery: number; total: number };
  solver: { method: string; nnzL: number; flops: number; iterations: number; relativeResidual: number };
  peakRssBytes: number;
  runs: number;
}


/**
 * The size factor of benchModel that gives about `target` of what `count` counts (DOF,
 * triangles), within about 5 %: secant steps on log(count) against log(size factor).
 */
export function sizeFactorFor(target: number, guess: number, count: (k: number) => number): number {
  let k0 = guess;
  let d0 = count(k0);
  let slope = -1.5; // d log count / d log k, a first guess
  for (let step = 0; step < 5 && Math.abs(Math.log(d0 / target)) > 0.05; step++) {
    const k1 = k0 * Math.exp(Math.log(target / d0) / slope);
    const d1 = count(k1);
    if (d1 !== d0 && k1 !== k0) slope = Math.min(-0.5, Math.log(d1 / d0) / Math.log(k1 / k0));
    k0 = k1;
    d0 = d1;
  }
  return k0;
}

/** The size factor of benchModel that gives about `dof` degrees of freedom. */
export function sizeFactorForDof(dof: number, element: 'linear' | 'quadratic'): number {
  return sizeFactorFor(dof, Math.sqrt(DOF_AT_UNIT_SIZE[element] / dof), (k) => {
    const model = benchModel(k);
    const { mesh } = generateMesh(buildDomain(model.geometry), { order: element === 'linear' ? 1 : 2, size: model.mesh!.size, raiserSize: model.mesh!.raiserSize });
    return 2 * mesh.nNodes;
  });
}

function runWhole(dof: number, element: 'linear' | 'quadratic', runs: number, warmups: number): WholeRow {
  const model = benchModel(sizeFactorForDof(dof, element));
  model.mesh = { ...model.mesh!, element };
  for (let w = 0; w < warmups; w++) analyseModel(model);
  const rows: Analysis[] = [];
  for (let r = 0; r < runs; r++) rows.push(analyseModel(model));
  const m = (f: (a: Analysis) => number): number => median(rows.map(f));
  const a = rows[0];
  const st = a.solveStats;
  return {
    dof: 2 * a.mesh.nNodes,
    elements: a.mesh.nElements,
    element,
    seconds: {
      mesh: m((x) => x.timeMs.mesh) / 1e3,
      assembly: m((x) => x.timeMs.assemble) / 1e3,
      ordering: m((x) => x.solveStats.seconds.ordering),
      symbolic: m((x) => x.solveStats.seconds.symbolic),
      numeric: m((x) => x.solveStats.seconds.numeric),
      solve: m((x) => x.solveStats.seconds.solve),
      recovery: m((x) => x.timeMs.recover) / 1e3,
      total: m((x) => x.timeMs.total) / 1e3,
    },
    solver: { method: st.method, nnzL: st.nnzL, flops: st.flops, iterations: st.iterations, relativeResidual: Math.max(...rows.map((x) => x.solveStats.relativeResidual)) },
    peakRssBytes: peakResidentBytes(),
    runs,
  };
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1]) {
  const args = process.argv.slice(2);
  const num = (name: string, dflt: number): number => {
    const at = args.indexOf(name);
    return at >= 0 ? Number(args[at + 1]) : dflt;
  };
  const element = args.includes('--element') && args[args.indexOf('--element') + 1] === 'linear' ? 'linear' : 'quadratic';
  process.stdout.write(JSON.stringify(runWhole(num('--dof', 1e5), element, num('--runs', 1), num('--warmups', 0))) + '\n');
  // the solver's worker thread is unref'd; nothing else keeps the process
}
