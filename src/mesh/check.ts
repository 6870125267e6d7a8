/**
 * The mesh checker, run on every mesh raiser makes: a failure is an internal fault with a
 * clear report, never a silent result.
 *  - every coordinate finite, every node used by some element;
 *  - every element counter-clockwise with det J > 0 (for 6-node elements at the nodes and the
 *    3-point Gauss points);
 *  - every element edge shared by at most two elements, and the edges used once are exactly
 *    the boundary edges, each with the material on its left;
 *  - the element areas (Neumaier-compensated sum) equal the area the boundary encloses, to a
 *    tolerance of 1e-10 relative: for 6-node meshes the boundary is the chain of parabolic
 *    arcs through the edge nodes, whose area is the chord polygon's plus (2/3) L delta_n a side.
 */
import type { Domain } from '../geometry/domain.js';
import { determinant2, jacobianP2, shapeDerivativesP2 } from '../element/triangle.js';
import { InternalError } from '../model/errors.js';
import type { Mesh } from './types.js';

export interface MeshQuality {
  minAngleDeg: number;
  maxAngleDeg: number;
  area: number;
  boundaryArea: number;
  minDetJ: number;
}

class CompensatedSum {
  private s = 0;
  private c = 0;
  add(x: number): void {
    const t = this.s + x;
    if (Math.abs(this.s) >= Math.abs(x)) this.c += this.s - t + x;
    else this.c += x - t + this.s;
    this.s = t;
  }
  value(): number {
    return this.s + this.c;
  }
}

const DXI = new Float64Array(6);
const DETA = new Float64Array(6);
const JAC = new Float64Array(4);
/** det J of a 6-node triangle at (xi, eta), by the derivatives of its shape functions. */
function detJP2(n: Float64Array, el: Int32Array, o: number, xi: number, eta: number): number {
  shapeDerivativesP2(xi, eta, DXI, DETA);
  jacobianP2(n, el, o, DXI, DETA, 0, JAC);
  return determinant2(JAC);
}

const P2_SAMPLES: [number, number][] = [
  [0, 0],
  [1, 0],
  [0, 1],
  [0.5, 0],
  [0.5, 0.5],
  [0, 0.5],
  [1 / 6, 1 / 6],
  [2 / 3, 1 / 6],
  [1 / 6, 2 / 3],
];

/** The angle in degrees opposite side x of a triangle with sides x, y, z. */
function angleDeg(x: number, y: number, z: number): number {
  return (Math.acos(Math.max(-1, Math.min(1, (y * y + z * z - x * x) / (2 * y * z)))) * 180) / Math.PI;
}

export function checkMesh(mesh: Mesh, domain: Domain): MeshQuality {
  const { nodes, elements, nElements, nNodes, order } = mesh;
  const per = order === 2 ? 6 : 3;
  for (let i = 0; i < 2 * nNodes; i++) {
    if (!Number.isFinite(nodes[i])) throw new InternalError(`mesh check: node ${i >> 1} has a coordinate that is not finite`);
  }
  const used = new Uint8Array(nNodes);
  const area = new CompensatedSum();
  let minAngle = 180;
  let maxAngle = 0;
  let minDetJ = Infinity;
  for (let e = 0; e < nElements; e++) {
    const o = per * e;
    for (let i = 0; i < per; i++) {
      const k = elements[o + i];
      if (k < 0 || k >= nNodes) throw new InternalError(`mesh check: element ${e} names node ${k}, which does not exist`);
      used[k] = 1;
    }
    const a = elements[o];
    const b = elements[o + 1];
    const c = elements[o + 2];
    const ax = nodes[2 * a];
    const ay = nodes[2 * a + 1];
    const d2 = (nodes[2 * b] - ax) * (nodes[2 * c + 1] - ay) - (nodes[2 * b + 1] - ay) * (nodes[2 * c] - ax);
    if (order === 1) {
      if (!(d2 > 0)) throw new InternalError(`mesh check: element ${e} is not counter-clockwise (det J = ${d2})`);
      area.add(d2 / 2);
      minDetJ = Math.min(minDetJ, d2);
    } else {
      for (const [xi, eta] of P2_SAMPLES) {
        const dj = detJP2(nodes, elements, o, xi, eta);
        if (!(dj > 0)) throw new InternalError(`mesh check: element ${e} has det J = ${dj} at (${xi}, ${eta})`);
        minDetJ = Math.min(minDetJ, dj / d2);
      }
      // det J is quadratic, so the 3-point rule integrates the area exactly.
      area.add((detJP2(nodes, elements, o, 1 / 6, 1 / 6) + detJP2(nodes, elements, o, 2 / 3, 1 / 6) + detJP2(nodes, elements, o, 1 / 6, 2 / 3)) / 6);
    }
    const la = Math.hypot(nodes[2 * b] - nodes[2 * c], nodes[2 * b + 1] - nodes[2 * c + 1]);
    const lb = Math.hypot(ax - nodes[2 * c], ay - nodes[2 * c + 1]);
    const lc = Math.hypot(ax - nodes[2 * b], ay - nodes[2 * b + 1]);
    // the three angles by the law of cosines (no arrays in the loop)
    const aA = angleDeg(la, lb, lc);
    const aB = angleDeg(lb, la, lc);
    const aC = angleDeg(lc, la, lb);
    minAngle = Math.min(minAngle, aA, aB, aC);
    maxAngle = Math.max(maxAngle, aA, aB, aC);
  }
  for (let k = 0; k < nNodes; k++) if (!used[k]) throw new InternalError(`mesh check: node ${k} belongs to no element`);

  // Edge use: each element edge u -> w is put in the bucket of its lower vertex min(u, w) as
  // 2 max(u, w) + (u < w ? 0 : 1) (a counting sort by the lower vertex, then a small sort in
  // each bucket), so both directions of an undirected edge are neighbours: an entry twice is an
  // edge used twice in the same direction, an undirected edge seen once is a boundary edge.
  const nv = nNodes;
  const bucketStart = new Int32Array(nv + 1);
  for (let e = 0; e < nElements; e++) {
    for (let i = 0; i < 3; i++) {
      const u = elements[per * e + i];
      const w = elements[per * e + ((i + 1) % 3)];
      bucketStart[(u < w ? u : w) + 1]++;
    }
  }
  for (let v = 0; v < nv; v++) bucketStart[v + 1] += bucketStart[v];
  const entry = new Int32Array(3 * nElements);
  {
    const fill = bucketStart.slice(0, nv);
    for (let e = 0; e < nElements; e++) {
      for (let i = 0; i < 3; i++) {
        const u = elements[per * e + i];
        const w = elements[per * e + ((i + 1) % 3)];
        // insertion into the bucket keeps it sorted (buckets hold a few entries)
        const lo = u < w ? u : w;
        const key = u < w ? 2 * w : 2 * u + 1;
        let q = fill[lo]++;
        while (q > bucketStart[lo] && entry[q - 1] > key) {
          entry[q] = entry[q - 1];
          q--;
        }
        entry[q] = key;
      }
    }
  }
  const has = (u: number, w: number) => {
    const lo = u < w ? u : w;
    const key = u < w ? 2 * w : 2 * u + 1;
    for (let q = bucketStart[lo]; q < bucketStart[lo + 1]; q++) if (entry[q] === key) return true;
    return false;
  };
  let boundaryEdges = 0;
  for (let v = 0; v < nv; v++) {
    const end = bucketStart[v + 1];
    for (let q = bucketStart[v]; q < end; q++) {
      const key = entry[q];
      if (q > bucketStart[v] && key === entry[q - 1]) {
        const [u, w] = key % 2 === 0 ? [v, key >> 1] : [key >> 1, v];
        throw new InternalError(`mesh check: edge ${u}-${w} is used twice in the same direction`);
      }
      const pairedBefore = q > bucketStart[v] && entry[q - 1] >> 1 === key >> 1;
      const pairedAfter = q + 1 < end && entry[q + 1] >> 1 === key >> 1;
      if (!pairedBefore && !pairedAfter) boundaryEdges++;
    }
  }
  if (boundaryEdges !== mesh.nBEdges) {
    throw new InternalError(`mesh check: ${boundaryEdges} element edges lie on the boundary, but the mesh lists ${mesh.nBEdges} boundary edges`);
  }
  const bArea = new CompensatedSum();
  for (let s = 0; s < mesh.nBEdges; s++) {
    const a = mesh.bEdges[3 * s];
    const b = mesh.bEdges[3 * s + 1];
    if (!has(a, b)) throw new InternalError(`mesh check: boundary edge ${a}-${b} is missing, or has the material on its right`);
    if (has(b, a)) throw new InternalError(`mesh check: boundary edge ${a}-${b} has elements on both sides`);
    const ax = nodes[2 * a];
    const ay = nodes[2 * a + 1];
    const bx = nodes[2 * b];
    const by = nodes[2 * b + 1];
    bArea.add(0.5 * (ax * by - bx * ay));
    const m = mesh.bEdges[3 * s + 2];
    if (order === 2 && m >= 0) {
      const len = Math.hypot(bx - ax, by - ay);
      // Offset of the midside node from the chord midpoint along the outward normal (right of a -> b).
      const dn = ((nodes[2 * m] - (ax + bx) / 2) * (by - ay) - (nodes[2 * m + 1] - (ay + by) / 2) * (bx - ax)) / len;
      bArea.add((2 / 3) * len * dn);
    }
  }
  const A = area.value();
  const B = bArea.value();
  if (!(Math.abs(A - B) <= 1e-10 * Math.abs(B) + 1e-14 * domain.scale * domain.scale)) {
    throw new InternalError(`mesh check: the elements cover ${A}, but the boundary encloses ${B}`);
  }
  return { minAngleDeg: minAngle, maxAngleDeg: maxAngle, area: A, boundaryArea: B, minDetJ };
}
