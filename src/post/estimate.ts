/**
 * A posteriori error indicators from recovered stresses: O. C. Zienkiewicz & J. Z. Zhu, "A simple
 * error estimator and adaptive procedure for practical engineering analysis", IJNME 24 (1987)
 * 337-357, with the recovery of their 1992 papers. In each element the difference e = s* - s_h
 * between the recovered field s* (interpolated from the nodes with the element's shape
 * functions) and the finite element stress s_h is integrated with the degree-4 rule:
 *   energy norm:  ||e||_E^2 = t * integral e^T D^-1 e dA,
 *   stress RMS:   sqrt(integral (exx^2 + eyy^2 + 2 exy^2) dA / A).
 */
import { shapeP2 } from '../element/triangle.js';
import { TRI6 } from '../fem/elements.js';
import type { Mesh } from '../mesh/types.js';
import { elementStressAt, StressWorkspace } from './stress.js';

export interface ErrorIndicators {
  /** per element: squared energy norm of s* - s_h */
  energy2: Float64Array;
  /** per element: root-mean-square of |s* - s_h| over the element (stress units) */
  stressRms: Float64Array;
  /** per element: area */
  area: Float64Array;
  /** sums over the mesh: error energy and strain energy (both squared norms) */
  totalError2: number;
  totalEnergy2: number;
}

/** Inverts a 3x3 row-major matrix. */
function invert3(D: Float64Array): Float64Array {
  const [a, b, c, d, e, f, g, h, i] = D;
  const A = e * i - f * h;
  const B = -(d * i - f * g);
  const C = d * h - e * g;
  const det = a * A + b * B + c * C;
  return Float64Array.of(A / det, -(b * i - c * h) / det, (b * f - c * e) / det, B / det, (a * i - c * g) / det, -(a * f - c * d) / det, C / det, -(a * h - b * g) / det, (a * e - b * d) / det);
}

export function estimateErrors(mesh: Mesh, D: Float64Array, thickness: number, u: Float64Array, recovered: Float64Array): ErrorIndicators {
  const per = mesh.order === 2 ? 6 : 3;
  const C = invert3(D);
  const energy2 = new Float64Array(mesh.nElements);
  const stressRms = new Float64Array(mesh.nElements);
  const area = new Float64Array(mesh.nElements);
  const ws = new StressWorkspace();
  const sh = new Float64Array(3);
  const pt = new Float64Array(2);
  const N = new Float64Array(6);
  const dxi = new Float64Array(6);
  const deta = new Float64Array(6);
  let totalError2 = 0;
  let totalEnergy2 = 0;
  for (let e = 0; e < mesh.nElements; e++) {
    let en = 0;
    let sq = 0;
    let a = 0;
    for (let q = 0; q < TRI6.w.length; q++) {
      const xi = TRI6.xi[q];
      const eta = TRI6.eta[q];
      elementStressAt(mesh, D, u, e, xi, eta, sh, pt, ws);
      let dJ: number;
      if (per === 6) {
        shapeP2(xi, eta, N, dxi, deta);
        dJ = detJ6(mesh, e, dxi, deta);
      } else {
        N[0] = 1 - xi - eta;
        N[1] = xi;
        N[2] = eta;
        dJ = detJ3(mesh, e);
      }
      const w = TRI6.w[q] * dJ;
      let sx = 0;
      let sy = 0;
      let sxy = 0;
      for (let k = 0; k < per; k++) {
        const node = mesh.elements[per * e + k];
        sx += N[k] * recovered[3 * node];
        sy += N[k] * recovered[3 * node + 1];
        sxy += N[k] * recovered[3 * node + 2];
      }
      const ex = sx - sh[0];
      const ey = sy - sh[1];
      const exy = sxy - sh[2];
      en += w * (ex * (C[0] * ex + C[1] * ey + C[2] * exy) + ey * (C[3] * ex + C[4] * ey + C[5] * exy) + exy * (C[6] * ex + C[7] * ey + C[8] * exy));
      sq += w * (ex * ex + ey * ey + 2 * exy * exy);
      totalEnergy2 += thickness * w * (sh[0] * (C[0] * sh[0] + C[1] * sh[1] + C[2] * sh[2]) + sh[1] * (C[3] * sh[0] + C[4] * sh[1] + C[5] * sh[2]) + sh[2] * (C[6] * sh[0] + C[7] * sh[1] + C[8] * sh[2]));
      a += w;
    }
    energy2[e] = thickness * en;
    area[e] = a;
    stressRms[e] = Math.sqrt(Math.max(0, sq) / a);
    totalError2 += energy2[e];
  }
  return { energy2, stressRms, area, totalError2, totalEnergy2 };
}

function detJ3(mesh: Mesh, e: number): number {
  const n = mesh.nodes;
  const a = mesh.elements[3 * e];
  const b = mesh.elements[3 * e + 1];
  const c = mesh.elements[3 * e + 2];
  return (n[2 * b] - n[2 * a]) * (n[2 * c + 1] - n[2 * a + 1]) - (n[2 * c] - n[2 * a]) * (n[2 * b + 1] - n[2 * a + 1]);
}

/** det J of a 6-node element from its shape-function derivatives at a point. */
function detJ6(mesh: Mesh, e: number, dxi: Float64Array, deta: Float64Array): number {
  let j11 = 0;
  let j12 = 0;
  let j21 = 0;
  let j22 = 0;
  for (let k = 0; k < 6; k++) {
    const v = mesh.elements[6 * e + k];
    j11 += dxi[k] * mesh.nodes[2 * v];
    j12 += dxi[k] * mesh.nodes[2 * v + 1];
    j21 += deta[k] * mesh.nodes[2 * v];
    j22 += deta[k] * mesh.nodes[2 * v + 1];
  }
  return j11 * j22 - j12 * j21;
}
