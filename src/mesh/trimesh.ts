/**
 * An incremental constrained Delaunay triangulation on flat typed arrays, for refinement.
 *
 * The whole bounding box is triangulated (material and void alike), so every point that can be
 * inserted, including a boundary point placed on a convex arc just outside its chord, lies
 * inside some triangle. Each triangle carries a region flag (1 material, 0 void).
 *
 *   triangle t: vertices tv[3t], tv[3t+1], tv[3t+2], counter-clockwise (y up);
 *   local edge i is the edge opposite local vertex i, from tv[3t+(i+1)%3] to tv[3t+(i+2)%3];
 *   tn[3t+i] is the triangle across edge i (-1 on the box hull);
 *   tseg[3t+i] is the boundary segment lying on edge i, or -1.
 *
 * Points are inserted by the Bowyer-Watson cavity method (A. Bowyer, Comput. J. 24, 1981;
 * D. F. Watson, Comput. J. 24, 1981), with the cavity stopped at constrained edges, which keeps
 * the triangulation constrained Delaunay (L. P. Chew, "Constrained Delaunay triangulations",
 * Algorithmica 4, 1989). The initial triangulation comes from cdt2d; it is never rebuilt.
 */
import cdt2d from 'cdt2d';
import { InternalError } from '../model/errors.js';
import { inCircleCcw, orientCcw } from '../geometry/predicates.js';

const NEXT = [1, 2, 0];
const PREV = [2, 0, 1];

export class TriMesh {
  // Vertices.
  nv = 0;
  px: Float64Array;
  py: Float64Array;
  /** domain edge a boundary vertex lies inside, -1 for interior vertices and junctions */
  vEdge: Int32Array;
  vParam: Float64Array;
  /** domain corner index for junction vertices, -1 otherwise */
  vCorner: Int32Array;
  /** 1 for points on the boundary (junctions included), 2 for the four box corners, 0 inside */
  vKind: Uint8Array;

  // Triangles.
  nt = 0;
  tv: Int32Array;
  tn: Int32Array;
  tseg: Int32Array;
  treg: Uint8Array;
  talive: Uint8Array;
  /** bumped each time a slot is (re)used, so queued references can be checked */
  tver: Int32Array;
  private tmark: Int32Array;
  private stamp = 0;
  private free: number[] = [];

  // Boundary segments.
  ns = 0;
  segA: Int32Array;
  segB: Int32Array;
  segEdge: Int32Array;
  segT0: Float64Array;
  segT1: Float64Array;
  /** some live triangle having the segment as an edge */
  segTri: Int32Array;

  // Cavity scratch.
  cav: Int32Array = new Int32Array(64);
  cavN = 0;
  bA: Int32Array = new Int32Array(64);
  bB: Int32Array = new Int32Array(64);
  bOut: Int32Array = new Int32Array(64);
  bSeg: Int32Array = new Int32Array(64);
  bReg: Uint8Array = new Uint8Array(64);
  bN = 0;
  /** the triangles made by the last commitCavity */
  fan: Int32Array = new Int32Array(64);
  fanN = 0;
  private vmark: Int32Array;
  private vstamp = 0;
  private startOf: Int32Array;
  /** the first boundary segment a walk crossed, or -1 */
  walkCrossed = -1;
  private rng = 12345;

  constructor(vertexCapacity: number, triangleCapacity: number, segmentCapacity: number) {
    this.px = new Float64Array(vertexCapacity);
    this.py = new Float64Array(vertexCapacity);
    this.vEdge = new Int32Array(vertexCapacity);
    this.vParam = new Float64Array(vertexCapacity);
    this.vCorner = new Int32Array(vertexCapacity);
    this.vKind = new Uint8Array(vertexCapacity);
    this.vmark = new Int32Array(vertexCapacity);
    this.startOf = new Int32Array(vertexCapacity);
    this.tv = new Int32Array(3 * triangleCapacity);
    this.tn = new Int32Array(3 * triangleCapacity);
    this.tseg = new Int32Array(3 * triangleCapacity);
    this.treg = new Uint8Array(triangleCapacity);
    this.talive = new Uint8Array(triangleCapacity);
    this.tver = new Int32Array(triangleCapacity);
    this.tmark = new Int32Array(triangleCapacity);
    this.segA = new Int32Array(segmentCapacity);
    this.segB = new Int32Array(segmentCapacity);
    this.segEdge = new Int32Array(segmentCapacity);
    this.segT0 = new Float64Array(segmentCapacity);
    this.segT1 = new Float64Array(segmentCapacity);
    this.segTri = new Int32Array(segmentCapacity);
  }

  // -------------------------------------------------------------------------------------------
  // Storage.

  private growVertices(): void {
    const cap = this.px.length * 2;
    this.px = grow(this.px, cap);
    this.py = grow(this.py, cap);
    this.vEdge = grow(this.vEdge, cap);
    this.vParam = grow(this.vParam, cap);
    this.vCorner = grow(this.vCorner, cap);
    this.vKind = grow(this.vKind, cap);
    this.vmark = grow(this.vmark, cap);
    this.startOf = grow(this.startOf, cap);
  }

  private growTriangles(): void {
    const cap = this.treg.length * 2;
    this.tv = grow(this.tv, 3 * cap);
    this.tn = grow(this.tn, 3 * cap);
    this.tseg = grow(this.tseg, 3 * cap);
    this.treg = grow(this.treg, cap);
    this.talive = grow(this.talive, cap);
    this.tver = grow(this.tver, cap);
    this.tmark = grow(this.tmark, cap);
  }

  private growSegments(): void {
    const cap = this.segA.length * 2;
    this.segA = grow(this.segA, cap);
    this.segB = grow(this.segB, cap);
    this.segEdge = grow(this.segEdge, cap);
    this.segT0 = grow(this.segT0, cap);
    this.segT1 = grow(this.segT1, cap);
    this.segTri = grow(this.segTri, cap);
  }

  addVertex(x: number, y: number, kind: number, edge: number, param: number, corner: number): number {
    if (this.nv === this.px.length) this.growVertices();
    const v = this.nv++;
    this.px[v] = x;
    this.py[v] = y;
    this.vKind[v] = kind;
    this.vEdge[v] = edge;
    this.vParam[v] = param;
    this.vCorner[v] = corner;
    return v;
  }

  addSegment(a: number, b: number, edge: number, t0: number, t1: number): number {
    if (this.ns === this.segA.length) this.growSegments();
    const s = this.ns++;
    this.segA[s] = a;
    this.segB[s] = b;
    this.segEdge[s] = edge;
    this.segT0[s] = t0;
    this.segT1[s] = t1;
    this.segTri[s] = -1;
    return s;
  }

  private allocTriangle(): number {
    let t: number;
    if (this.free.length > 0) t = this.free.pop()!;
    else {
      if (this.nt === this.treg.length) this.growTriangles();
      t = this.nt++;
    }
    this.talive[t] = 1;
    this.tver[t]++;
    return t;
  }

  /** Number of live triangles. */
  liveTriangles(): number {
    return this.nt - this.free.length;
  }

  // -------------------------------------------------------------------------------------------
  // Building from cdt2d.

  /**
   * Triangulates the box with cdt2d, the boundary segments as constraints, then links
   * neighbours, marks segments and floods the regions. Vertices and segments must be added first;
   * vertices 0..3 are the box corners.
   */
  triangulateInitial(): void {
    const pts: [number, number][] = new Array(this.nv);
    for (let i = 0; i < this.nv; i++) pts[i] = [this.px[i], this.py[i]];
    const edges: [number, number][] = new Array(this.ns);
    for (let s = 0; s < this.ns; s++) edges[s] = [this.segA[s], this.segB[s]];
    const tris = cdt2d(pts, edges);
    if (tris.length === 0) throw new InternalError('the triangulator returned no triangles for a cleaned boundary');
    const key = (a: number, b: number) => a * this.nv + b;
    const edgeMap = new Map<number, number>();
    for (const [a, b, c] of tris) {
      const t = this.allocTriangle();
      this.tv[3 * t] = a;
      this.tv[3 * t + 1] = b;
      this.tv[3 * t + 2] = c;
      if (orientCcw(this.px[a], this.py[a], this.px[b], this.py[b], this.px[c], this.py[c]) <= 0) {
        throw new InternalError(`the triangulator returned a triangle that is not counter-clockwise (${a}, ${b}, ${c})`);
      }
      for (let i = 0; i < 3; i++) {
        this.tn[3 * t + i] = -1;
        this.tseg[3 * t + i] = -1;
        const u = this.tv[3 * t + NEXT[i]];
        const w = this.tv[3 * t + PREV[i]];
        edgeMap.set(key(u, w), 3 * t + i);
      }
    }
    for (let t = 0; t < this.nt; t++) {
      for (let i = 0; i < 3; i++) {
        const u = this.tv[3 * t + NEXT[i]];
        const w = this.tv[3 * t + PREV[i]];
        const o = edgeMap.get(key(w, u));
        if (o !== undefined) this.tn[3 * t + i] = (o / 3) | 0;
      }
    }
    for (let s = 0; s < this.ns; s++) {
      const a = this.segA[s];
      const b = this.segB[s];
      const e1 = edgeMap.get(key(a, b));
      const e2 = edgeMap.get(key(b, a));
      if (e1 === undefined && e2 === undefined) {
        throw new InternalError(`boundary segment ${s} (${a}-${b}) is missing from the initial triangulation`);
      }
      if (e1 !== undefined) {
        this.tseg[e1] = s;
        this.segTri[s] = (e1 / 3) | 0;
      }
      if (e2 !== undefined) {
        this.tseg[e2] = s;
        if (this.segTri[s] < 0) this.segTri[s] = (e2 / 3) | 0;
      }
    }
    this.floodRegions();
  }

  /** Region parity: void outside, flipping across every boundary segment. */
  private floodRegions(): void {
    const seen = new Uint8Array(this.nt);
    const stack: number[] = [];
    // Start from a triangle touching box corner 0.
    let start = -1;
    for (let t = 0; t < this.nt && start < 0; t++) {
      if (this.tv[3 * t] === 0 || this.tv[3 * t + 1] === 0 || this.tv[3 * t + 2] === 0) start = t;
    }
    if (start < 0) throw new InternalError('no triangle touches the box corner');
    this.treg[start] = 0;
    seen[start] = 1;
    stack.push(start);
    while (stack.length) {
      const t = stack.pop()!;
      for (let i = 0; i < 3; i++) {
        const n = this.tn[3 * t + i];
        if (n < 0 || seen[n]) continue;
        seen[n] = 1;
        this.treg[n] = this.tseg[3 * t + i] >= 0 ? 1 - this.treg[t] : this.treg[t];
        stack.push(n);
      }
    }
    for (let t = 0; t < this.nt; t++) if (!seen[t]) throw new InternalError('the triangulation is not connected');
  }

  // -------------------------------------------------------------------------------------------
  // Queries.

  /** Local index (0..2) of the edge of t from u to w, or -1. */
  edgeIndex(t: number, u: number, w: number): number {
    for (let i = 0; i < 3; i++) {
      if (this.tv[3 * t + NEXT[i]] === u && this.tv[3 * t + PREV[i]] === w) return i;
    }
    return -1;
  }

  /**
   * Walks from triangle t towards (x, y) and returns the triangle containing it (a point on an
   * edge counts as inside either). Records the first boundary segment crossed in walkCrossed.
   */
  locate(x: number, y: number, t: number): number {
    this.walkCrossed = -1;
    const limit = 4 * this.nt + 100;
    for (let steps = 0; steps < limit; steps++) {
      this.rng = (this.rng * 1103515245 + 12345) & 0x7fffffff;
      const r = this.rng % 3;
      let moved = false;
      for (let kk = 0; kk < 3; kk++) {
        const i = (r + kk) % 3;
        const u = this.tv[3 * t + NEXT[i]];
        const w = this.tv[3 * t + PREV[i]];
        if (orientCcw(this.px[u], this.py[u], this.px[w], this.py[w], x, y) < 0) {
          const n = this.tn[3 * t + i];
          if (n < 0) return -1;
          if (this.walkCrossed < 0 && this.tseg[3 * t + i] >= 0) this.walkCrossed = this.tseg[3 * t + i];
          t = n;
          moved = true;
          break;
        }
      }
      if (!moved) return t;
    }
    throw new InternalError(`point location did not finish at (${x}, ${y})`);
  }

  // -------------------------------------------------------------------------------------------
  // Insertion.

  private pushCavity(t: number): void {
    if (this.cavN === this.cav.length) this.cav = grow(this.cav, this.cav.length * 2);
    this.cav[this.cavN++] = t;
    this.tmark[t] = this.stamp;
  }

  private pushBoundary(a: number, b: number, out: number, seg: number, reg: number): void {
    if (this.bN === this.bA.length) {
      const cap = this.bA.length * 2;
      this.bA = grow(this.bA, cap);
      this.bB = grow(this.bB, cap);
      this.bOut = grow(this.bOut, cap);
      this.bSeg = grow(this.bSeg, cap);
      this.bReg = grow(this.bReg, cap);
    }
    const k = this.bN++;
    this.bA[k] = a;
    this.bB[k] = b;
    this.bOut[k] = out;
    this.bSeg[k] = seg;
    this.bReg[k] = reg;
  }

  /**
   * Finds the Bowyer-Watson cavity of (x, y): the triangles reachable from the seeds, without
   * crossing a boundary segment (other than splitSeg), whose circumcircles contain the point.
   * Leaves the cavity in cav/cavN and its boundary in bA.. /bN. Returns false when the point
   * cannot be inserted (the cavity is not star-shaped from it and cannot be mended).
   */
  findCavity(x: number, y: number, seed0: number, seed1: number, splitSeg: number): boolean {
    this.stamp++;
    this.cavN = 0;
    this.pushCavity(seed0);
    if (seed1 >= 0 && seed1 !== seed0) this.pushCavity(seed1);
    const { tv, tn, tseg, px, py } = this;
    for (let i = 0; i < this.cavN; i++) {
      const t = this.cav[i];
      for (let k = 0; k < 3; k++) {
        const n = tn[3 * t + k];
        if (n < 0 || this.tmark[n] === this.stamp) continue;
        const sg = tseg[3 * t + k];
        if (sg >= 0 && sg !== splitSeg) continue;
        const a = tv[3 * n];
        const b = tv[3 * n + 1];
        const c = tv[3 * n + 2];
        if (inCircleCcw(px[a], py[a], px[b], py[b], px[c], py[c], x, y) > 0) this.pushCavity(n);
      }
    }
    // Boundary edges, mending the cavity where it is not star-shaped from the point.
    for (let attempt = 0; attempt < 8; attempt++) {
      this.bN = 0;
      let mended = false;
      for (let i = 0; i < this.cavN; i++) {
        const t = this.cav[i];
        for (let k = 0; k < 3; k++) {
          const n = tn[3 * t + k];
          if (n >= 0 && this.tmark[n] === this.stamp) continue;
          const a = tv[3 * t + NEXT[k]];
          const b = tv[3 * t + PREV[k]];
          const sg = tseg[3 * t + k];
          if (orientCcw(px[a], py[a], px[b], py[b], x, y) <= 0) {
            if (n < 0 || (sg >= 0 && sg !== splitSeg)) return false;
            this.pushCavity(n);
            mended = true;
            continue;
          }
          this.pushBoundary(a, b, n, sg === splitSeg ? -1 : sg, this.treg[t]);
        }
      }
      if (!mended) break;
      if (attempt === 7) return false;
    }
    // The cavity must be a disk with every vertex on its boundary (a triangulated polygon of
    // V vertices has V - 2 triangles), and its boundary one simple loop.
    if (this.bN !== this.cavN + 2) return false;
    this.vstamp++;
    for (let k = 0; k < this.bN; k++) {
      const a = this.bA[k];
      if (this.vmark[a] === this.vstamp) return false;
      this.vmark[a] = this.vstamp;
    }
    return true;
  }

  /**
   * Replaces the cavity found by findCavity with a fan around the new vertex and returns its
   * index. When splitSeg >= 0 the vertex splits that segment: the segment keeps its first half
   * and a new segment takes the second.
   */
  commitCavity(x: number, y: number, kind: number, edge: number, param: number, splitSeg: number): number {
    const v = this.addVertex(x, y, kind, edge, param, -1);
    for (let i = 0; i < this.cavN; i++) {
      const t = this.cav[i];
      this.talive[t] = 0;
      this.free.push(t);
    }
    if (this.fan.length < this.bN) this.fan = new Int32Array(2 * this.bN);
    this.fanN = this.bN;
    const fan = this.fan;
    for (let k = 0; k < this.bN; k++) {
      const t = this.allocTriangle();
      fan[k] = t;
      const a = this.bA[k];
      const b = this.bB[k];
      const out = this.bOut[k];
      const sg = this.bSeg[k];
      this.tv[3 * t] = a;
      this.tv[3 * t + 1] = b;
      this.tv[3 * t + 2] = v;
      this.tn[3 * t + 2] = out;
      this.tseg[3 * t] = -1;
      this.tseg[3 * t + 1] = -1;
      this.tseg[3 * t + 2] = sg;
      this.treg[t] = this.bReg[k];
      if (out >= 0) {
        const j = this.edgeIndex(out, b, a);
        if (j < 0) throw new InternalError('cavity neighbour lost its shared edge');
        this.tn[3 * out + j] = t;
      }
      if (sg >= 0) this.segTri[sg] = t;
      this.startOf[a] = t;
    }
    for (let k = 0; k < this.bN; k++) {
      const t = fan[k];
      const b = this.bB[k];
      const t2 = this.startOf[b]; // (b, c, v): its edge (v, b) is local 1
      this.tn[3 * t] = t2;
      this.tn[3 * t2 + 1] = t;
    }
    if (splitSeg >= 0) {
      const s = splitSeg;
      const a = this.segA[s];
      const b = this.segB[s];
      const s2 = this.addSegment(v, b, this.segEdge[s], param, this.segT1[s]);
      this.segB[s] = v;
      this.segT1[s] = param;
      this.markFanEdge(a, s);
      this.markFanEdge(b, s2);
    }
    return v;
  }

  /** Debug aid: region flags agree across free edges and differ across segments. */
  checkRegions(where: string): void {
    for (let t = 0; t < this.nt; t++) {
      if (!this.talive[t]) continue;
      for (let i = 0; i < 3; i++) {
        const n = this.tn[3 * t + i];
        if (n < 0) continue;
        const j = this.edgeIndex(n, this.tv[3 * t + PREV[i]], this.tv[3 * t + NEXT[i]]);
        if (j < 0) throw new InternalError(`${where}: neighbour link broken at ${t}/${i}`);
        if ((this.tseg[3 * t + i] >= 0) !== (this.tseg[3 * n + j] >= 0)) throw new InternalError(`${where}: segment marked on one side only at ${t}/${i}`);
        const differ = this.treg[t] !== this.treg[n];
        if (differ !== this.tseg[3 * t + i] >= 0) throw new InternalError(`${where}: region flags inconsistent at ${t}/${i} seg ${this.tseg[3 * t + i]}`);
      }
    }
  }

  /** Marks the fan edge between the new vertex and cavity vertex u as lying on segment s. */
  private markFanEdge(u: number, s: number): void {
    const t1 = this.startOf[u]; // (u, x, v): edge (v, u) is local 1
    const t0 = this.tn[3 * t1 + 1]; // (y, u, v): edge (u, v) is local 0
    this.tseg[3 * t1 + 1] = s;
    this.tseg[3 * t0] = s;
    this.segTri[s] = t1;
  }

  private sidesScratch = new Int32Array(4);

  /**
   * Splits boundary segment s at (x, y), curve parameter t of its domain edge: the segment keeps
   * its first half, a new segment (index ns - 1 afterwards) takes the second. Returns false,
   * changing nothing, when the point cannot be inserted.
   */
  splitSegmentAt(s: number, x: number, y: number, t: number): boolean {
    this.segmentSides(s, this.sidesScratch);
    if (!this.findCavity(x, y, this.sidesScratch[0], this.sidesScratch[2], s)) return false;
    this.commitCavity(x, y, 1, this.segEdge[s], t, s);
    return true;
  }

  /** The triangles on either side of segment s: [t, local edge, other t, its local edge]. */
  segmentSides(s: number, out: Int32Array): void {
    const a = this.segA[s];
    const b = this.segB[s];
    let t = this.segTri[s];
    if (t < 0 || !this.talive[t]) throw new InternalError(`segment ${s} has no live triangle`);
    let i = this.edgeIndex(t, a, b);
    if (i < 0) i = this.edgeIndex(t, b, a);
    if (i < 0 || this.tseg[3 * t + i] !== s) throw new InternalError(`segment ${s} is not on its triangle`);
    const n = this.tn[3 * t + i];
    out[0] = t;
    out[1] = i;
    out[2] = n;
    out[3] = n >= 0 ? this.edgeIndex(n, this.tv[3 * t + PREV[i]], this.tv[3 * t + NEXT[i]]) : -1;
  }
}

function grow<T extends Float64Array | Int32Array | Uint8Array>(a: T, cap: number): T {
  const b = new (a.constructor as new (n: number) => T)(cap);
  b.set(a);
  return b;
}
