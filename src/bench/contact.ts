/**
 * The cost of pin contact against one linear solve of the same mesh: a lug (the lug template,
 * close-fitting rigid pin, and one with clearance) meshed to about 1e5 DOF, its stiffness
 * assembled once; then, timed (median of the runs after a warm-up), one sparse solve of that
 * system (ordering, symbolic analysis, numeric factorisation, triangular solve: solveSpd), and
 * the whole contact solve (src/fem/contact.ts: the same ordering and symbolic analysis once, a
 * numeric factorisation and three triangular solves per active-set iteration, and the bookkeeping
 * between). The target: contact at most 3 times the linear solve.
 *
 *   npm run bench            (one of its tables)
 *   node dist/bench/contact.js --dof 1e5 --runs 3
 */
import { fileURLToPath } from 'node:url';
import { performance } from 'node:perf_hooks';
import { buildDomain } from '../geometry/domain.js';
import { generateMesh } from '../mesh/generate.js';
import { compileLoads, compileSupports } from '../fem/boundary-conditions.js';
import { assembleSystem } from '../fem/assemble.js';
import { buildNodeAdjacency } from '../mesh/topology.js';
import { constitutiveMatrix } from '../fem/material.js';
import { solveContact } from '../fem/contact.js';
import { solveSpd } from '../solve/index.js';
import { lug } from '../model/templates.js';
import { median } from './stats.js';


export interface ContactBenchRow {
  dof: number;
  clearance: number;
  linearMs: number;
  contactMs: number;
  iterations: number;
  ratio: number;
}

/** One row: the lug at about `dof` DOF (6-node triangles) with the given diametral clearance. */
function benchContactLug(dof: number, clearance: number, runs: number): ContactBenchRow {
  const W = 40;
  const d = 20;
  const model = lug({ W, d, clearance });
  const domain = buildDomain(model.geometry);
  // a uniform mesh: the element size that gives about `dof` DOF over the lug's area (2 DOF a
  // node, about 2 nodes per 6-node triangle, triangle area about 0.43 h^2)
  const h = Math.sqrt((4 * domain.area) / (0.433 * dof));
  const { mesh } = generateMesh(domain, { order: 2, size: h, raiserSize: h });
  const warnings: string[] = [];
  const supports = compileSupports(model, domain, mesh, warnings);
  const loads = compileLoads(model, domain, mesh, supports, warnings);
  const D = constitutiveMatrix(model.material.E, model.material.nu, 'plane-stress');
  const graph = buildNodeAdjacency(mesh);
  const system = assembleSystem(mesh, D, model.thickness, loads.f, supports.constraints, graph);
  const options = { coords: mesh.nodes, nodeAdjacency: graph, dofsPerNode: 2, fullDofOfRow: system.freeDof };
  // the linear solve's right-hand side: the pin force spread as the bearing pressure would put it is
  // not needed for timing; one unit force at the hole's first free DOF gives the same work
  const b = new Float64Array(system.K.n);
  b[system.K.n - 1] = 1;
  const linear: number[] = [];
  const contact: number[] = [];
  let iterations = 0;
  for (let r = 0; r <= runs; r++) {
    let t0 = performance.now();
    solveSpd(system.K, b, options);
    const tl = performance.now() - t0;
    t0 = performance.now();
    const c = solveContact(mesh, system, supports.pins, { thickness: model.thickness, planeModulus: model.material.E }, options);
    const tc = performance.now() - t0;
    iterations = c.iterations;
    if (process.env.RAISER_BENCH_VERBOSE) console.log(c.activeHistory.join(","), JSON.stringify(c.stats.seconds), tc.toFixed(0), tl.toFixed(0));
    if (r > 0) {
      linear.push(tl);
      contact.push(tc);
    }
  }
  const linearMs = median(linear);
  const contactMs = median(contact);
  return { dof: 2 * mesh.nNodes, clearance, linearMs, contactMs, iterations, ratio: contactMs / linearMs };
}

export function runContactBench(log: (s: string) => void, runs = 3, dof = 1e5): ContactBenchRow[] {
  log('| DOF | pin | one linear solve | contact solve | iterations | contact / linear (target <= 3) |');
  log('|---|---|---|---|---|---|');
  const rows: ContactBenchRow[] = [];
  for (const clearance of [0, 0.2]) {
    const row = benchContactLug(dof, clearance, runs);
    rows.push(row);
    log(`| ${row.dof} | ${clearance === 0 ? 'close fit' : `clearance ${clearance} mm (1% of d)`} | ${row.linearMs.toFixed(0)} ms | ${row.contactMs.toFixed(0)} ms | ${row.iterations} | ${row.ratio.toFixed(2)} |`);
  }
  return rows;
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const args = process.argv.slice(2);
  const get = (k: string, def: number) => {
    const i = args.indexOf(k);
    return i >= 0 ? Number(args[i + 1]) : def;
  };
  runContactBench(console.log, get('--runs', 3), get('--dof', 1e5));
}
