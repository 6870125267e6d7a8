/**
 * The net section of a raiser: the cut with the least material among the straight cuts that
 * touch the raiser and run across the local flow of stress.
 *
 * The flow at the raiser is the principal direction of the stress at its peak (along the
 * boundary, on a free edge). Cuts are lines across it, turned by up to CUT_TURN either way, at
 * every offset that still meets the raiser; the cut is the whole line from outer boundary to
 * outer boundary through any holes (src/post/section.ts). Of these, the one with the least
 * material is the raiser's net section: through the centre of a hole across a strip (W - d), at
 * the root of a notch, at the tangent point of a shoulder fillet on its narrow side (d), which
 * are the sections the published charts use. Ties (a slot's straight sides) go to the cut
 * nearest the peak. Turning is limited so that, at an inside corner between two arms, the cut
 * stays across the arm whose flow the peak belongs to.
 *
 * The search is a coarse scan of directions (the flow's normal, every 5 degrees, and the normals
 * of the outline's straight edges) and offsets, then golden-section refinement of the offset and
 * of the direction. It gives the best cut of every direction, least material first; the first of
 * them that carries load is the net section (src/post/kt.ts). Its results are kept per raiser and
 * rounded peak position and direction, so the meshes of one series, whose peaks agree, search
 * once.
 */
import { curveTangent, evaluateCurve } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';
import { stretchesAlongLine } from '../geometry/line-cross.js';
import type { Raiser } from './raisers.js';
import { makeCut, type Cut } from './section.js';

/** How far a cut may turn from the normal of the flow at the peak, radians. */
const CUT_TURN = (40 * Math.PI) / 180;
/** A cut square to a straight edge of the outline is preferred when its material is within this fraction of the least (our choice: 1% of the nominal stress). */
export const ALIGNED_SLACK = 0.01;

export interface RaiserCut {
  cut: Cut;
  /** v along the cut where it meets the raiser, nearest the peak */
  vRaiser: number;
  /** the cut is square to a straight edge of the outline */
  aligned: boolean;
}

/** The principal direction of the in-plane stress with the largest magnitude (unit vector). */
export function flowDirection(sxx: number, syy: number, sxy: number, measure: string): [number, number] {
  const c = 0.5 * (sxx + syy);
  const r = Math.hypot(0.5 * (sxx - syy), sxy);
  const s1 = c + r;
  const s2 = c - r;
  const s = measure === 'min-principal' ? s2 : measure === 'max-principal' ? s1 : Math.abs(s1) >= Math.abs(s2) ? s1 : s2;
  // Eigenvector of [sxx sxy; sxy syy] for s.
  let vx = sxy;
  let vy = s - sxx;
  if (Math.hypot(vx, vy) <= 1e-12 * (Math.abs(s) + Math.abs(sxx) + 1e-300)) {
    vx = s - syy;
    vy = sxy;
  }
  const l = Math.hypot(vx, vy);
  if (!(l > 0)) return [1, 0];
  return [vx / l, vy / l];
}

export class RaiserCutFinder {
  private readonly cache = new Map<string, RaiserCut[]>();
  /** directions square to the outline's longer straight edges, one per 0.1 degree */
  private readonly straightNormals: number[] = [];
  /** convex corners by their two edges, "in:out" */
  private readonly convex = new Set<string>();

  constructor(
    private readonly domain: Domain,
    private readonly thickness: number,
  ) {
    // Only edges of at least 1% of the part count: a curve drawn as many short segments
    // would otherwise add a direction per segment.
    const seen = new Set<number>();
    for (const id of domain.loops[0].edges) {
      const c = domain.edges[id].curve;
      if (c.kind !== 'line' || Math.hypot(c.x1 - c.x0, c.y1 - c.y0) < 0.01 * domain.scale) continue;
      const a = mod(Math.atan2(c.x1 - c.x0, -(c.y1 - c.y0)), Math.PI);
      const key = Math.round(a / ((0.1 * Math.PI) / 180));
      if (seen.has(key)) continue;
      seen.add(key);
      this.straightNormals.push(a);
    }
    for (const c of domain.corners) if (c.materialAngle < Math.PI) this.convex.add(`${c.edgeIn}:${c.edgeOut}`);
  }

  /**
   * The cuts that may be the raiser's net section, for a peak at (px, py) with the flow along
   * (fx, fy): the least material cut for every direction scanned, least material first (empty
   * when no cut across the flow meets the raiser in material). The first that carries load is
   * the net section (src/post/kt.ts): a cut that only shaves off an unloaded corner next to the
   * raiser has little material but carries nothing.
   */
  find(raiser: Raiser, px: number, py: number, fx: number, fy: number): RaiserCut[] {
    const scale = this.domain.scale;
    // Cut direction angle (of e), modulo pi.
    const base = Math.atan2(fx, -fy);
    const key = `${raiser.index}:${Math.round(px / (1e-4 * scale))}:${Math.round(py / (1e-4 * scale))}:${Math.round(mod(base, Math.PI) / 0.01)}`;
    if (this.cache.has(key)) return this.cache.get(key)!;
    const found = this.search(raiser, px, py, base);
    this.cache.set(key, found);
    return found;
  }

  private search(raiser: Raiser, px: number, py: number, base: number): RaiserCut[] {
    const scale = this.domain.scale;
    const samples = raiserSamples(this.domain, raiser);
    const angles: number[] = [];
    for (let k = -8; k <= 8; k++) angles.push(base + (k * CUT_TURN) / 8);
    // The directions square to straight edges within reach, nearest the flow's normal first, at
    // most 16 (a part of many edges at many angles is searched by the even scan).
    const aligned = this.straightNormals
      .map((a) => base + wrap(a - base))
      .filter((a) => Math.abs(a - base) <= CUT_TURN)
      .sort((p, q) => Math.abs(p - base) - Math.abs(q - base))
      .slice(0, 16);
    angles.push(...aligned);
    type Best = { L: number; dist: number; angle: number; u: number; rc: Omit<RaiserCut, 'aligned'> };
    const better = (a: Best, b: Best | null) => !b || a.L < b.L * (1 - 1e-9) || (a.L <= b.L * (1 + 1e-9) && a.dist < b.dist);
    const evalAt = (angle: number, u: number): Best | null => {
      const ex = Math.cos(angle);
      const ey = Math.sin(angle);
      // The line: points p with (p - P) . d = u, d = (ey, -ex); its origin is P moved u along d.
      const ox = px + u * ey;
      const oy = py - u * ex;
      const rc = this.cutTouching(raiser, ox, oy, ex, ey);
      if (!rc) return null;
      const [tx, ty] = [ox + rc.vRaiser * ex, oy + rc.vRaiser * ey];
      return { L: rc.cut.length, dist: Math.hypot(tx - px, ty - py), angle, u, rc };
    };
    const range = (angle: number): [number, number] => {
      const dx = Math.sin(angle);
      const dy = -Math.cos(angle);
      let lo = Infinity;
      let hi = -Infinity;
      for (let i = 0; i < samples.length; i += 2) {
        const u = (samples[i] - px) * dx + (samples[i + 1] - py) * dy;
        lo = Math.min(lo, u);
        hi = Math.max(hi, u);
      }
      const eps = 1e-9 * scale;
      return [lo + eps, hi - eps];
    };
    const scanned: Best[] = [];
    for (const angle of angles) {
      const [lo, hi] = range(angle);
      let local: Best | null = null;
      const offsets = [0];
      for (let k = 0; k <= 24; k++) offsets.push(lo + ((hi - lo) * k) / 24);
      for (const u of offsets) {
        if (u < lo || u > hi) continue;
        const r = evalAt(angle, u);
        if (r && better(r, local)) local = r;
      }
      if (local) scanned.push(local);
    }
    if (scanned.length === 0) return [];
    scanned.sort((a, b) => (better(a, b) ? -1 : 1));
    // Refine the offset of every direction's best, then the direction of the best of all.
    const refineOffset = (angle: number, start: Best, iters: number): Best => {
      const [lo, hi] = range(angle);
      const step = (hi - lo) / 24;
      let cur = start;
      const g = golden((u) => evalAt(angle, u)?.L ?? Infinity, Math.max(lo, start.u - step), Math.min(hi, start.u + step), iters);
      const r = evalAt(angle, g);
      if (r && r.L < cur.L * (1 - 1e-12)) cur = r;
      return cur;
    };
    const refined = scanned.map((s) => refineOffset(s.angle, s, 40));
    refined.sort((a, b) => (better(a, b) ? -1 : 1));
    const b0 = refined[0];
    const a = golden(
      (angle) => {
        const s = evalAt(angle, b0.u);
        if (!s) return Infinity;
        return refineOffset(angle, s, 20).L;
      },
      b0.angle - CUT_TURN / 8,
      b0.angle + CUT_TURN / 8,
      24,
    );
    if (Math.abs(wrap(a - base)) <= CUT_TURN) {
      const s = evalAt(a, b0.u);
      if (s) {
        const r = refineOffset(a, s, 40);
        if (r.L < b0.L * (1 - 1e-9)) refined.unshift(r);
      }
    }
    const isAligned = (angle: number) => aligned.some((b) => Math.abs(wrap(b - angle)) < 1e-9);
    const out: RaiserCut[] = [];
    for (const r of refined) {
      const dup = out.some((o) => Math.abs(o.cut.length - r.L) <= 1e-9 * r.L && Math.abs(wrap(Math.atan2(o.cut.ey, o.cut.ex) - r.angle)) < 1e-6);
      if (!dup) out.push({ ...r.rc, aligned: isAligned(r.angle) });
    }
    return out;
  }

  /**
   * True when a single ligament ends on two consecutive edges of one loop that meet at a convex
   * corner: the line only cuts that corner off, and the piece it separates carries nothing.
   */
  private clipsCorner(e0: number, e1: number): boolean {
    return e0 >= 0 && e1 >= 0 && (this.convex.has(`${e0}:${e1}`) || this.convex.has(`${e1}:${e0}`));
  }

  /** The cut along the line o + v e that meets the raiser in material, the meeting nearest o. */
  private cutTouching(raiser: Raiser, ox: number, oy: number, ex: number, ey: number): Omit<RaiserCut, 'aligned'> | null {
    const st = stretchesAlongLine(this.domain, ox, oy, ex, ey);
    const mine = new Set(raiser.edges);
    let best: Omit<RaiserCut, 'aligned'> | null = null;
    let bestAbs = Infinity;
    let i = 0;
    while (i < st.length) {
      if (st[i].kind !== 'material') {
        i++;
        continue;
      }
      // A chunk: material stretches joined across holes.
      let j = i;
      while (j + 2 < st.length && st[j + 1].kind === 'hole' && st[j + 2].kind === 'material') j += 2;
      const lig: number[] = [];
      const edges: number[] = [];
      let touch = NaN;
      let touchAbs = Infinity;
      for (let k = i; k <= j; k += 2) {
        lig.push(st[k].v0, st[k].v1);
        edges.push(st[k].edge0, st[k].edge1);
        for (const [v, e, t] of [
          [st[k].v0, st[k].edge0, st[k].t0],
          [st[k].v1, st[k].edge1, st[k].t1],
        ]) {
          if (mine.has(e) && Math.abs(v) < touchAbs && crossesSquarely(this.domain, e, t, ex, ey)) {
            touchAbs = Math.abs(v);
            touch = v;
          }
        }
      }
      if (touchAbs < bestAbs && !(i === j && this.clipsCorner(st[i].edge0, st[i].edge1))) {
        bestAbs = touchAbs;
        best = { cut: makeCut(ox, oy, ex, ey, lig, edges, this.thickness), vRaiser: touch };
      }
      i = j + 1;
    }
    return best;
  }
}

/**
 * True when the line (along e) meets the edge at parameter t within CUT_TURN of the edge's
 * normal: a cut that only grazes the raiser's boundary does not cross it.
 */
function crossesSquarely(domain: Domain, edge: number, t: number, ex: number, ey: number): boolean {
  curveTangent(domain.edges[edge].curve, t, TAN);
  // |sin| of the angle between the line and the tangent.
  return Math.abs(ex * TAN[1] - ey * TAN[0]) >= Math.cos(CUT_TURN) - 1e-12;
}

const TAN = [0, 0];

/** Points along the raiser's edges, x, y pairs (17 per edge). */
function raiserSamples(domain: Domain, raiser: Raiser): number[] {
  const out: number[] = [];
  const p = [0, 0];
  for (const id of raiser.edges) {
    for (let k = 0; k <= 16; k++) {
      evaluateCurve(domain.edges[id].curve, k / 16, p);
      out.push(p[0], p[1]);
    }
  }
  return out;
}

/** Golden-section search for the least f on [a, b]. */
function golden(f: (x: number) => number, a: number, b: number, iters: number): number {
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a);
  let x2 = a + g * (b - a);
  let f1 = f(x1);
  let f2 = f(x2);
  for (let it = 0; it < iters; it++) {
    if (f1 <= f2) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - g * (b - a);
      f1 = f(x1);
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + g * (b - a);
      f2 = f(x2);
    }
  }
  return f1 <= f2 ? x1 : x2;
}

function mod(a: number, m: number): number {
  return a - Math.floor(a / m) * m;
}

/** An angle difference brought into (-pi/2, pi/2]: cut directions are lines, not arrows. */
function wrap(a: number): number {
  let d = mod(a + Math.PI / 2, Math.PI) - Math.PI / 2;
  if (d <= -Math.PI / 2) d += Math.PI;
  return d;
}

