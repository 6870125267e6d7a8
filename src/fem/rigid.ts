/**
 * Before the solve: do the supports stop every rigid motion of the plate? The three plane
 * rigid motions are translations in x and y and a rotation; a combination of them that moves
 * no prescribed degree of freedom is a free motion, and the stiffness matrix is singular. The
 * test forms the 3x3 Gram matrix of the motions restricted to the prescribed DOFs (rotation
 * scaled by the model size so the three are comparable) and looks for a near-zero eigenvalue.
 *
 * A fixed rigid pin in a round hole (src/fem/contact.ts) holds the part in both directions at
 * the hole's centre, wherever the part pushes it, but not against turning about that centre
 * (without friction the pin's forces all pass through it): it counts as a point held in x and y
 * at the centre, `heldPoints`.
 */
import { AnalysisError } from '../model/errors.js';
import type { Mesh } from '../mesh/types.js';

export function checkRigidMotion(mesh: Mesh, fixed: Uint8Array, scale: number, heldPoints: readonly { x: number; y: number }[] = []): void {
  let cx = 0;
  let cy = 0;
  for (let i = 0; i < mesh.nNodes; i++) {
    cx += mesh.nodes[2 * i];
    cy += mesh.nodes[2 * i + 1];
  }
  cx /= mesh.nNodes;
  cy /= mesh.nNodes;
  const G = new Float64Array(9);
  let count = 0;
  for (let i = 0; i < mesh.nNodes; i++) {
    const rx = -(mesh.nodes[2 * i + 1] - cy) / scale;
    const ry = (mesh.nodes[2 * i] - cx) / scale;
    for (let c = 0; c < 2; c++) {
      if (!fixed[2 * i + c]) continue;
      count++;
      const v = c === 0 ? [1, 0, rx] : [0, 1, ry];
      for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) G[3 * a + b] += v[a] * v[b];
    }
  }
  for (const p of heldPoints) {
    for (const v of [
      [1, 0, -(p.y - cy) / scale],
      [0, 1, (p.x - cx) / scale],
    ]) {
      count++;
      for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) G[3 * a + b] += v[a] * v[b];
    }
  }
  if (count === 0) {
    throw new AnalysisError('the model has no supports: it is free to move as a rigid body', 'add supports (fixed, roller, symmetry, pin or rigid-pin) that stop motion in x, in y and rotation');
  }
  const { values, vectors } = symmetricEigen3(G);
  // Smallest eigenvalue against the largest: relative rank test.
  const vmax = Math.max(values[0], values[1], values[2]);
  for (let k = 0; k < 3; k++) {
    if (values[k] > 1e-9 * vmax) continue;
    const [a, b, c] = [vectors[k], vectors[3 + k], vectors[6 + k]];
    throw new AnalysisError(describeMotion(a, b, c, cx, cy, scale), 'add a support that stops this motion (a roller, a symmetry plane or a pin)');
  }
}

function describeMotion(a: number, b: number, c: number, cx: number, cy: number, scale: number): string {
  // Shown to a millionth of the model size, so round-off does not print as 2.8e-14.
  const q = 1e-6 * scale;
  const fmt = (v: number) => Number((Math.round(v / q) * q).toPrecision(6)).toString();
  if (Math.abs(c) < 1e-6 * Math.hypot(a, b)) {
    if (Math.abs(b) < 1e-6 * Math.abs(a)) return 'the model is free to translate in x: no support holds it in that direction';
    if (Math.abs(a) < 1e-6 * Math.abs(b)) return 'the model is free to translate in y: no support holds it in that direction';
    return `the model is free to translate along (${fmt(a)}, ${fmt(b)}): no support holds it in that direction`;
  }
  // u = (a - c (y - cy)/L, b + c (x - cx)/L) vanishes at the centre of rotation.
  const x0 = cx - (b * scale) / c;
  const y0 = cy + (a * scale) / c;
  return `the model is free to rotate about (${fmt(x0)}, ${fmt(y0)}): the supports hold it only there or along one line`;
}

/** Eigen-decomposition of a symmetric 3x3 matrix by Jacobi rotations; vectors are columns. */
function symmetricEigen3(A: Float64Array): { values: Float64Array; vectors: Float64Array } {
  const a = Float64Array.from(A);
  const v = Float64Array.of(1, 0, 0, 0, 1, 0, 0, 0, 1);
  for (let sweep = 0; sweep < 50; sweep++) {
    const off = Math.abs(a[1]) + Math.abs(a[2]) + Math.abs(a[5]);
    if (off <= 1e-300 || off <= 1e-15 * (Math.abs(a[0]) + Math.abs(a[4]) + Math.abs(a[8]))) break;
    for (const [p, q] of [
      [0, 1],
      [0, 2],
      [1, 2],
    ]) {
      const apq = a[3 * p + q];
      if (apq === 0) continue;
      const theta = (a[3 * q + q] - a[3 * p + p]) / (2 * apq);
      const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
      const cs = 1 / Math.sqrt(t * t + 1);
      const sn = t * cs;
      for (let k = 0; k < 3; k++) {
        const akp = a[3 * k + p];
        const akq = a[3 * k + q];
        a[3 * k + p] = cs * akp - sn * akq;
        a[3 * k + q] = sn * akp + cs * akq;
      }
      for (let k = 0; k < 3; k++) {
        const apk = a[3 * p + k];
        const aqk = a[3 * q + k];
        a[3 * p + k] = cs * apk - sn * aqk;
        a[3 * q + k] = sn * apk + cs * aqk;
      }
      for (let k = 0; k < 3; k++) {
        const vkp = v[3 * k + p];
        const vkq = v[3 * k + q];
        v[3 * k + p] = cs * vkp - sn * vkq;
        v[3 * k + q] = sn * vkp + cs * vkq;
      }
    }
  }
  return { values: Float64Array.of(a[0], a[4], a[8]), vectors: v };
}
