/**
 * Element stresses sigma = D B u_e at chosen points of each element, and the stress measures.
 * Stress components are stored as triples (sxx, syy, sxy).
 */
import { P2Gradients, P2Scratch, SHAPE_AT_TRI6, TRI6, gradientsP2, strainMatrixP1, strainMatrixP2 } from '../fem/elements.js';
import type { Mesh } from '../mesh/types.js';
import type { StressMeasure } from '../model/schema.js';

/**
 * The points where element stresses are sampled for recovery: the centroid (3-node, where the
 * constant stress is superconvergent) or the 6 points of the degree-4 rule (6-node; their linear
 * stress field is then fitted over the whole element, not at three points only).
 */
export function samplePoints(order: 1 | 2): { xi: Float64Array; eta: Float64Array } {
  if (order === 1) return { xi: Float64Array.of(1 / 3), eta: Float64Array.of(1 / 3) };
  return { xi: TRI6.xi, eta: TRI6.eta };
}

export interface ElementSamples {
  perElement: number;
  /** x, y per sample */
  xy: Float64Array;
  /** sxx, syy, sxy per sample */
  stress: Float64Array;
}

/** Stresses at the sample points of every element. */
export function sampleElementStresses(mesh: Mesh, D: Float64Array, u: Float64Array): ElementSamples {
  if (mesh.order === 2) return sampleP2(mesh, D, u);
  const { xi, eta } = samplePoints(mesh.order);
  const k = xi.length;
  const xy = new Float64Array(2 * k * mesh.nElements);
  const stress = new Float64Array(3 * k * mesh.nElements);
  const out = new Float64Array(3);
  const pt = new Float64Array(2);
  const ws = new StressWorkspace();
  for (let e = 0; e < mesh.nElements; e++) {
    for (let q = 0; q < k; q++) {
      elementStressAt(mesh, D, u, e, xi[q], eta[q], out, pt, ws);
      const s = e * k + q;
      xy[2 * s] = pt[0];
      xy[2 * s + 1] = pt[1];
      stress[3 * s] = out[0];
      stress[3 * s + 1] = out[1];
      stress[3 * s + 2] = out[2];
    }
  }
  return { perElement: k, xy, stress };
}

/**
 * The 6-node case of sampleElementStresses, element by element: the gradients at the six points
 * at once (one Jacobian for a straight-sided element), then sigma = D B u_e at each.
 */
function sampleP2(mesh: Mesh, D: Float64Array, u: Float64Array): ElementSamples {
  const ne = mesh.nElements;
  const xy = new Float64Array(12 * ne);
  const stress = new Float64Array(18 * ne);
  const g = new P2Gradients();
  const el = mesh.elements;
  const nodes = mesh.nodes;
  const ue = new Float64Array(12);
  const xe = new Float64Array(12);
  for (let e = 0; e < ne; e++) {
    gradientsP2(nodes, el, e, g, true);
    for (let i = 0; i < 6; i++) {
      const n = el[6 * e + i];
      ue[2 * i] = u[2 * n];
      ue[2 * i + 1] = u[2 * n + 1];
      xe[2 * i] = nodes[2 * n];
      xe[2 * i + 1] = nodes[2 * n + 1];
    }
    for (let q = 0; q < 6; q++) {
      let x = 0;
      let y = 0;
      let exx = 0;
      let eyy = 0;
      let gxy = 0;
      for (let i = 0; i < 6; i++) {
        const N = SHAPE_AT_TRI6[6 * q + i];
        x += N * xe[2 * i];
        y += N * xe[2 * i + 1];
        const a = g.dx[6 * q + i];
        const b = g.dy[6 * q + i];
        exx += a * ue[2 * i];
        eyy += b * ue[2 * i + 1];
        gxy += b * ue[2 * i] + a * ue[2 * i + 1];
      }
      const s = 6 * e + q;
      xy[2 * s] = x;
      xy[2 * s + 1] = y;
      stress[3 * s] = D[0] * exx + D[1] * eyy + D[2] * gxy;
      stress[3 * s + 1] = D[3] * exx + D[4] * eyy + D[5] * gxy;
      stress[3 * s + 2] = D[6] * exx + D[7] * eyy + D[8] * gxy;
    }
  }
  return { perElement: 6, xy, stress };
}

export class StressWorkspace {
  B1 = new Float64Array(18);
  p2 = new P2Scratch();
}

/** Writes the stress at local point (xi, eta) of element e into out, and the point's position into pt. */
export function elementStressAt(
  mesh: Mesh,
  D: Float64Array,
  u: Float64Array,
  e: number,
  xi: number,
  eta: number,
  out: Float64Array,
  pt: Float64Array,
  ws: StressWorkspace,
): void {
  const per = mesh.order === 2 ? 6 : 3;
  let B: Float64Array;
  if (per === 3) {
    strainMatrixP1(mesh.nodes, mesh.elements, e, ws.B1);
    B = ws.B1;
    const l0 = 1 - xi - eta;
    const a = mesh.elements[3 * e];
    const b = mesh.elements[3 * e + 1];
    const c = mesh.elements[3 * e + 2];
    pt[0] = l0 * mesh.nodes[2 * a] + xi * mesh.nodes[2 * b] + eta * mesh.nodes[2 * c];
    pt[1] = l0 * mesh.nodes[2 * a + 1] + xi * mesh.nodes[2 * b + 1] + eta * mesh.nodes[2 * c + 1];
  } else {
    strainMatrixP2(mesh.nodes, mesh.elements, e, xi, eta, ws.p2);
    B = ws.p2.B;
    let x = 0;
    let y = 0;
    for (let i = 0; i < 6; i++) {
      const n = mesh.elements[6 * e + i];
      x += ws.p2.N[i] * mesh.nodes[2 * n];
      y += ws.p2.N[i] * mesh.nodes[2 * n + 1];
    }
    pt[0] = x;
    pt[1] = y;
  }
  const nd = 2 * per;
  let ex = 0;
  let ey = 0;
  let gxy = 0;
  for (let j = 0; j < nd; j++) {
    const n = mesh.elements[per * e + (j >> 1)];
    const uj = u[2 * n + (j & 1)];
    ex += B[j] * uj;
    ey += B[nd + j] * uj;
    gxy += B[2 * nd + j] * uj;
  }
  out[0] = D[0] * ex + D[1] * ey + D[2] * gxy;
  out[1] = D[3] * ex + D[4] * ey + D[5] * gxy;
  out[2] = D[6] * ex + D[7] * ey + D[8] * gxy;
}

/**
 * A stress measure from the in-plane components; szz is the out-of-plane normal stress
 * (0 in plane stress, nu (sxx + syy) in plane strain).
 *  max-principal, min-principal: the in-plane principal stresses s1 >= s2;
 *  von-mises: sqrt(((s1-s2)^2 + (s2-s3)^2 + (s3-s1)^2) / 2) with s3 = szz;
 *  tresca: the largest difference of s1, s2, s3.
 */
export function stressMeasure(m: StressMeasure, sxx: number, syy: number, sxy: number, szz: number): number {
  switch (m) {
    case 'sxx':
      return sxx;
    case 'syy':
      return syy;
    case 'sxy':
      return sxy;
  }
  const c = 0.5 * (sxx + syy);
  const r = Math.hypot(0.5 * (sxx - syy), sxy);
  const s1 = c + r;
  const s2 = c - r;
  switch (m) {
    case 'max-principal':
      return s1;
    case 'min-principal':
      return s2;
    case 'von-mises':
      return Math.sqrt(0.5 * ((s1 - s2) ** 2 + (s2 - szz) ** 2 + (szz - s1) ** 2));
    case 'tresca':
      return Math.max(s1 - s2, Math.abs(s2 - szz), Math.abs(szz - s1));
  }
  throw new RangeError(`unknown stress measure ${m as string}`);
}
