/** The displacements of every degree of freedom from the solved free ones and the prescribed values. */
import { AnalysisError } from '../model/errors.js';

/**
 * u[d] = value[d] for a held degree of freedom, x[i] at freeDof[i] for a free one; an
 * AnalysisError when any is not finite (the stiffness too badly conditioned to solve).
 */
export function expandSolution(value: Float64Array, freeDof: Int32Array, x: Float64Array): Float64Array {
  const nDof = value.length;
  const u = new Float64Array(nDof);
  for (let d = 0; d < nDof; d++) u[d] = value[d];
  for (let i = 0; i < freeDof.length; i++) u[freeDof[i]] = x[i];
  for (let d = 0; d < nDof; d++) {
    if (!Number.isFinite(u[d])) throw new AnalysisError('the solution is not finite: the stiffness matrix is too badly conditioned to solve', 'check for parts joined by a very thin ligament or extreme dimensions');
  }
  return u;
}
