/**
 * The large-size and scaling parts of `npm run bench`: the mesher at about 1e6 triangles, the
 * stiffness assembly alone, a whole 1e6-DOF analysis in a process of its own (time and peak
 * memory), and the scaling study (time of every stage against the DOF from 1e4 to 1e6 with the
 * observed exponent, the least-squares slope of log(time) against log(DOF)).
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { buildDomain } from '../geometry/domain.js';
import { generateMesh } from '../mesh/generate.js';
import type { MeshStats } from '../mesh/types.js';
import { assembleSystem } from '../fem/assemble.js';
import { constitutiveMatrix } from '../fem/material.js';
import { benchModel } from './model.js';
import { sizeFactorFor, sizeFactorForDof, type WholeRow } from './whole.js';
import { median } from './stats.js';


/** Least-squares slope of log y against log x. */
function observedExponent(x: readonly number[], y: readonly number[]): number {
  const lx = x.map(Math.log);
  const ly = y.map(Math.log);
  const mx = lx.reduce((a, b) => a + b, 0) / lx.length;
  const my = ly.reduce((a, b) => a + b, 0) / ly.length;
  let num = 0;
  let den = 0;
  for (let i = 0; i < lx.length; i++) {
    num += (lx[i] - mx) * (ly[i] - my);
    den += (lx[i] - mx) ** 2;
  }
  return num / den;
}

/** The mesher on the bench strap at about `triangles` linear triangles (the size factor found by meshing). */
export function benchMesherAt(triangles: number, runs: number, log: (s: string) => void): MeshStats {
  const k = sizeFactorFor(triangles, 0.08 * Math.sqrt(202655 / triangles), (kk) => {
    const m = benchModel(kk);
    return generateMesh(buildDomain(m.geometry), { order: 1, size: m.mesh!.size, raiserSize: m.mesh!.raiserSize }).stats.triangles;
  });
  const model = benchModel(k);
  const domain = buildDomain(model.geometry);
  const opts = { order: 1 as const, size: model.mesh!.size, raiserSize: model.mesh!.raiserSize };
  const rows: MeshStats[] = [];
  for (let r = 0; r < runs; r++) rows.push(generateMesh(domain, opts).stats);
  const t = (f: (s: MeshStats) => number) => `${median(rows.map(f)).toFixed(0)} ms`;
  const s = rows[0];
  log(
    `| ${s.triangles} | ${s.vertices} | ${t((x) => x.timeMs.boundary)} | ${t((x) => x.timeMs.triangulate)} | ${t((x) => x.timeMs.refine)} | ${t((x) => x.timeMs.finish)} | ${t((x) => x.timeMs.total)} | ${s.minAngleUnforcedDeg.toFixed(1)} | ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} |`,
  );
  return s;
}

/** assembleSystem alone (element stiffnesses and the compressed matrix) for 6-node triangles at about these DOF counts. */
export function benchAssembly(dofs: readonly number[], runs: number, log: (s: string) => void): void {
  log('\nStiffness assembly alone (6-node triangles, plane stress, clamped at x = 0): element matrices and the compressed lower triangle');
  log('| DOF | elements | nnz(K) lower | assembly | ns per element |');
  log('|---|---|---|---|---|');
  const D = constitutiveMatrix(210000, 0.3, 'plane-stress');
  for (const target of dofs) {
    const model = benchModel(sizeFactorForDof(target, 'quadratic'));
    const { mesh } = generateMesh(buildDomain(model.geometry), { order: 2, size: model.mesh!.size, raiserSize: model.mesh!.raiserSize });
    const fixed = new Uint8Array(2 * mesh.nNodes);
    for (let v = 0; v < mesh.nNodes; v++) if (mesh.nodes[2 * v] === 0) fixed[2 * v] = fixed[2 * v + 1] = 1;
    const c = { fixed, value: new Float64Array(2 * mesh.nNodes) };
    const f = new Float64Array(2 * mesh.nNodes);
    assembleSystem(mesh, D, 5, f, c); // warm-up
    const times: number[] = [];
    let nnz = 0;
    for (let r = 0; r < runs; r++) {
      const t0 = performance.now();
      nnz = assembleSystem(mesh, D, 5, f, c).K.rowIndex.length;
      times.push(performance.now() - t0);
    }
    const ms = median(times);
    log(`| ${2 * mesh.nNodes} | ${mesh.nElements} | ${nnz.toExponential(2)} | ${ms.toFixed(0)} ms | ${((ms * 1e6) / mesh.nElements).toFixed(0)} |`);
  }
}

/** One whole analysis in a child process (dist/bench/whole.js): its own peak memory. */
function runWholeChild(dof: number, runs: number, warmups: number, element: 'linear' | 'quadratic' = 'quadratic'): WholeRow {
  const script = fileURLToPath(new URL('./whole.js', import.meta.url));
  const r = spawnSync(process.execPath, [script, '--dof', String(dof), '--runs', String(runs), '--warmups', String(warmups), '--element', element], {
    encoding: 'utf8',
    maxBuffer: 1 << 24,
  });
  if (r.status !== 0) throw new Error(`bench child for ${dof} DOF failed: ${r.stderr}`);
  return JSON.parse(r.stdout.trim().split('\n').pop()!) as WholeRow;
}

const STAGES = ['mesh', 'assembly', 'ordering', 'symbolic', 'numeric', 'solve', 'recovery', 'total'] as const;

function wholeLine(w: WholeRow): string {
  const s = (x: number): string => (x < 1 ? `${(x * 1e3).toFixed(0)} ms` : `${x.toFixed(2)} s`);
  return `| ${w.dof} | ${w.elements} | ${STAGES.map((k) => s(w.seconds[k])).join(' | ')} | ${w.solver.nnzL.toExponential(2)} | ${(w.peakRssBytes / 2 ** 30).toFixed(2)} GB | ${w.solver.relativeResidual.toExponential(1)} |`;
}

const WHOLE_HEAD = '| DOF | elements | mesh | assembly | ordering | symbolic | numeric | solve | recovery + Kt | total | nnz(L) | peak RSS | residual |';
const WHOLE_RULE = '|---|---|---|---|---|---|---|---|---|---|---|---|---|';

/** The whole 1e6-DOF quadratic analysis (target: under 10 s and 2.5 GB). */
export function benchWholeMillion(log: (s: string) => void): WholeRow {
  log('\nWhole analysis at about 1e6 DOF, 6-node triangles, in a fresh process (one cold run; "assembly" includes supports, loads and the rigid-motion check)');
  log(WHOLE_HEAD);
  log(WHOLE_RULE);
  const w = runWholeChild(1e6, 1, 0);
  log(wholeLine(w));
  return w;
}

/** The scaling study: every stage against the DOF, each size in its own process, with the observed exponents. */
export function benchScaling(log: (s: string) => void, sizes: readonly number[] = [1e4, 3e4, 1e5, 3e5, 1e6]): WholeRow[] {
  log('\nScaling study: whole analysis of the bench strap, 6-node triangles, each size in a fresh process (medians of 3 runs after a warm-up below 2e5 DOF, else one cold run, as a user meets it: a warm-up in the same process leaves its garbage to the timed run)');
  log(WHOLE_HEAD);
  log(WHOLE_RULE);
  const rows: WholeRow[] = [];
  for (const dof of sizes) {
    const w = dof < 2e5 ? runWholeChild(dof, 3, 1) : runWholeChild(dof, 1, 0);
    rows.push(w);
    log(wholeLine(w));
  }
  const x = rows.map((r) => r.dof);
  const ex = STAGES.map((k) => observedExponent(x, rows.map((r) => r.seconds[k])).toFixed(2));
  log(`| exponent | | ${ex.join(' | ')} | ${observedExponent(x, rows.map((r) => r.solver.nnzL)).toFixed(2)} | ${observedExponent(x, rows.map((r) => r.peakRssBytes)).toFixed(2)} | |`);
  log('exponent: least-squares slope of log(time) against log(DOF) over the rows (1 = linear in the DOF)');
  return rows;
}
