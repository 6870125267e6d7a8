/**
 * The peak of a stress measure over the recovered nodal field, on the boundary and inside, and
 * the feature of the part it sits on.
 */
import type { Domain } from '../geometry/domain.js';
import { measureSizeAtNode } from '../mesh/topology.js';
import type { Mesh } from '../mesh/types.js';
import type { StressMeasure } from '../model/schema.js';
import { stressMeasure } from './stress.js';

export interface Peak {
  measure: StressMeasure;
  /** the measure's value at the peak (for min-principal, the most compressive value) */
  stress: number;
  x: number;
  y: number;
  node: number;
  /** where it is, in words: "hole 2", "fillet at corner 5", "interior" */
  feature: string;
  onBoundary: boolean;
  /** the peak sits on a re-entrant sharp corner, where the elastic stress is singular */
  atSharpCorner: boolean;
  components: { sxx: number; syy: number; sxy: number };
}

/** szz for the out-of-plane normal stress: 0 in plane stress, nu (sxx + syy) in plane strain. */
export function outOfPlaneFactor(state: 'plane-stress' | 'plane-strain', nu: number): number {
  return state === 'plane-strain' ? nu : 0;
}

/** Nodal values of a measure. */
export function measureField(stress: Float64Array, measure: StressMeasure, szzFactor: number): Float64Array {
  const n = stress.length / 3;
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const sxx = stress[3 * i];
    const syy = stress[3 * i + 1];
    v[i] = stressMeasure(measure, sxx, syy, stress[3 * i + 2], szzFactor * (sxx + syy));
  }
  return v;
}

/**
 * The largest value of the measure along the boundary edges at a node (those that onSegment
 * accepts), with the stress
 * components interpolated along each edge by its shape functions (quadratic on 6-node meshes),
 * found by golden-section search: the peak on a curved edge between two nodes is not missed.
 */
export function refineAlongBoundary(
  mesh: Mesh,
  stress: Float64Array,
  node: number,
  measure: StressMeasure,
  szzFactor: number,
  sign: number,
  onSegment: (s: number) => boolean = () => true,
): { value: number; x: number; y: number; sxx: number; syy: number; sxy: number } | null {
  if (mesh.order !== 2) return null;
  let best: { value: number; x: number; y: number; sxx: number; syy: number; sxy: number } | null = null;
  const n = mesh.nodes;
  for (let s = 0; s < mesh.nBEdges; s++) {
    const a = mesh.bEdges[3 * s];
    const b = mesh.bEdges[3 * s + 1];
    const m = mesh.bEdges[3 * s + 2];
    if (m < 0 || (a !== node && b !== node && m !== node) || !onSegment(s)) continue;
    const at = (u: number) => {
      const na = (1 - u) * (1 - 2 * u);
      const nm = 4 * u * (1 - u);
      const nb = u * (2 * u - 1);
      const sxx = na * stress[3 * a] + nm * stress[3 * m] + nb * stress[3 * b];
      const syy = na * stress[3 * a + 1] + nm * stress[3 * m + 1] + nb * stress[3 * b + 1];
      const sxy = na * stress[3 * a + 2] + nm * stress[3 * m + 2] + nb * stress[3 * b + 2];
      return { v: stressMeasure(measure, sxx, syy, sxy, szzFactor * (sxx + syy)), x: na * n[2 * a] + nm * n[2 * m] + nb * n[2 * b], y: na * n[2 * a + 1] + nm * n[2 * m + 1] + nb * n[2 * b + 1], sxx, syy, sxy };
    };
    // Golden-section search for the largest sign * value on [0, 1], then compare with the ends.
    let lo = 0;
    let hi = 1;
    const g = (Math.sqrt(5) - 1) / 2;
    let x1 = hi - g * (hi - lo);
    let x2 = lo + g * (hi - lo);
    let f1 = sign * at(x1).v;
    let f2 = sign * at(x2).v;
    for (let it = 0; it < 40; it++) {
      if (f1 < f2) {
        lo = x1;
        x1 = x2;
        f1 = f2;
        x2 = lo + g * (hi - lo);
        f2 = sign * at(x2).v;
      } else {
        hi = x2;
        x2 = x1;
        f2 = f1;
        x1 = hi - g * (hi - lo);
        f1 = sign * at(x1).v;
      }
    }
    for (const u of [0, 0.5 * (lo + hi), 1]) {
      const r = at(u);
      if (!best || sign * r.v > sign * best.value) best = { value: r.v, x: r.x, y: r.y, sxx: r.sxx, syy: r.syy, sxy: r.sxy };
    }
  }
  return best;
}

export function findPeak(mesh: Mesh, domain: Domain, stress: Float64Array, measure: StressMeasure, szzFactor: number): Peak {
  const field = measureField(stress, measure, szzFactor);
  const sign = measure === 'min-principal' ? -1 : 1;
  let best = 0;
  for (let i = 1; i < mesh.nNodes; i++) if (sign * field[i] > sign * field[best]) best = i;
  const e = mesh.nodeEdge[best];
  const corner = mesh.nodeCorner[best];
  let feature = 'interior';
  let atSharp = false;
  if (corner >= 0) {
    const c = domain.corners[corner];
    atSharp = c.materialAngle > Math.PI + 1e-6;
    // A junction between a fillet or hole arc and a straight edge belongs to the curved feature.
    const ein = domain.edges[c.edgeIn];
    const eout = domain.edges[c.edgeOut];
    feature = atSharp ? `sharp ${c.label}` : eout.curve.kind !== 'line' ? eout.feature : ein.curve.kind !== 'line' ? ein.feature : c.label;
  } else if (e >= 0) {
    feature = domain.edges[e].feature;
    // At a smooth junction (a fillet meeting its straight edge), name the curved feature.
    for (let s = 0; s < mesh.nBEdges; s++) {
      if (mesh.bEdges[3 * s] !== best && mesh.bEdges[3 * s + 1] !== best) continue;
      const de = domain.edges[mesh.bEdgeDomain[s]];
      if (de.curve.kind !== 'line') feature = de.feature;
    }
  }
  if (!atSharp) {
    // Next to a re-entrant corner (within two elements of it) counts as at it.
    const h = measureSizeAtNode(mesh, best);
    for (const c of domain.corners) {
      if (c.materialAngle <= Math.PI + 1e-6) continue;
      if (Math.hypot(c.x - mesh.nodes[2 * best], c.y - mesh.nodes[2 * best + 1]) <= 2 * h) {
        atSharp = true;
        feature = `next to the sharp ${c.label}`;
        break;
      }
    }
  }
  // On the boundary the peak may lie between nodes; at a sharp corner the nodal value stands.
  let value = field[best];
  let px = mesh.nodes[2 * best];
  let py = mesh.nodes[2 * best + 1];
  if (!atSharp && (e >= 0 || corner >= 0)) {
    const r = refineAlongBoundary(mesh, stress, best, measure, szzFactor, sign);
    if (r && sign * r.value > sign * value) {
      value = r.value;
      px = r.x;
      py = r.y;
    }
  }
  return {
    measure,
    stress: value,
    x: px,
    y: py,
    node: best,
    feature,
    onBoundary: e >= 0 || corner >= 0,
    atSharpCorner: atSharp,
    components: { sxx: stress[3 * best], syy: stress[3 * best + 1], sxy: stress[3 * best + 2] },
  };
}
