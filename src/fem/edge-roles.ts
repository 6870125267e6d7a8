/**
 * What each domain edge is to the evaluation of the raisers, as the supports and loads decided
 * it: a mirror (symmetry) edge, and an edge held or loaded in an idealised way.
 */
import { HOLD_FREE, HOLD_MIRROR, type CompiledLoads, type CompiledSupports } from './boundary-conditions.js';

export interface EdgeRoles {
  /** per domain edge: 1 where a symmetry support holds it as a mirror */
  mirrorEdge: Uint8Array;
  /** per domain edge: 1 held by a support (not a mirror), 2 loaded, 0 free or a pin's hole */
  edgeRole: Uint8Array;
}

export function classifyEdges(supports: CompiledSupports, loads: CompiledLoads): EdgeRoles {
  const n = supports.hold.length;
  const mirrorEdge = new Uint8Array(n);
  const edgeRole = new Uint8Array(n);
  for (let e = 0; e < mirrorEdge.length; e++) {
    mirrorEdge[e] = supports.hold[e] === HOLD_MIRROR ? 1 : 0;
    edgeRole[e] = supports.hold[e] !== HOLD_FREE && supports.hold[e] !== HOLD_MIRROR ? 1 : loads.loaded[e] ? 2 : 0;
  }
  // A pin in its hole (a rigid pin in contact, or the bearing pressure with its own account in
  // the pins' results) is modelled as a pin: its hole is not an idealised held or loaded edge.
  for (const p of supports.pins) for (const e of p.edges) edgeRole[e] = 0;
  return { mirrorEdge, edgeRole };
}
