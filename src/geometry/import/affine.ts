/**
 * Affine maps of curves, for SVG transforms, the SVG viewBox and DXF block inserts and object
 * coordinate systems. Lines and Bezier curves map through their points (an affine map takes a
 * Bezier curve, rational too, to the one of its mapped control points). A circular or elliptical
 * arc is written as p(th) = c + u cos th + v sin th, mapped to c' = A c, u' = L u, v' = L v, and
 * brought back to the canonical ellipse (centre, semi-axes, axis angle, eccentric angle) by the
 * eigenvectors of M M^T with M = [u v]; equal semi-axes give a circular arc. A mirror (det < 0)
 * is taken out first by th -> -th, so arcs keep their exact shape under any transform, skew included.
 */
import type { Curve } from '../curve.js';

/** [a, b, c, d, e, f]: x' = a x + c y + e, y' = b x + d y + f (the order of SVG's matrix()). */
export type Affine = readonly [number, number, number, number, number, number];

export const IDENTITY: Affine = [1, 0, 0, 1, 0, 0];

/** The map "first B, then A". */
export function compose(A: Affine, B: Affine): Affine {
  return [
    A[0] * B[0] + A[2] * B[1],
    A[1] * B[0] + A[3] * B[1],
    A[0] * B[2] + A[2] * B[3],
    A[1] * B[2] + A[3] * B[3],
    A[0] * B[4] + A[2] * B[5] + A[4],
    A[1] * B[4] + A[3] * B[5] + A[5],
  ];
}

function applyX(A: Affine, x: number, y: number): number {
  return A[0] * x + A[2] * y + A[4];
}

function applyY(A: Affine, x: number, y: number): number {
  return A[1] * x + A[3] * y + A[5];
}

export function translation(tx: number, ty: number): Affine {
  return [1, 0, 0, 1, tx, ty];
}

export function scaling(sx: number, sy: number): Affine {
  return [sx, 0, 0, sy, 0, 0];
}

export function rotation(theta: number): Affine {
  const c = Math.cos(theta);
  const s = Math.sin(theta);
  return [c, s, -s, c, 0, 0];
}

/**
 * The arc p(th) = (cx, cy) + (ux, uy) cos th + (vx, vy) sin th, th from t0 over sweep, as a
 * canonical curve; null when it is degenerate (u and v parallel: the arc is flattened to a line).
 */
export function conicArc(cx: number, cy: number, ux: number, uy: number, vx: number, vy: number, t0: number, sweep: number): Curve | null {
  let det = ux * vy - uy * vx;
  if (det < 0) {
    vx = -vx;
    vy = -vy;
    t0 = -t0;
    sweep = -sweep;
    det = -det;
  }
  const s11 = ux * ux + vx * vx;
  const s12 = ux * uy + vx * vy;
  const s22 = uy * uy + vy * vy;
  if (!(det > 1e-12 * (s11 + s22))) return null;
  const mean = 0.5 * (s11 + s22);
  const dev = Math.hypot(0.5 * (s11 - s22), s12);
  const a = Math.sqrt(mean + dev);
  const b = det / a; // a b = |det M|, which is exact where mean - dev would cancel
  const alpha = 0.5 * Math.atan2(2 * s12, s11 - s22);
  const ca = Math.cos(alpha);
  const sa = Math.sin(alpha);
  // K = D^-1 R(-alpha) M is a rotation by gamma: M (cos th, sin th) = R(alpha) D (cos(th + gamma), sin(th + gamma)).
  const k11 = (ca * ux + sa * uy) / a;
  const k21 = (-sa * ux + ca * uy) / b;
  const gamma = Math.atan2(k21, k11);
  if (a - b <= 1e-9 * a) return { kind: 'arc', cx, cy, r: 0.5 * (a + b), a0: t0 + gamma + alpha, sweep };
  return { kind: 'ellipse', cx, cy, a, b, rot: alpha, t0: t0 + gamma, sweep };
}

/** The image of a curve under A; null if an arc collapses to a line. */
export function mapCurve(c: Curve, A: Affine): Curve | null {
  switch (c.kind) {
    case 'line':
      return { kind: 'line', x0: applyX(A, c.x0, c.y0), y0: applyY(A, c.x0, c.y0), x1: applyX(A, c.x1, c.y1), y1: applyY(A, c.x1, c.y1) };
    case 'arc':
      return conicArc(applyX(A, c.cx, c.cy), applyY(A, c.cx, c.cy), A[0] * c.r, A[1] * c.r, A[2] * c.r, A[3] * c.r, c.a0, c.sweep);
    case 'ellipse': {
      const cr = Math.cos(c.rot);
      const sr = Math.sin(c.rot);
      const ux = c.a * cr;
      const uy = c.a * sr;
      const vx = -c.b * sr;
      const vy = c.b * cr;
      return conicArc(applyX(A, c.cx, c.cy), applyY(A, c.cx, c.cy), A[0] * ux + A[2] * uy, A[1] * ux + A[3] * uy, A[0] * vx + A[2] * vy, A[1] * vx + A[3] * vy, c.t0, c.sweep);
    }
    case 'bezier': {
      const p = c.p.slice();
      for (let i = 0; i < p.length; i += 2) {
        p[i] = applyX(A, c.p[i], c.p[i + 1]);
        p[i + 1] = applyY(A, c.p[i], c.p[i + 1]);
      }
      return c.w ? { kind: 'bezier', p, w: c.w.slice() } : { kind: 'bezier', p };
    }
  }
}
