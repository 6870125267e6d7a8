/**
 * The adapted size limit of a certified series: from the Zienkiewicz-Zhu error indicators of one
 * analysis (src/post/estimate.ts), elements whose relative stress error exceeds that of the
 * elements at the reference peak get the size that would bring it to that level,
 * h (e_peak / e)^(1/p), graded smoothly into the rest (src/mesh/background.ts).
 */
import { MeshSizeLimit } from '../mesh/background.js';
import { findElementsAtNode } from '../mesh/topology.js';
import type { Mesh } from '../mesh/types.js';
import { estimateErrors } from './estimate.js';
import type { MeshEvaluation } from './evaluate.js';
import type { Peak } from './peak.js';
import type { Settlement } from './settle.js';

/** A node of the mesh and the stress there: the peak the adaptation aims at. */
export interface ReferencePeak {
  node: number;
  stress: number;
}

/** The node of the peak the adaptation aims at: the governing raiser's, else the part's highest. */
export function findReferencePeak(evaluation: MeshEvaluation, peak: Peak, s: Settlement): ReferencePeak {
  if (s.governing >= 0) {
    const p = evaluation.raisers[s.governing].peak;
    return { node: p.node, stress: p.stress };
  }
  return { node: peak.node, stress: peak.stress };
}

/** One solution on its mesh, as the error indicators need it. */
export interface SolvedMesh {
  mesh: Mesh;
  /** the constitutive matrix used */
  D: Float64Array;
  thickness: number;
  /** displacements, 2 per node */
  u: Float64Array;
  /** recovered nodal stresses, sxx, syy, sxy per node */
  stress: Float64Array;
}

/**
 * The adapted size limit from the error indicators of one solution: elements whose relative
 * stress error exceeds the reference peak's elements' get the size that would bring it to that
 * level. `grading` is the model's mesh.grading when given. Null (with marked 0) when no element
 * is marked.
 */
export function adaptSizeLimit(a: SolvedMesh, reference: ReferencePeak, grading: number | undefined): { limit: MeshSizeLimit | null; marked: number } {
  const mesh = a.mesh;
  const est = estimateErrors(mesh, a.D, a.thickness, a.u, a.stress);
  const p = mesh.order;
  const peakMag = Math.abs(reference.stress) || 1;
  let eRef = 0;
  for (const e of findElementsAtNode(mesh, reference.node)) eRef = Math.max(eRef, est.stressRms[e] / peakMag);
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
  return { limit: new MeshSizeLimit(mesh, desired, grading ?? (mesh.order === 2 ? 0.25 : 0.15)), marked };
}
