/**
 * The mirror planes of a half or quarter model: the lines x = at or y = at that its symmetry
 * supports hold, as the support compilation decided them (src/fem/boundary-conditions.ts).
 */
import type { Domain } from '../geometry/domain.js';
import { HOLD_MIRROR } from './boundary-conditions.js';

/** A mirror plane: x = at (axis 'x') or y = at (axis 'y'), with the domain edges on it. */
export interface MirrorPlane {
  axis: 'x' | 'y';
  at: number;
  edges: number[];
}

/** The planes held by symmetry supports, as the support compilation decided them: edges both shear-free and mirror-held. */
export function findMirrorPlanes(domain: Domain, symmetry: Uint8Array, hold: Uint8Array): MirrorPlane[] {
  const planes: MirrorPlane[] = [];
  const tol = 1e-9 * domain.scale;
  for (let e = 0; e < domain.edges.length; e++) {
    const c = domain.edges[e].curve;
    if (!symmetry[e] || hold[e] !== HOLD_MIRROR || c.kind !== 'line') continue;
    const axis = Math.abs(c.x1 - c.x0) <= tol ? 'x' : 'y';
    const at = axis === 'x' ? c.x0 : c.y0;
    const p = planes.find((q) => q.axis === axis && Math.abs(q.at - at) <= tol);
    if (p) p.edges.push(e);
    else planes.push({ axis, at, edges: [e] });
  }
  return planes;
}
