/**
 * Boundary curves: straight segments, circular arcs, elliptical arcs and (rational) Bezier
 * curves, each a map from a parameter t in [0, 1] to the plane. y points up; an arc with sweep > 0 runs counter-clockwise
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
  | { kind: 'ellipse'; cx: number; cy: number; a: number; b: number; rot: number; t0: number; sweep: number }
  /**
   * p(t) = sum_i w_i P_i B_i,n(t) / sum_i w_i B_i,n(t), the Bernstein form of degree n =
   * p.length / 2 - 1 (cubic and quadratic curves of drawings, and the pieces of splines).
   * `p` holds the control points flat (x0, y0, x1, y1, ...); `w` the weights of a rational
   * curve (omitted: all 1). Curves made by the drawing import never change their direction of
   * bending inside (they are split at inflections), so curveConcavity holds for the whole curve.
   */
  | { kind: 'bezier'; p: number[]; w?: number[] };

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
    case 'bezier':
      bezierJet(c, t, JET);
      out[0] = JET[0];
      out[1] = JET[1];
      return;
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
    case 'bezier':
      bezierJet(c, t, JET);
      out[0] = JET[2];
      out[1] = JET[3];
      return;
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
    case 'bezier': {
      // rho = |p'|^3 / |p' x p''|
      bezierJet(c, t, JET);
      const cross = Math.abs(JET[2] * JET[5] - JET[3] * JET[4]);
      const speed = Math.hypot(JET[2], JET[3]);
      return cross === 0 ? Infinity : (speed * speed * speed) / cross;
    }
  }
}

/** +1 when the material lies on the concave side (the curve bends away from the material), -1 convex, 0 straight. */
export function curveConcavity(c: Curve): number {
  if (c.kind === 'line') return 0;
  if (c.kind === 'bezier') {
    // Bending to the left (p' x p'' > 0) is towards the material: convex, as a ccw arc.
    bezierJet(c, 0.5, JET);
    const cross = JET[2] * JET[5] - JET[3] * JET[4];
    return cross === 0 ? 0 : cross > 0 ? -1 : 1;
  }
  return c.sweep < 0 ? 1 : -1;
}

/**
 * How far the tangent turns along the curve, radians (0 for a line; |sweep| for arcs and, in
 * the eccentric angle, for ellipses; for a Bezier curve the sum of the turns between 64 samples,
 * each of which turns less than a half turn). Used to choose the fewest pieces of a curve.
 */
export function curveTurn(c: Curve): number {
  switch (c.kind) {
    case 'line':
      return 0;
    case 'arc':
    case 'ellipse':
      return Math.abs(c.sweep);
    case 'bezier': {
      const n = 64;
      let total = 0;
      let px = 0;
      let py = 0;
      const d = [0, 0];
      for (let k = 0; k <= n; k++) {
        curveTangent(c, k / n, d);
        if (k > 0) total += Math.abs(Math.atan2(px * d[1] - py * d[0], px * d[0] + py * d[1]));
        px = d[0];
        py = d[1];
      }
      return total;
    }
  }
}

/**
 * The direction of travel at t as a unit vector. It is dp/dt normalised, except where dp/dt
 * vanishes, which happens at the end of a Bezier curve whose first control point coincides with
 * the end point (common in drawings): there it is the limit direction, towards the first
 * control point that differs from the end.
 */
export function curveTangent(c: Curve, t: number, out: Float64Array | number[]): void {
  curveDerivative(c, t, out);
  let l = Math.hypot(out[0], out[1]);
  if (l === 0 && c.kind === 'bezier') {
    const q = c.p;
    const n = q.length / 2 - 1;
    if (t <= 0.5) {
      for (let i = 1; i <= n && l === 0; i++) ((out[0] = q[2 * i] - q[0]), (out[1] = q[2 * i + 1] - q[1]), (l = Math.hypot(out[0], out[1])));
    } else {
      for (let i = n - 1; i >= 0 && l === 0; i--) ((out[0] = q[2 * n] - q[2 * i]), (out[1] = q[2 * n + 1] - q[2 * i + 1]), (l = Math.hypot(out[0], out[1])));
    }
  }
  if (l > 0) {
    out[0] /= l;
    out[1] /= l;
  }
}

/**
 * The largest |d2p/dt2| over the curve, or an upper bound of it: r sweep^2 for an arc,
 * max(a, b) sweep^2 for an ellipse; for a polynomial Bezier curve n (n - 1) times the largest
 * second difference of its control points (the hodograph bound); for a rational one the
 * largest of 256 samples, doubled. The chord of a piece dt long misses the curve by at most
 * this times dt^2 / 8.
 */
export function curveBendBound(c: Curve): number {
  switch (c.kind) {
    case 'line':
      return 0;
    case 'arc':
      return c.r * c.sweep * c.sweep;
    case 'ellipse':
      return Math.max(c.a, c.b) * c.sweep * c.sweep;
    case 'bezier': {
      const q = c.p;
      const n = q.length / 2 - 1;
      if (n < 2) return 0;
      if (!c.w) {
        let m = 0;
        for (let i = 0; i + 2 <= n; i++) {
          m = Math.max(m, Math.hypot(q[2 * i] - 2 * q[2 * i + 2] + q[2 * i + 4], q[2 * i + 1] - 2 * q[2 * i + 3] + q[2 * i + 5]));
        }
        return n * (n - 1) * m;
      }
      let m = 0;
      for (let k = 0; k <= 256; k++) {
        bezierJet(c, k / 256, JET);
        m = Math.max(m, Math.hypot(JET[4], JET[5]));
      }
      return 2 * m;
    }
  }
}

/** The part of a curve between parameters a and b, reparametrised over [0, 1] (exact for every kind). */
export function subCurve(c: Curve, a: number, b: number): Curve {
  switch (c.kind) {
    case 'line':
      return { kind: 'line', x0: c.x0 + (c.x1 - c.x0) * a, y0: c.y0 + (c.y1 - c.y0) * a, x1: c.x0 + (c.x1 - c.x0) * b, y1: c.y0 + (c.y1 - c.y0) * b };
    case 'arc':
      return { ...c, a0: c.a0 + c.sweep * a, sweep: c.sweep * (b - a) };
    case 'ellipse':
      return { ...c, t0: c.t0 + c.sweep * a, sweep: c.sweep * (b - a) };
    case 'bezier': {
      // Two de Casteljau splits in homogeneous coordinates: at b, keep the left part; then at a / b.
      let h = homogeneous(c);
      if (b < 1) h = splitHomogeneous(h, b)[0];
      if (a > 0) h = splitHomogeneous(h, b > 0 ? a / b : 0)[1];
      return fromHomogeneous(h, c.w !== undefined);
    }
  }
}

/** A Bezier curve split at parameter t into its two parts (exact: de Casteljau). */
export function splitBezier(c: Extract<Curve, { kind: 'bezier' }>, t: number): [Curve, Curve] {
  const [l, r] = splitHomogeneous(homogeneous(c), t);
  return [fromHomogeneous(l, c.w !== undefined), fromHomogeneous(r, c.w !== undefined)];
}

type BezierCurve = Extract<Curve, { kind: 'bezier' }>;

/** Control points as (w x, w y, w) triples. */
function homogeneous(c: BezierCurve): number[] {
  const n = c.p.length / 2;
  const h = new Array<number>(3 * n);
  for (let i = 0; i < n; i++) {
    const w = c.w ? c.w[i] : 1;
    h[3 * i] = w * c.p[2 * i];
    h[3 * i + 1] = w * c.p[2 * i + 1];
    h[3 * i + 2] = w;
  }
  return h;
}

function fromHomogeneous(h: number[], rational: boolean): BezierCurve {
  const n = h.length / 3;
  const p = new Array<number>(2 * n);
  const w = new Array<number>(n);
  for (let i = 0; i < n; i++) {
    p[2 * i] = h[3 * i] / h[3 * i + 2];
    p[2 * i + 1] = h[3 * i + 1] / h[3 * i + 2];
    w[i] = h[3 * i + 2];
  }
  return rational ? { kind: 'bezier', p, w } : { kind: 'bezier', p };
}

function splitHomogeneous(h: number[], t: number): [number[], number[]] {
  const n = h.length / 3;
  const work = h.slice();
  const left = new Array<number>(3 * n);
  const right = new Array<number>(3 * n);
  for (let level = 0; level < n; level++) {
    for (let k = 0; k < 3; k++) {
      left[3 * level + k] = work[k];
      right[3 * (n - 1 - level) + k] = work[3 * (n - 1 - level) + k];
    }
    for (let i = 0; i < n - 1 - level; i++) {
      for (let k = 0; k < 3; k++) work[3 * i + k] = (1 - t) * work[3 * i + k] + t * work[3 * (i + 1) + k];
    }
  }
  return [left, right];
}

/** Scratch for bezierJet: x, y, x', y', x'', y''. */
const JET = new Float64Array(6);
const JET_WORK: number[] = [];
const JET_OUT = new Float64Array(9);

/**
 * Position, first and second derivative of a (rational) Bezier curve at t, into jet[0..5].
 * de Casteljau in homogeneous coordinates down to the last three points Q0, Q1, Q2 of level
 * n - 2; with A(t) = sum w_i P_i B_i and W(t) = sum w_i B_i:
 *   A = (1-t)^2 Q0 + 2t(1-t) Q1 + t^2 Q2,  A' = 2n((1-t)(Q1-Q0) + t(Q2-Q1)),  A'' = n(n-1)(Q2 - 2Q1 + Q0)
 * (the derivative of the Bernstein form; G. Farin, Curves and Surfaces for CAGD, 5th ed. 2002,
 * sections 5.3 and 13.3 [M]); then p = A / W, p' = (A' - p W') / W, p'' = (A'' - 2 p' W' - p W'') / W.
 */
function bezierJet(c: BezierCurve, t: number, jet: Float64Array): void {
  const q = c.p;
  const m = q.length / 2; // n + 1 points
  const n = m - 1;
  const w = c.w;
  const h = JET_WORK;
  for (let i = 0; i < m; i++) {
    const wi = w ? w[i] : 1;
    h[3 * i] = wi * q[2 * i];
    h[3 * i + 1] = wi * q[2 * i + 1];
    h[3 * i + 2] = wi;
  }
  if (n === 1) {
    const Ax = (1 - t) * h[0] + t * h[3];
    const Ay = (1 - t) * h[1] + t * h[4];
    const W = (1 - t) * h[2] + t * h[5];
    const dAx = h[3] - h[0];
    const dAy = h[4] - h[1];
    const dW = h[5] - h[2];
    const x = Ax / W;
    const y = Ay / W;
    const dx = (dAx - x * dW) / W;
    const dy = (dAy - y * dW) / W;
    jet[0] = x;
    jet[1] = y;
    jet[2] = dx;
    jet[3] = dy;
    jet[4] = (-2 * dx * dW) / W;
    jet[5] = (-2 * dy * dW) / W;
    return;
  }
  for (let level = 0; level < n - 2; level++) {
    for (let i = 0; i < m - 1 - level; i++) {
      h[3 * i] = (1 - t) * h[3 * i] + t * h[3 * i + 3];
      h[3 * i + 1] = (1 - t) * h[3 * i + 1] + t * h[3 * i + 4];
      h[3 * i + 2] = (1 - t) * h[3 * i + 2] + t * h[3 * i + 5];
    }
  }
  const u = 1 - t;
  const out = JET_OUT;
  for (let k = 0; k < 3; k++) {
    const q0 = h[k];
    const q1 = h[3 + k];
    const q2 = h[6 + k];
    out[k] = u * u * q0 + 2 * t * u * q1 + t * t * q2;
    out[3 + k] = n * (u * (q1 - q0) + t * (q2 - q1));
    out[6 + k] = n * (n - 1) * (q2 - 2 * q1 + q0);
  }
  const W = out[2];
  const dW = out[5];
  const ddW = out[8];
  const x = out[0] / W;
  const y = out[1] / W;
  const dx = (out[3] - x * dW) / W;
  const dy = (out[4] - y * dW) / W;
  jet[0] = x;
  jet[1] = y;
  jet[2] = dx;
  jet[3] = dy;
  jet[4] = (out[6] - 2 * dx * dW - x * ddW) / W;
  jet[5] = (out[7] - 2 * dy * dW - y * ddW) / W;
}

/** Arc length, exact for lines and arcs; 5-point Gauss-Legendre on 16 pieces for ellipses, adaptively for Bezier curves. */
export function curveLength(c: Curve): number {
  switch (c.kind) {
    case 'line':
      return Math.hypot(c.x1 - c.x0, c.y1 - c.y0);
    case 'arc':
      return Math.abs(c.r * c.sweep);
    case 'ellipse':
    case 'bezier':
      return integrateSpeed(c, 0, 1);
  }
}

/**
 * integral_a^b f(t) dt by 5-point Gauss-Legendre (exact for polynomials of degree 9), halving
 * each piece until the halves agree with the whole to `rel` of the running scale `ref` (and at
 * most 30 levels deep, which no smooth integrand needs).
 */
function integrateAdaptive(f: (t: number) => number, a: number, b: number, rel: number): number {
  const gl = (lo: number, hi: number) => {
    const h = 0.5 * (hi - lo);
    const m = 0.5 * (hi + lo);
    let s = 0;
    for (let g = 0; g < 5; g++) s += GL_W[g] * f(m + h * GL_X[g]);
    return s * h;
  };
  let ref = 0;
  const rec = (lo: number, hi: number, whole: number, depth: number): number => {
    const mid = 0.5 * (lo + hi);
    const l = gl(lo, mid);
    const r = gl(mid, hi);
    ref = Math.max(ref, Math.abs(l) + Math.abs(r));
    if (depth >= 30 || Math.abs(l + r - whole) <= rel * ref) return l + r;
    return rec(lo, mid, l, depth + 1) + rec(mid, hi, r, depth + 1);
  };
  // Start from 8 pieces so no feature of the integrand is missed by the first estimate.
  let sum = 0;
  for (let k = 0; k < 8; k++) {
    const lo = a + ((b - a) * k) / 8;
    const hi = a + ((b - a) * (k + 1)) / 8;
    sum += rec(lo, hi, gl(lo, hi), 0);
  }
  return sum;
}

const GL_X = [-0.906179845938664, -0.5384693101056831, 0, 0.5384693101056831, 0.906179845938664];
const GL_W = [0.2369268850561891, 0.4786286704993665, 0.5688888888888889, 0.4786286704993665, 0.2369268850561891];

/** Length of the curve between parameters ta and tb (5-point Gauss-Legendre on 16 pieces; adaptive for Bezier curves). */
function integrateSpeed(c: Curve, ta: number, tb: number): number {
  if (c.kind === 'bezier') {
    const d = [0, 0];
    return Math.abs(
      integrateAdaptive(
        (t) => {
          curveDerivative(c, t, d);
          return Math.hypot(d[0], d[1]);
        },
        ta,
        tb,
        1e-14,
      ),
    );
  }
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
    case 'bezier': {
      const n = c.p.length / 2;
      const p = new Array<number>(2 * n);
      for (let i = 0; i < n; i++) {
        p[2 * i] = c.p[2 * (n - 1 - i)];
        p[2 * i + 1] = c.p[2 * (n - 1 - i) + 1];
      }
      return c.w ? { kind: 'bezier', p, w: c.w.slice().reverse() } : { kind: 'bezier', p };
    }
  }
}

/**
 * Signed area swept between the curve and the origin, 1/2 * integral of (x dy - y dx).
 * Summed over a closed loop it is the loop's signed area (positive counter-clockwise). Exact
 * for lines, arcs and elliptical arcs; for a polynomial Bezier curve of degree n the integrand
 * is a polynomial of degree 2n - 1, which 5-point Gauss-Legendre integrates exactly up to
 * n = 5 (and the adaptive rule to rounding beyond that and for rational curves).
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
    case 'bezier': {
      // About the first control point, so the integrand is small where the curve is far from
      // the origin: p = P0 + q, and x dy - y dx = (P0 x dq) + (q x dq).
      const x0 = c.p[0];
      const y0 = c.p[1];
      const pt = [0, 0];
      const d = [0, 0];
      const swept = integrateAdaptive(
        (t) => {
          evaluateCurve(c, t, pt);
          curveDerivative(c, t, d);
          return (pt[0] - x0) * d[1] - (pt[1] - y0) * d[0];
        },
        0,
        1,
        1e-15,
      );
      const n = c.p.length / 2 - 1;
      return 0.5 * (swept + x0 * (c.p[2 * n + 1] - y0) - y0 * (c.p[2 * n] - x0));
    }
  }
}

/** The box [xmin, ymin, xmax, ymax] of curves sampled at n + 1 parameter values each (ends included). */
export function sampleCurvesBox(curves: readonly Curve[], n: number): [number, number, number, number] {
  const p = [0, 0];
  const box: [number, number, number, number] = [Infinity, Infinity, -Infinity, -Infinity];
  for (const c of curves) {
    for (let k = 0; k <= n; k++) {
      evaluateCurve(c, k / n, p);
      box[0] = Math.min(box[0], p[0]);
      box[1] = Math.min(box[1], p[1]);
      box[2] = Math.max(box[2], p[0]);
      box[3] = Math.max(box[3], p[1]);
    }
  }
  return box;
}
