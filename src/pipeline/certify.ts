/**
 * Certified Kt: a series of meshes refined until the estimated discretisation error of the peak
 * stress (and so of Kt) is below a target, with the error band from Richardson extrapolation and
 * the Grid Convergence Index (src/post/convergence.ts).
 *
 * The series is adaptive and systematic at once:
 *  1. a first mesh from the geometric size field is solved, and the Zienkiewicz-Zhu indicator
 *     (src/post/estimate.ts) marks every element whose relative stress error exceeds that of the
 *     elements at the peak: those regions (a second raiser, a load introduction, a thin
 *     ligament) would otherwise pollute the peak; far-field elements with small errors are left
 *     alone. The marked elements get the size that brings their error down to the peak's level
 *     (h (e_peak / e)^(1/p)), graded smoothly into the rest;
 *  2. this adapted size field is then scaled by 1/sqrt(2) per mesh, so the meshes form a family
 *     with a known refinement ratio at the peak, as Richardson extrapolation assumes.
 * Refinement stops when the GCI of the last three meshes is below the target, when the peak is
 * found not to converge (a sharp re-entrant corner), or when the mesh or DOF budget is spent.
 */
import { MeshSizeLimit, type SizeLimit } from '../mesh/background.js';
import { gridConvergence, type GciResult } from '../post/convergence.js';
import { estimateErrors } from '../post/estimate.js';
import { analyseOnMesh, prepareModel, type AnalyseOptions, type Analysis, type PreparedModel } from './analyse.js';
import type { Model } from '../model/schema.js';
import { ModelError } from '../model/errors.js';

export interface CertifyOptions extends AnalyseOptions {
  /** relative error target for the peak stress and Kt (default 0.01) */
  target?: number;
  /** the most meshes in the refined family (default 8) */
  maxMeshes?: number;
  /** stop before a mesh with more degrees of freedom than this (default 1.5e6) */
  maxDofs?: number;
}

export interface MeshRecord {
  elements: number;
  nodes: number;
  dofs: number;
  /** size factor of the family member: the mesh size at the peak relative to the first family mesh */
  relativeSize: number;
  peak: number;
  peakX: number;
  peakY: number;
  ktNet: number;
  ktGross: number;
  timeMs: number;
  atSharpCorner: boolean;
}

export type CertifyStatus = 'converged' | 'not-converged' | 'singular';

export interface Certified {
  analysis: Analysis;
  status: CertifyStatus;
  target: number;
  gci: GciResult | null;
  theoreticalOrder: number;
  meshes: MeshRecord[];
  /** elements the error indicator marked on the first mesh, of how many */
  adapted: { marked: number; of: number };
  notes: string[];
  totalTimeMs: number;
}

const RATIO = Math.SQRT2;

function record(a: Analysis, relativeSize: number): MeshRecord {
  return {
    elements: a.mesh.nElements,
    nodes: a.mesh.nNodes,
    dofs: 2 * a.mesh.nNodes,
    relativeSize,
    peak: a.peak.stress,
    peakX: a.peak.x,
    peakY: a.peak.y,
    ktNet: a.kt.net,
    ktGross: a.kt.gross,
    timeMs: a.timeMs.total,
    atSharpCorner: a.peak.atSharpCorner,
  };
}

/**
 * The adapted size limit from the error indicators of one analysis: elements whose relative
 * stress error exceeds the peak elements' get the size that would bring it to that level.
 */
export function adaptedLimit(a: Analysis): { limit: MeshSizeLimit | null; marked: number } {
  const mesh = a.mesh;
  const est = estimateErrors(mesh, a.D, a.model.thickness, a.u, a.stress);
  const per = mesh.order === 2 ? 6 : 3;
  const p = mesh.order;
  const peakMag = Math.abs(a.peak.stress) || 1;
  let eRef = 0;
  for (let e = 0; e < mesh.nElements; e++) {
    for (let k = 0; k < per; k++) {
      if (mesh.elements[per * e + k] === a.peak.node) eRef = Math.max(eRef, est.stressRms[e] / peakMag);
    }
  }
  const desired = new Float64Array(mesh.nElements).fill(Infinity);
  let marked = 0;
  if (eRef > 0) {
    for (let e = 0; e < mesh.nElements; e++) {
      const rel = est.stressRms[e] / peakMag;
      if (rel <= eRef) continue;
      // Edge length of the equilateral triangle of the same area: h = sqrt(4 A / sqrt 3).
      const h = Math.sqrt((4 * est.area[e]) / Math.sqrt(3));
      desired[e] = h * Math.max(0.25, Math.pow(eRef / rel, 1 / p));
      marked++;
    }
  }
  if (marked === 0) return { limit: null, marked };
  const grading = a.model.mesh?.grading ?? (mesh.order === 2 ? 0.25 : 0.15);
  return { limit: new MeshSizeLimit(mesh, desired, grading), marked };
}

function scaled(limit: SizeLimit | null, f: number): SizeLimit | undefined {
  if (!limit) return undefined;
  return { at: (x, y) => f * limit.at(x, y) };
}

export function certifyModel(model: Model, opts: CertifyOptions = {}): Certified {
  return certifyPrepared(prepareModel(model, opts), opts);
}

export function certifyPrepared(prep: PreparedModel, opts: CertifyOptions = {}): Certified {
  const t0 = performance.now();
  const target = opts.target ?? 0.01;
  const maxMeshes = opts.maxMeshes ?? 8;
  const maxDofs = opts.maxDofs ?? 1.5e6;
  const pTh = prep.order; // peak stress converges as h^p for elements of degree p (REFERENCES.md section 10)
  const notes: string[] = [];
  // The default mesh aims at about 0.5% on the peak with 6-node elements (about 1% with 3-node);
  // start the series from the size that should give the target, error ~ h^p, so a loose target
  // does not pay for a fine first mesh nor a tight one for many coarse meshes.
  const base = prep.order === 2 ? 0.005 : 0.01;
  const s0 = Math.min(2, Math.max(0.35, Math.pow(target / base, 1 / pTh)));
  const first = analyseOnMesh(prep, { sizeFactor: s0 });
  const { limit, marked } = adaptedLimit(first);
  const meshes: MeshRecord[] = [];
  const runs: Analysis[] = [];
  let gci: GciResult | null = null;
  let status: CertifyStatus = 'not-converged';
  for (let k = 0; k < maxMeshes; k++) {
    const f = Math.pow(RATIO, -k);
    let a: Analysis;
    try {
      a = k === 0 && !limit ? first : analyseOnMesh(prep, { sizeFactor: s0 * f, limit: scaled(limit, f) });
    } catch (err) {
      // The next mesh would not fit in memory: stop with what the series has.
      if (err instanceof ModelError && err.path === 'mesh' && runs.length > 0) {
        notes.push(`stopped: ${err.message}`);
        break;
      }
      throw err;
    }
    runs.push(a);
    meshes.push(record(a, f));
    if (runs.length >= 2) {
      gci = gridConvergence(
        meshes.map((m) => m.relativeSize),
        meshes.map((m) => Math.abs(m.peak)),
        pTh,
      );
      const last = meshes[meshes.length - 1];
      if (last.atSharpCorner && runs.length >= 3 && (gci.behaviour === 'diverging' || (gci.observedOrder < 0.5 * pTh && Math.abs(meshes[meshes.length - 1].peak) > Math.abs(meshes[meshes.length - 2].peak)))) {
        status = 'singular';
        break;
      }
      if (runs.length >= 3 && gci.behaviour !== 'diverging' && gci.gci <= target) {
        status = 'converged';
        break;
      }
    }
    // Budget: the next mesh has about twice the degrees of freedom.
    if (2 * meshes[meshes.length - 1].dofs > maxDofs) {
      notes.push(`stopped before a mesh of about ${(2 * meshes[meshes.length - 1].dofs).toExponential(1)} degrees of freedom (the limit is ${maxDofs.toExponential(1)})`);
      break;
    }
  }
  if (status === 'not-converged' && meshes.length >= maxMeshes) notes.push(`stopped after ${maxMeshes} meshes`);
  if (marked > 0) notes.push(`the error indicator on the first mesh marked ${marked} of ${first.mesh.nElements} elements for refinement beyond the geometric grading`);
  return {
    analysis: runs[runs.length - 1],
    status,
    target,
    gci,
    theoreticalOrder: pTh,
    meshes,
    adapted: { marked, of: first.mesh.nElements },
    notes,
    totalTimeMs: performance.now() - t0,
  };
}
