/**
 * `--export-matrix DIR`: the stiffness matrix and load vector of the final mesh in Matrix
 * Market form (src/solve/matrixmarket.ts), as the solver saw them: the free degrees of freedom
 * only (supported ones removed symmetrically), lower triangle of the symmetric matrix. dofs.csv
 * maps each row back to its node and direction.
 */
import { join } from 'node:path';
import { assembleSystem } from '../fem/assemble.js';
import { compileLoads, compileSupports } from '../fem/boundary-conditions.js';
import type { Analysis } from '../pipeline/analyse.js';
import { writeMatrixMarket, writeMatrixMarketArray } from '../solve/index.js';
import { prepareOutputDir } from './files.js';
import { writeAtomic } from './atomic.js';

export const MATRIX_FILES = ['stiffness.mtx', 'load.mtx', 'dofs.csv'];

export function writeMatrixFiles(dir: string, a: Analysis, force: boolean): string[] {
  prepareOutputDir(dir, MATRIX_FILES, force, '--export-matrix');
  const warnings: string[] = [];
  const supports = compileSupports(a.model, a.domain, a.mesh, warnings);
  const loads = compileLoads(a.model, a.domain, a.mesh, supports, warnings);
  const sys = assembleSystem(a.mesh, a.D, a.model.thickness, loads.f, supports.constraints);
  const u = a.units;
  const what = `raiser: ${a.model.title ?? 'untitled model'}; ${sys.freeDof.length} free degrees of freedom of ${2 * a.mesh.nNodes}; row i is dofs.csv row i`;
  const written: string[] = [];
  const k = join(dir, 'stiffness.mtx');
  writeAtomic(k, writeMatrixMarket(sys.K, `${what}\nstiffness K in ${u.force}/${u.length}, lower triangle of the symmetric matrix`));
  written.push(k);
  const f = join(dir, 'load.mtx');
  writeAtomic(f, writeMatrixMarketArray(sys.f, 1, `${what}\nload vector f in ${u.force}`));
  written.push(f);
  const rows = ['row,node,direction,x,y'];
  for (let i = 0; i < sys.freeDof.length; i++) {
    const d = sys.freeDof[i];
    const n = d >> 1;
    rows.push(`${i + 1},${n},${d & 1 ? 'y' : 'x'},${a.mesh.nodes[2 * n]},${a.mesh.nodes[2 * n + 1]}`);
  }
  const c = join(dir, 'dofs.csv');
  writeAtomic(c, rows.join('\n') + '\n');
  written.push(c);
  return written;
}
