/**
 * An infinite straight line against the boundary of a domain: where it crosses the edges, and
 * the stretches of it that lie in the material.
 *
 * The line is p(v) = o + v e with e a unit vector. Crossings are found on the true curves:
 * lines by a 2x2 solve, circular arcs and ellipses in closed form (the ellipse mapped to the unit
 * circle), Bezier curves by bracketing the signed distance on 64 samples and then bisection.
 * At each crossing the edge's outward normal n (to the right of its direction of travel, the
 * material being on the left) tells whether the line enters the material (e . n < 0) or leaves
 * it; crossings closer than 1e-10 of the part's size are one event (a line through a vertex
 * crosses two edges there), whose enters and leaves are summed, so a line that only touches a
 * corner or grazes a curve changes nothing. Leaving through a hole's edge starts a hole gap;
 * leaving through the outline starts the outside.
 *
 *            outline                    hole
 *   --------|=========|- - - - - - -|=========|--------   line
 *   outside   material     hole gap    material   outside
 */
import { curveDerivative, evaluateCurve, type Curve } from './curve.js';
import type { Domain } from './domain.js';

export interface LineStretch {
  /** parameters along the line, v0 < v1 */
  v0: number;
  v1: number;
  /** the domain edges the stretch starts and ends on, and the curve parameters there */
  edge0: number;
  edge1: number;
  t0: number;
  t1: number;
  /** 'material'; 'hole' (void inside the outline); 'outside' (beyond the outline) */
  kind: 'material' | 'hole' | 'outside';
}

const P = [0, 0];
const D = [0, 0];

/**
 * Crossings of the line o + v e with curve c, pushed as (v, t) pairs: v along the line, t the
 * curve parameter (tangent touches may appear as two crossings at one place).
 */
function crossCurve(c: Curve, ox: number, oy: number, ex: number, ey: number, out: number[]): void {
  // Signed distance of a point from the line: (p - o) x e.
  const dist = (x: number, y: number) => (x - ox) * ey - (y - oy) * ex;
  const along = (x: number, y: number) => (x - ox) * ex + (y - oy) * ey;
  switch (c.kind) {
    case 'line': {
      const da = dist(c.x0, c.y0);
      const db = dist(c.x1, c.y1);
      if ((da > 0 && db > 0) || (da < 0 && db < 0) || da === db) return;
      const t = da / (da - db);
      out.push(along(c.x0 + t * (c.x1 - c.x0), c.y0 + t * (c.y1 - c.y0)), t);
      return;
    }
    case 'arc':
    case 'ellipse': {
      // Map to the unit circle: for an arc q = (p - c)/r; for an ellipse the rotation, then axes.
      const a = c.kind === 'arc' ? c.r : c.a;
      const b = c.kind === 'arc' ? c.r : c.b;
      const rot = c.kind === 'arc' ? 0 : c.rot;
      const cr = Math.cos(rot);
      const sr = Math.sin(rot);
      const qx = ((ox - c.cx) * cr + (oy - c.cy) * sr) / a;
      const qy = (-(ox - c.cx) * sr + (oy - c.cy) * cr) / b;
      const dx = (ex * cr + ey * sr) / a;
      const dy = (-ex * sr + ey * cr) / b;
      // |q + v d|^2 = 1
      const A = dx * dx + dy * dy;
      const B = qx * dx + qy * dy;
      const C = qx * qx + qy * qy - 1;
      const disc = B * B - A * C;
      if (disc < 0) return;
      const s = Math.sqrt(disc);
      // Stable roots of A v^2 + 2 B v + C = 0.
      const q = -(B + (B >= 0 ? s : -s));
      const roots = q === 0 ? [0, 0] : [q / A, C / q];
      const start = c.kind === 'arc' ? c.a0 : c.t0;
      for (const v of roots) {
        const th = Math.atan2(qy + v * dy, qx + v * dx);
        let rel = (th - start) / c.sweep;
        const period = (2 * Math.PI) / Math.abs(c.sweep);
        rel -= Math.floor(rel / period) * period;
        // A whole circle takes every angle; otherwise the angle must lie in the sweep.
        if (rel <= 1 + 1e-12) out.push(v, Math.min(rel, 1));
        else if (period - rel <= 1e-12) out.push(v, 0);
      }
      return;
    }
    case 'bezier': {
      const n = 64;
      evaluateCurve(c, 0, P);
      let tPrev = 0;
      let dPrev = dist(P[0], P[1]);
      for (let k = 1; k <= n; k++) {
        const t = k / n;
        evaluateCurve(c, t, P);
        const d = dist(P[0], P[1]);
        if (dPrev === 0) {
          evaluateCurve(c, tPrev, P);
          out.push(along(P[0], P[1]), tPrev);
        } else if (d !== 0 && d > 0 !== dPrev > 0) {
          let lo = tPrev;
          let hi = t;
          let dlo = dPrev;
          for (let it = 0; it < 60; it++) {
            const mid = 0.5 * (lo + hi);
            evaluateCurve(c, mid, P);
            const dm = dist(P[0], P[1]);
            if (dm === 0) {
              lo = hi = mid;
              break;
            }
            if (dm > 0 === dlo > 0) {
              lo = mid;
              dlo = dm;
            } else hi = mid;
          }
          const tc = 0.5 * (lo + hi);
          evaluateCurve(c, tc, P);
          out.push(along(P[0], P[1]), tc);
        }
        if (k === n && d === 0) out.push(along(P[0], P[1]), 1);
        tPrev = t;
        dPrev = d;
      }
      return;
    }
  }
}

/**
 * The stretches of the line o + v e (e a unit vector) between consecutive boundary crossings,
 * in order of v, each classed as material, hole or outside.
 */
export function stretchesAlongLine(domain: Domain, ox: number, oy: number, ex: number, ey: number): LineStretch[] {
  const vs: number[] = [];
  const dir: number[] = [];
  const edges: number[] = [];
  const ts: number[] = [];
  const tmp: number[] = [];
  for (const e of domain.edges) {
    tmp.length = 0;
    crossCurve(e.curve, ox, oy, ex, ey, tmp);
    for (let k = 0; k < tmp.length; k += 2) {
      curveDerivative(e.curve, tmp[k + 1], D);
      // Outward normal (D_y, -D_x); entering when e . n < 0.
      const en = ex * D[1] - ey * D[0];
      vs.push(tmp[k]);
      dir.push(en < 0 ? 1 : en > 0 ? -1 : 0);
      edges.push(e.id);
      ts.push(tmp[k + 1]);
    }
  }
  const order = vs.map((_v, i) => i).sort((a, b) => vs[a] - vs[b]);
  const tol = 1e-10 * domain.scale;
  const out: LineStretch[] = [];
  let kind: LineStretch['kind'] = 'outside';
  let vPrev = -Infinity;
  let ePrev = -1;
  let tPrev = 0;
  for (let g = 0; g < order.length; ) {
    // One event: the crossings within tol of the first.
    let h = g;
    let net = 0;
    let enter = -1;
    let leave = -1;
    while (h < order.length && vs[order[h]] - vs[order[g]] <= tol) {
      const i = order[h];
      net += dir[i];
      if (dir[i] > 0) enter = i;
      if (dir[i] < 0) leave = i;
      h++;
    }
    const v = vs[order[g]];
    if (net !== 0) {
      const next: LineStretch['kind'] = net > 0 ? 'material' : domain.edges[edges[leave]].loop === 0 ? 'outside' : 'hole';
      const at = net > 0 ? enter : leave;
      if (next !== kind) {
        if (Number.isFinite(vPrev)) out.push({ v0: vPrev, v1: v, edge0: ePrev, edge1: edges[at], t0: tPrev, t1: ts[at], kind });
        kind = next;
        vPrev = v;
        ePrev = edges[at];
        tPrev = ts[at];
      }
    }
    g = h;
  }
  return out;
}
