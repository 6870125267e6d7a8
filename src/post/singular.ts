/**
 * Singular points: where the elastic stress of the model as described is infinite, so that a
 * peak there grows without limit as the mesh is refined and no Kt exists.
 *
 * They sit where the boundary's shape or its conditions jump (M. L. Williams, J. Appl. Mech. 19
 * (1952) 526-528, for corners and for edges whose conditions change):
 *  - a sharp re-entrant corner (material angle above 180 degrees): stresses grow as r^(lambda-1)
 *    with lambda < 1 for every such angle;
 *  - the end of a held edge next to a free, loaded or differently held one (a clamp's edge);
 *  - the end of a loaded edge where the traction jumps;
 *  - a point support, which carries its reaction as a point force (stress ~ 1/r).
 * The list here is of candidates: whether the stress there really grows is told by the mesh
 * series (a peak that keeps rising under refinement), and a mirror plane meeting a free or held
 * edge, or a roller holding a straight edge's normal motion, is no jump at all (reflect the part
 * in the plane and the edge runs straight on).
 */
import type { Domain } from '../geometry/domain.js';
import { evaluateCurve } from '../geometry/curve.js';
import { HOLD_FIXED, HOLD_FREE, HOLD_MIRROR, HOLD_SLIDE, type CompiledLoads, type CompiledSupports } from '../fem/boundary-conditions.js';

export type SingularKind = 'sharp-corner' | 'support-end' | 'load-end' | 'point-support';

export interface SingularCandidate {
  kind: SingularKind;
  x: number;
  y: number;
  /** where it is, in words */
  what: string;
  /** what to do about it */
  fix: string;
}

const HOLD_WORD = ['free', 'a mirror plane', 'held along the edge', 'held fixed'];

/** True when the change of support between two edges meeting at a point makes the stress singular there. */
function holdsJump(a: number, b: number): boolean {
  if (a === b) return false;
  // A mirror plane next to anything continues it by reflection.
  if (a === HOLD_MIRROR || b === HOLD_MIRROR) return false;
  return true;
}

/** The places where the stress may be singular, from the geometry and the compiled supports and loads. */
export function findSingularCandidates(domain: Domain, supports: CompiledSupports, loads: CompiledLoads, supportNames: readonly string[]): SingularCandidate[] {
  const out: SingularCandidate[] = [];
  const p = [0, 0];
  const edgeName = (id: number) => domain.edges[id].label;
  const held = (id: number) => {
    const h = supports.hold[id];
    return h === HOLD_FIXED || h === HOLD_SLIDE;
  };
  const cornerOf = new Map<number, (typeof domain.corners)[number]>();
  for (const c of domain.corners) cornerOf.set(c.edgeOut, c);
  for (const loop of domain.loops) {
    const n = loop.edges.length;
    for (let k = 0; k < n; k++) {
      const ein = loop.edges[k];
      const eout = loop.edges[(k + 1) % n];
      evaluateCurve(domain.edges[eout].curve, 0, p);
      const [x, y] = p;
      const corner = cornerOf.get(eout);
      if (corner && corner.materialAngle > Math.PI + 1e-6) {
        out.push({ kind: 'sharp-corner', x, y, what: `the sharp re-entrant ${corner.label}`, fix: 'give the corner its real radius (every cut or machined inside corner has one) and solve again' });
        continue;
      }
      const hi = supports.hold[ein];
      const ho = supports.hold[eout];
      if (holdsJump(hi, ho)) {
        const [heldEdge, other] = held(ein) && (!held(eout) || hi > ho) ? [ein, eout] : [eout, ein];
        const hOther = supports.hold[other];
        out.push({
          kind: 'support-end',
          x,
          y,
          what: `the end of the held ${edgeName(heldEdge)} (${HOLD_WORD[supports.hold[heldEdge]]}) where it meets ${edgeName(other)} (${hOther === HOLD_FREE ? (loads.loaded[other] ? 'loaded' : 'free') : HOLD_WORD[hOther]})`,
          fix: 'model the support as it is (a pin in its hole, an elastic clamp, a bolt), or keep the point away from the raisers: a rigid hold that ends abruptly has an infinite elastic stress at its end',
        });
        continue;
      }
      if (loads.loaded[ein] !== loads.loaded[eout] && supports.hold[ein] === HOLD_FREE && supports.hold[eout] === HOLD_FREE) {
        const loadedEdge = loads.loaded[ein] ? ein : eout;
        out.push({
          kind: 'load-end',
          x,
          y,
          what: `the end of the loaded ${edgeName(loadedEdge)}`,
          fix: 'spread the load as it is really applied (over a contact, through a pin), or keep the point away from the raisers',
        });
      }
    }
  }
  for (const pt of supports.points) {
    out.push({
      kind: 'point-support',
      x: pt.x,
      y: pt.y,
      what: `the point support ${supportNames[pt.support] ?? `supports[${pt.support}]`} at (${fmt(pt.x)}, ${fmt(pt.y)})`,
      fix: 'a point support that carries load puts a point force into the part; hold it over a real edge or through a pin in a hole',
    });
  }
  return out;
}

function fmt(v: number): string {
  return Number(v.toPrecision(6)).toString();
}
