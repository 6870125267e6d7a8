/**
 * Delaunay refinement to a minimum angle and a size field.
 *
 * The method is Ruppert's (J. Ruppert, "A Delaunay refinement algorithm for quality
 * 2-dimensional mesh generation", J. Algorithms 18, 1995) in the form J. R. Shewchuk gives it
 * ("Delaunay refinement algorithms for triangular mesh generation", Comput. Geom. 22, 2002):
 *  - a boundary segment whose diametral circle holds a vertex on the material side is split;
 *  - a material triangle with an angle below the target, or too large for the size field, gets
 *    a new vertex at its circumcentre, or at its off-centre when that is closer to its shortest
 *    edge (A. Ungor, "Off-centers", LATIN 2004, LNCS 2976), unless that point would encroach a
 *    segment, which is then split instead;
 *  - segments meeting at a sharp input corner are split on concentric shells (powers of two of
 *    the distance from the corner), and skinny triangles that such a corner forces are left alone.
 * Split points are placed on the true curve, not on the chord.
 */
import { evaluateCurve } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';
import { AnalysisError } from '../model/errors.js';
import type { SizeField } from './sizefield.js';
import type { TriMesh } from './trimesh.js';

export interface RefineOptions {
  minAngleDeg: number;
  size: SizeField;
  /** refuse to go past this many vertices (a budget, reported when hit) */
  maxVertices: number;
  /** input corners sharper than this (in the material) are exempt from the angle test, degrees */
  sharpCornerDeg?: number;
}

export interface RefineStats {
  insertedInterior: number;
  segmentSplits: number;
  /** insertions given up because the cavity could not be built (counted, never hidden) */
  rejected: number;
  /** splits placed on the chord because the curve point could not be inserted */
  chordSplits: number;
  /** skinny triangles left alone because a sharp input corner forces them */
  exemptTriangles: number;
}

/**
 * Ratio of circumradius to the target edge length above which a triangle is too big. An
 * equilateral triangle of edge h has R = h / sqrt(3) = 0.577 h; the margin lets refinement stop
 * at edges of about the target length instead of overshooting to half of it.
 */
const SIZE_RATIO = 0.72;

/**
 * Input corners sharper than a limit, with the domain edges (arms) that meet at each. A skinny
 * triangle is forced by such a corner when its smallest angle sits at the corner, or when its
 * shortest edge joins the corner's two arms: refining it would only make another like it.
 */
export class SharpCorners {
  private readonly arm: Int32Array;
  constructor(
    private readonly domain: Domain,
    private readonly limit: number,
  ) {
    this.arm = new Int32Array(domain.edges.length * 2).fill(-1);
    domain.corners.forEach((c, i) => {
      if (c.materialAngle >= limit) return;
      this.arm[2 * c.edgeIn] = i;
      this.arm[2 * c.edgeOut + 1] = i;
    });
  }

  isSharp(corner: number): boolean {
    return corner >= 0 && this.domain.corners[corner].materialAngle < this.limit;
  }

  /** Does vertex (edge, corner) lie on an arm of sharp corner k (or at k itself)? */
  private onArm(edge: number, corner: number, k: number): boolean {
    if (corner >= 0) return corner === k;
    return edge >= 0 && (this.arm[2 * edge] === k || this.arm[2 * edge + 1] === k);
  }

  /**
   * oppCorner: corner at the smallest angle's vertex (-1 if none); the shortest edge joins
   * vertices (uEdge, uCorner) and (wEdge, wCorner), given as the domain edge they lie inside
   * (-1 for junctions) and the corner they are (-1 if none).
   */
  forces(oppCorner: number, uEdge: number, uCorner: number, wEdge: number, wCorner: number): boolean {
    if (this.isSharp(oppCorner)) return true;
    if (uEdge === wEdge && uEdge >= 0) return false;
    const cands = [uCorner, uEdge >= 0 ? this.arm[2 * uEdge] : -1, uEdge >= 0 ? this.arm[2 * uEdge + 1] : -1];
    for (const k of cands) {
      if (k >= 0 && this.isSharp(k) && this.onArm(uEdge, uCorner, k) && this.onArm(wEdge, wCorner, k) && !(uCorner === k && wCorner === k)) return true;
    }
    return false;
  }
}

export function refineMesh(m: TriMesh, domain: Domain, opts: RefineOptions): RefineStats {
  const sinMin = Math.sin((opts.minAngleDeg * Math.PI) / 180);
  const sharp = ((opts.sharpCornerDeg ?? 60) * Math.PI) / 180;
  const size = opts.size;
  const stats: RefineStats = { insertedInterior: 0, segmentSplits: 0, rejected: 0, chordSplits: 0, exemptTriangles: 0 };

  const corners = new SharpCorners(domain, sharp);
  const sharpVertex = (v: number) => corners.isSharp(m.vCorner[v]);

  // Queues.
  let triQ = new Int32Array(1024);
  let qHead = 0;
  let qTail = 0;
  const pushTri = (t: number) => {
    if (qTail + 2 > triQ.length) {
      const live = qTail - qHead;
      if (qHead > triQ.length / 2) triQ.copyWithin(0, qHead, qTail);
      else {
        const b = new Int32Array(triQ.length * 2);
        b.set(triQ.subarray(qHead, qTail));
        triQ = b;
      }
      qHead = 0;
      qTail = live;
    }
    triQ[qTail++] = t;
    triQ[qTail++] = m.tver[t];
  };
  const segQ: number[] = [];
  const sides = new Int32Array(4);
  const p = [0, 0];

  const isEncroached = (s: number) => {
    m.segmentSides(s, sides);
    const ax = m.px[m.segA[s]];
    const ay = m.py[m.segA[s]];
    const bx = m.px[m.segB[s]];
    const by = m.py[m.segB[s]];
    for (let k = 0; k < 2; k++) {
      const t = sides[2 * k];
      if (t < 0 || m.treg[t] !== 1) continue;
      const apex = m.tv[3 * t + sides[2 * k + 1]];
      const dx = m.px[apex];
      const dy = m.py[apex];
      if ((ax - dx) * (bx - dx) + (ay - dy) * (by - dy) < 0) return true;
    }
    return false;
  };

  const afterInsert = () => {
    for (let k = 0; k < m.fanN; k++) {
      const t = m.fan[k];
      if (m.treg[t] === 1) pushTri(t);
    }
  };

  const splitSegment = (s: number) => {
    const a = m.segA[s];
    const b = m.segB[s];
    const edge = domain.edges[m.segEdge[s]];
    const t0 = m.segT0[s];
    const t1 = m.segT1[s];
    let f = 0.5;
    if (edge.curve.kind === 'line') {
      const sa = sharpVertex(a);
      const sb = sharpVertex(b);
      if (sa !== sb) {
        // Concentric shells: the split lies a power of two away from the sharp corner.
        const len = Math.hypot(m.px[b] - m.px[a], m.py[b] - m.py[a]);
        let d = Math.pow(2, Math.round(Math.log2(len / 2)));
        d = Math.min(0.7 * len, Math.max(0.3 * len, d));
        f = sa ? d / len : 1 - d / len;
      }
    }
    const t = t0 + f * (t1 - t0);
    evaluateCurve(edge.curve, t, p);
    if (!m.splitSegmentAt(s, p[0], p[1], t)) {
      // Fall back to the chord point, which always lies inside the two triangles of the segment.
      if (!m.splitSegmentAt(s, m.px[a] + f * (m.px[b] - m.px[a]), m.py[a] + f * (m.py[b] - m.py[a]), t)) {
        stats.rejected++;
        return false;
      }
      stats.chordSplits++;
    }
    stats.segmentSplits++;
    segQ.push(s, m.ns - 1);
    afterInsert();
    return true;
  };

  /** 0 = fine, 1 = skinny, 2 = too big; writes the point to insert into ins. */
  const ins = [0, 0];
  const classify = (t: number): number => {
    const a = m.tv[3 * t];
    const b = m.tv[3 * t + 1];
    const c = m.tv[3 * t + 2];
    const ax = m.px[a];
    const ay = m.py[a];
    const bx = m.px[b] - ax;
    const by = m.py[b] - ay;
    const cx = m.px[c] - ax;
    const cy = m.py[c] - ay;
    const lab = bx * bx + by * by;
    const lac = cx * cx + cy * cy;
    const dbx = cx - bx;
    const dby = cy - by;
    const lbc = dbx * dbx + dby * dby;
    const det = 2 * (bx * cy - by * cx);
    const ox = (cy * lab - by * lac) / det;
    const oy = (bx * lac - cx * lab) / det;
    const r2 = ox * ox + oy * oy;
    const r = Math.sqrt(r2);
    // Shortest edge, the vertex opposite it (the smallest angle), and its end points.
    let lmin2 = lbc;
    let opp = a;
    let u = b;
    let w = c;
    if (lac < lmin2) {
      lmin2 = lac;
      opp = b;
      u = c;
      w = a;
    }
    if (lab < lmin2) {
      lmin2 = lab;
      opp = c;
      u = a;
      w = b;
    }
    const lmin = Math.sqrt(lmin2);
    const skinny = lmin < 2 * r * sinMin * (1 - 1e-12);
    if (skinny) {
      const exempt = corners.forces(m.vCorner[opp], m.vEdge[u], m.vCorner[u], m.vEdge[w], m.vCorner[w]);
      if (exempt) {
        stats.exemptTriangles++;
      } else {
        // Off-centre: on the bisector of the shortest edge, where the triangle it makes with
        // that edge has exactly the target angle; used when nearer than the circumcentre.
        const mx = (m.px[u] + m.px[w]) / 2;
        const my = (m.py[u] + m.py[w]) / 2;
        const ccx = ax + ox;
        const ccy = ay + oy;
        const dc = Math.hypot(ccx - mx, ccy - my);
        const tanHalf = Math.tan(Math.asin(sinMin) / 2);
        const doff = lmin / 2 / tanHalf;
        if (doff < dc && dc > 0) {
          ins[0] = mx + ((ccx - mx) * doff) / dc;
          ins[1] = my + ((ccy - my) * doff) / dc;
        } else {
          ins[0] = ccx;
          ins[1] = ccy;
        }
        return 1;
      }
    }
    const h = size.at(ax + (bx + cx) / 3, ay + (by + cy) / 3);
    if (r > SIZE_RATIO * h) {
      ins[0] = ax + ox;
      ins[1] = ay + oy;
      return 2;
    }
    return 0;
  };

  for (let s = 0; s < m.ns; s++) segQ.push(s);
  for (let t = 0; t < m.nt; t++) if (m.talive[t] && m.treg[t] === 1) pushTri(t);

  const encroached: number[] = [];
  for (;;) {
    if (m.nv > opts.maxVertices) {
      throw new AnalysisError(
        `mesh refinement passed its budget of ${opts.maxVertices} vertices`,
        'raise mesh.size or mesh.raiserSize, or check the geometry for features far smaller than the part',
      );
    }
    if (segQ.length > 0) {
      const s = segQ.pop()!;
      if (isEncroached(s)) splitSegment(s);
      continue;
    }
    if (qHead >= qTail) break;
    const t = triQ[qHead++];
    const ver = triQ[qHead++];
    if (!m.talive[t] || m.tver[t] !== ver) continue;
    const kind = classify(t);
    if (kind === 0) continue;
    const x = ins[0];
    const y = ins[1];
    const tc = m.locate(x, y, t);
    if (tc < 0) {
      stats.rejected++;
      continue;
    }
    if (m.walkCrossed >= 0) {
      // The new point lies beyond a boundary segment: split the segment instead.
      if (splitSegment(m.walkCrossed) && m.talive[t] && m.tver[t] === ver) pushTri(t);
      continue;
    }
    if (m.treg[tc] !== 1 || !m.findCavity(x, y, tc, -1, -1)) {
      stats.rejected++;
      continue;
    }
    encroached.length = 0;
    for (let k = 0; k < m.bN; k++) {
      const s = m.bSeg[k];
      if (s < 0) continue;
      const ax = m.px[m.bA[k]];
      const ay = m.py[m.bA[k]];
      const bx = m.px[m.bB[k]];
      const by = m.py[m.bB[k]];
      if ((ax - x) * (bx - x) + (ay - y) * (by - y) < 0) encroached.push(s);
    }
    if (encroached.length > 0) {
      let any = false;
      for (const s of encroached) any = splitSegment(s) || any;
      if (any && m.talive[t] && m.tver[t] === ver) pushTri(t);
      continue;
    }
    m.commitCavity(x, y, 0, -1, 0, -1);
    stats.insertedInterior++;
    afterInsert();
  }
  return stats;
}
