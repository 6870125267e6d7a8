/**
 * The balance of one solution: the resultant of the applied loads, that of the support
 * reactions, and how closely they cancel; with the warnings when they do not.
 */
import type { Mesh } from '../mesh/types.js';

export interface Resultant {
  fx: number;
  fy: number;
  /** moment about the origin, counter-clockwise positive */
  m: number;
}

export interface Balance {
  /** the resultant of the applied nodal loads */
  applied: Resultant;
  /** the resultant of the reactions at the held degrees of freedom */
  reaction: Resultant;
  /** |applied + reactions| relative to the sum of |load| over every degree of freedom */
  equilibriumError: number;
  /** the sum of |load| over every degree of freedom */
  loadSum: number;
}

/** The resultant force and moment (about the origin) of nodal forces f, 2 per node. */
function sumResultant(mesh: Mesh, f: Float64Array): Resultant {
  let fx = 0;
  let fy = 0;
  let m = 0;
  for (let i = 0; i < mesh.nNodes; i++) {
    fx += f[2 * i];
    fy += f[2 * i + 1];
    m += mesh.nodes[2 * i] * f[2 * i + 1] - mesh.nodes[2 * i + 1] * f[2 * i];
  }
  return { fx, fy, m };
}

/**
 * Applied loads f, internal forces r = K u and the held degrees of freedom (fixed[d] = 1): the
 * reactions are r - f where a support holds, and the balance is the two resultants' sum.
 */
export function computeBalance(mesh: Mesh, f: Float64Array, r: Float64Array, fixed: Uint8Array): Balance {
  const nDof = 2 * mesh.nNodes;
  const applied = sumResultant(mesh, f);
  const reactionVec = new Float64Array(nDof);
  for (let d = 0; d < nDof; d++) if (fixed[d]) reactionVec[d] = r[d] - f[d];
  const reaction = sumResultant(mesh, reactionVec);
  let loadSum = 0;
  for (let d = 0; d < nDof; d++) loadSum += Math.abs(f[d]);
  const equilibriumError = Math.hypot(applied.fx + reaction.fx, applied.fy + reaction.fy) / (loadSum || 1);
  return { applied, reaction, equilibriumError, loadSum };
}

/**
 * Warnings about the balance: pins that are the only supports yet carry load (they are meant
 * only to stop rigid motion), and loads and reactions that do not cancel to 1e-6.
 */
export function checkBalance(balance: Balance, onlyPins: boolean, forceUnit: string): string[] {
  const out: string[] = [];
  if (onlyPins) {
    const carried = Math.hypot(balance.reaction.fx, balance.reaction.fy);
    if (carried > 1e-6 * balance.loadSum) {
      out.push(`the loads do not balance: the pins, meant only to stop rigid motion, carry ${carried.toPrecision(3)} ${forceUnit}; check the loads or hold the part with real supports`);
    }
  }
  if (balance.equilibriumError > 1e-6) out.push(`applied loads and reactions balance only to ${balance.equilibriumError.toExponential(2)} of the load`);
  return out;
}
