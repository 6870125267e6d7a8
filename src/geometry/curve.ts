/**
 * Boundary curves: straight segments, circular arcs and elliptical arcs, each a map from a
 * parameter t in [0, 1] to the plane. y points up; an arc with sweep > 0 runs counter-clockwise
 * around its centre.
 *
 * Loops keep the material on the left of the direction of travel, so an arc with sweep < 0
 * (clockwise) has its centre on the void side: the material lies outside its circle, which is
 * what makes holes, notch roots and shoulder fillets concentrate stress.
 */

export type Curve =
  | { kind: 'line'; x0: number; y0: number; x1: number; y1: number }
  /** angle(t) = a0 + sweep * t, radians */
  | { kind: 'arc'; cx: number; cy: number; r: number; a0: number; sweep: number }
  /** p(t) = c + Rot(rot) [a cos th, b sin th], th = t0 + sweep * t (eccentric angle, radians) */
  | { kind: 'ellipse'; cx: number; cy: number; a: number; b: number; rot: number; t0: number; sweep: number };

/** Writes the point at parameter t into out[0], out[1]. */
export function evaluateCurve(c: Curve, t: number, out: Float64Array | number[]): void {
  switch (c.kind) {
    case 'line':
      out[0] = c.x0 + (c.x1 - c.x0) * t;
      out[1] = c.y0 + (c.y1 - c.y0) * t;
      return;
    case 'arc': {
      const a = c.a0 + c.sweep * t;
      out[0] = c.cx + c.r * Math.cos(a);
      out[1] = c.cy + c.r * Math.sin(a);
      return;
    }
    case 'ellipse': {
      const th = c.t0 + c.sweep * t;
      const ex = c.a * Math.cos(th);
      const ey = c.b * Math.sin(th);
      const cr = Math.cos(c.rot);
      const sr = Math.sin(c.rot);
      out[0] = c.cx + cr * ex - sr * ey;
      out[1] = c.cy + sr * ex + cr * ey;
      return;
    }
  }
}

/** Writes dp/dt at parameter t into out. */
export function curveDerivative(c: Curve, t: number, out: Float64Array | number[]): void {
  switch (c.kind) {
    case 'line':
      out[0] = c.x1 - c.x0;
      out[1] = c.y1 - c.y0;
      return;
    case 'arc': {
      const a = c.a0 + c.sweep * t;
      out[0] = -c.r * Math.sin(a) * c.sweep;
      out[1] = c.r * Math.cos(a) * c.sweep;
      return;
    }
    case 'ellipse': {
      const th = c.t0 + c.sweep * t;
      const dx = -c.a * Math.sin(th) * c.sweep;
      const dy = c.b * Math.cos(th) * c.sweep;
      const cr = Math.cos(c.rot);
      const sr = Math.sin(c.rot);
      out[0] = cr * dx - sr * dy;
      out[1] = sr * dx + cr * dy;
      return;
    }
  }
}

/** Radius of curvature at t (Infinity for a line). */
export function curvatureRadius(c: Curve, t: number): number {
  switch (c.kind) {
    case 'line':
      return Infinity;
    case 'arc':
      return c.r;
    case 'ellipse': {
      // rho = (a^2 sin^2 th + b^2 cos^2 th)^(3/2) / (a b)
      const th = c.t0 + c.sweep * t;
      const s = Math.sin(th);
      const co = Math.cos(th);
      return Math.pow(c.a * c.a * s * s + c.b * c.b * co * co, 1.5) / (c.a * c.b);
    }
  }
}

/** +1 when the material lies on the concave side (the curve bends away from the material), -1 convex, 0 straight. */
export function curveConcavity(c: Curve): number {
  if (c.kind === 'line') return 0;
  return c.sweep < 0 ? 1 : -1;
}

/** Arc length, exact for lines and arcs; 64-point Gauss-Legendre on 16 pieces for ellipses. */
export function curveLength(c: Curve): number {
  switch (c.kind) {
    case 'line':
      return Math.hypot(c.x1 - c.x0, c.y1 - c.y0);
    case 'arc':
      return Math.abs(c.r * c.sweep);
    case 'ellipse':
      return integrateSpeed(c, 0, 1);
  }
}

const GL_X = [-0.906179845938664, -0.5384693101056831, 0, 0.5384693101056831, 0.906179845938664];
const GL_W = [0.2369268850561891, 0.4786286704993665, 0.5688888888888889, 0.4786286704993665, 0.2369268850561891];

/** Length of the curve between parameters ta and tb (5-point Gauss-Legendre on 16 pieces). */
export function integrateSpeed(c: Curve, ta: number, tb: number): number {
  if (c.kind !== 'ellipse') return curveLength(c) * Math.abs(tb - ta);
  const d = [0, 0];
  const pieces = 16;
  let sum = 0;
  const h = (tb - ta) / pieces;
  for (let p = 0; p < pieces; p++) {
    const mid = ta + (p + 0.5) * h;
    for (let g = 0; g < 5; g++) {
      curveDerivative(c, mid + 0.5 * h * GL_X[g], d);
      sum += GL_W[g] * Math.hypot(d[0], d[1]);
    }
  }
  return Math.abs(sum * 0.5 * h);
}

/** Reverses the direction of travel, so t -> 1 - t. */
export function reverseCurve(c: Curve): Curve {
  switch (c.kind) {
    case 'line':
      return { kind: 'line', x0: c.x1, y0: c.y1, x1: c.x0, y1: c.y0 };
    case 'arc':
      return { ...c, a0: c.a0 + c.sweep, sweep: -c.sweep };
    case 'ellipse':
      return { ...c, t0: c.t0 + c.sweep, sweep: -c.sweep };
  }
}

/** Maps the curve by the similarity x -> s * R(theta) x + (tx, ty), with an optional mirror in x first. */
export function transformCurve(c: Curve, s: number, theta: number, tx: number, ty: number): Curve {
  const co = Math.cos(theta);
  const si = Math.sin(theta);
  const mx = (x: number, y: number) => s * (co * x - si * y) + tx;
  const my = (x: number, y: number) => s * (si * x + co * y) + ty;
  switch (c.kind) {
    case 'line':
      return { kind: 'line', x0: mx(c.x0, c.y0), y0: my(c.x0, c.y0), x1: mx(c.x1, c.y1), y1: my(c.x1, c.y1) };
    case 'arc':
      return { ...c, cx: mx(c.cx, c.cy), cy: my(c.cx, c.cy), r: s * c.r, a0: c.a0 + theta };
    case 'ellipse':
      return { ...c, cx: mx(c.cx, c.cy), cy: my(c.cx, c.cy), a: s * c.a, b: s * c.b, rot: c.rot + theta };
  }
}

/**
 * Signed area swept between the curve and the origin, 1/2 * integral of (x dy - y dx).
 * Summed over a closed loop it is the loop's signed area (positive counter-clockwise). Exact
 * for lines, arcs and elliptical arcs.
 */
export function curveAreaTerm(c: Curve): number {
  switch (c.kind) {
    case 'line':
      return 0.5 * (c.x0 * c.y1 - c.x1 * c.y0);
    case 'arc':
    case 'ellipse': {
      // p = c + q(t): x dy - y dx = (cx dqy - cy dqx) + (qx dqy - qy dqx); the second part
      // integrates to twice the area swept about the centre: r^2 sweep, or a b sweep.
      const p0 = [0, 0];
      const p1 = [0, 0];
      evaluateCurve(c, 0, p0);
      evaluateCurve(c, 1, p1);
      const swept = c.kind === 'arc' ? c.r * c.r * c.sweep : c.a * c.b * c.sweep;
      return 0.5 * (swept + c.cx * (p1[1] - p0[1]) - c.cy * (p1[0] - p0[0]));
    }
  }
}
