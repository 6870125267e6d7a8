/**
 * The mesh pipeline: size field -> boundary points -> boundary check -> initial constrained
 * triangulation (cdt2d, once) -> Delaunay refinement in place -> compact linear mesh ->
 * optional quadratic upgrade with midside nodes on the true curves -> mesh check.
 */
import { curveTurn, evaluateCurve } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';
import { findContacts } from '../geometry/intersect.js';
import { AnalysisError, InternalError, ModelTooLargeError } from '../model/errors.js';
import { estimateAnalysisBytes, estimateTriangles } from './estimate.js';
import { discretiseBoundary, type BoundaryPoints, type HardPoint } from './boundary.js';
import { checkMesh } from './check.js';
import { refineMesh, SharpCorners } from './refine.js';
import { buildSizeField, type SizeField, type SizeOptions } from './sizefield.js';
import { TriMesh } from './trimesh.js';
import { domainToFrame, nodesFromFrame, partFrame } from './frame.js';
import type { Mesh, MeshStats } from './types.js';

export interface MeshOptions extends SizeOptions {
  minAngleDeg?: number;
  maxVertices?: number;
  /** boundary points that must be nodes (pins, point supports) */
  hardPoints?: readonly HardPoint[];
  /** refuse, before meshing, a model whose analysis is estimated to need more memory than this (bytes) */
  maxBytes?: number;
}

export interface MeshResult {
  mesh: Mesh;
  stats: MeshStats;
  size: SizeField;
}

/**
 * Meshes the domain in the part's own frame (src/mesh/frame.ts), so that where the part lies and
 * how large it is written change nothing; the mesh and size field come back in model coordinates.
 */
export function generateMesh(model: Domain, modelOpts: MeshOptions): MeshResult {
  const frame = partFrame(model);
  const { s } = frame;
  // The model point of frame point (x, y).
  const mx = (x: number) => frame.ax + (frame.cx + s * x);
  const my = (y: number) => frame.ay + (frame.cy + s * y);
  const domain = domainToFrame(model, frame);
  const limit = modelOpts.limit;
  const opts: MeshOptions = {
    ...modelOpts,
    size: modelOpts.size === undefined ? undefined : modelOpts.size / s,
    raiserSize: modelOpts.raiserSize === undefined ? undefined : modelOpts.raiserSize / s,
    limit: limit ? { at: (x: number, y: number) => limit.at(mx(x), my(y)) / s } : undefined,
  };
  const r = meshInFrame(domain, opts);
  nodesFromFrame(r.mesh.nodes, frame);
  placeBoundaryNodes(r.mesh, model);
  return { ...r, size: r.size.fromFrame(frame.ax + frame.cx, frame.ay + frame.cy, s, model.bbox, limit) };
}

/**
 * Boundary nodes placed again on the model's own curves, at their curve parameters: a node of
 * an edge on x = 0 then has x = 0 exactly, and a junction of two straight edges is exactly their
 * shared vertex, as they were written (mapping back from the frame would leave a last-bit
 * rounding). Curves first, straight edges last, so a junction of a line and an arc takes the
 * line's exact end. A midside node of a straight boundary edge is the midpoint of its ends.
 */
function placeBoundaryNodes(mesh: Mesh, model: Domain): void {
  const p = [0, 0];
  const n = mesh.nodes;
  for (const lines of [false, true]) {
    for (let s = 0; s < mesh.nBEdges; s++) {
      const c = model.edges[mesh.bEdgeDomain[s]].curve;
      if ((c.kind === 'line') !== lines) continue;
      const a = mesh.bEdges[3 * s];
      const b = mesh.bEdges[3 * s + 1];
      const m = mesh.bEdges[3 * s + 2];
      const ta = mesh.bEdgeT[2 * s];
      const tb = mesh.bEdgeT[2 * s + 1];
      evaluateCurve(c, ta, p);
      n[2 * a] = p[0];
      n[2 * a + 1] = p[1];
      evaluateCurve(c, tb, p);
      n[2 * b] = p[0];
      n[2 * b + 1] = p[1];
      if (m >= 0 && !lines) {
        evaluateCurve(c, 0.5 * (ta + tb), p);
        n[2 * m] = p[0];
        n[2 * m + 1] = p[1];
      }
    }
  }
  // Midside nodes of straight boundary edges, from their (now exact) ends.
  for (let s = 0; s < mesh.nBEdges; s++) {
    const m = mesh.bEdges[3 * s + 2];
    if (m < 0 || model.edges[mesh.bEdgeDomain[s]].curve.kind !== 'line') continue;
    const a = mesh.bEdges[3 * s];
    const b = mesh.bEdges[3 * s + 1];
    n[2 * m] = 0.5 * (n[2 * a] + n[2 * b]);
    n[2 * m + 1] = 0.5 * (n[2 * a + 1] + n[2 * b + 1]);
  }
}

/** An amount of memory in GB to one decimal, or in MB below a tenth of a GB (so a small limit never reads "0.0 GB"). */
function formatMemory(bytes: number): string {
  return bytes >= 0.1 * 2 ** 30 ? `${(bytes / 2 ** 30).toFixed(1)} GB` : `${(bytes / 2 ** 20).toPrecision(2)} MB`;
}

function meshInFrame(domain: Domain, opts: MeshOptions): MeshResult {
  const t0 = performance.now();
  const size = buildSizeField(domain, opts);
  const estimated = estimateTriangles(domain, size);
  size.tuneGrid(estimated);
  if (opts.maxBytes !== undefined) {
    // Refused only when not even the iterative solver (no factor) would fit; the solver chooses
    // between direct and iterative once the factor's size is known.
    const bytes = estimateAnalysisBytes(estimated, opts.order, 'iterative');
    if (bytes > opts.maxBytes) {
      throw new ModelTooLargeError(
        'mesh',
        `the mesh would have about ${estimated < 1e5 ? Number(estimated.toPrecision(2)) : estimated.toExponential(1)} triangles and the analysis would need about ${formatMemory(bytes)}, more than the limit of ${formatMemory(opts.maxBytes)}`,
        'raise mesh.size or mesh.raiserSize (or mesh.grading), or raise the limit with --max-memory <GB>',
      );
    }
  }
  const boundary = discretiseBoundary(domain, size, opts.hardPoints);
  checkBoundary(domain, boundary);
  const t1 = performance.now();

  const tm = triangulateBoundary(domain, boundary);
  const t2 = performance.now();

  const refineStats = refineMesh(tm, domain, {
    minAngleDeg: opts.minAngleDeg ?? 25,
    size,
    maxVertices: opts.maxVertices ?? 4_000_000,
  });
  const t3 = performance.now();

  const linear = extractLinear(tm);
  const mesh = opts.order === 2 ? upgradeToQuadratic(linear, domain) : linear;
  const quality = checkMesh(mesh, domain);
  const t4 = performance.now();
  return {
    mesh,
    size,
    stats: {
      minAngleDeg: quality.minAngleDeg,
      maxAngleDeg: quality.maxAngleDeg,
      minAngleUnforcedDeg: minUnforcedAngle(mesh, domain, opts.minAngleDeg ?? 25),
      triangles: mesh.nElements,
      vertices: mesh.nVertices,
      timeMs: { boundary: t1 - t0, triangulate: t2 - t1, refine: t3 - t2, finish: t4 - t3, total: t4 - t0 },
      refine: refineStats,
      estimatedTriangles: estimated,
    },
  };
}

/** Fewer boundary points go to cdt2d: one in this many along an edge (its in-circle test is exact and slow). */
const COARSE_STRIDE = 8;

/**
 * The initial constrained triangulation of the boundary, in the box. cdt2d triangulates a
 * coarse subset of the boundary points (junctions, and a few points per edge, enough that no
 * chord turns more than 45 degrees); the other points are then inserted by splitting the
 * segments in place, which is cheap. When the coarse polygon would come too close to another
 * part of the boundary, or an insertion cannot be made, all points go to cdt2d instead.
 */
function triangulateBoundary(domain: Domain, b: BoundaryPoints): TriMesh {
  const nb = b.xy.length / 2;
  const ns = b.segments.length / 2;
  // Choose the coarse points: per domain edge, an even subset of its run of segments.
  const keep = new Uint8Array(nb);
  for (let s = 0; s < ns; ) {
    const edge = b.segEdge[s];
    let e = s;
    while (e < ns && b.segEdge[e] === edge) e++;
    const n = e - s;
    const c = domain.edges[edge].curve;
    const minPieces = c.kind === 'line' ? 1 : Math.ceil(curveTurn(c) / (Math.PI / 4));
    const pieces = Math.min(n, Math.max(minPieces, Math.ceil(n / COARSE_STRIDE), c.kind === 'line' ? 1 : 3));
    for (let k = 0; k <= pieces; k++) {
      const j = s + Math.round((k * n) / pieces);
      keep[j < e ? b.segments[2 * j] : b.segments[2 * (e - 1) + 1]] = 1;
    }
    s = e;
  }
  for (let i = 0; i < nb; i++) if (b.edge[i] < 0) keep[i] = 1;
  // Coarse segments and the fine points each one stands for.
  const coarseSegs: number[] = [];
  const runs: number[][] = [];
  for (let s = 0; s < ns; ) {
    const a = b.segments[2 * s];
    const inner: number[] = [];
    let e = s;
    while (!keep[b.segments[2 * e + 1]]) {
      inner.push(b.segments[2 * e + 1]);
      e++;
    }
    coarseSegs.push(a, b.segments[2 * e + 1], s, e);
    runs.push(inner);
    s = e + 1;
  }
  const nc = coarseSegs.length / 4;
  // The coarse polygon must stay clear of the rest of the boundary by the distance its chords
  // stray from the fine points they stand for.
  const cxy: number[] = [];
  const index = new Int32Array(nb).fill(-1);
  for (let i = 0; i < nb; i++) if (keep[i]) {
    index[i] = cxy.length / 2;
    cxy.push(b.xy[2 * i], b.xy[2 * i + 1]);
  }
  const csegs = new Int32Array(2 * nc);
  const cloop = new Int32Array(nc);
  const slack = new Float64Array(nc);
  for (let k = 0; k < nc; k++) {
    const a = coarseSegs[4 * k];
    const z = coarseSegs[4 * k + 1];
    csegs[2 * k] = index[a];
    csegs[2 * k + 1] = index[z];
    cloop[k] = domain.edges[b.segEdge[coarseSegs[4 * k + 2]]].loop;
    const ax = b.xy[2 * a];
    const ay = b.xy[2 * a + 1];
    const len = Math.hypot(b.xy[2 * z] - ax, b.xy[2 * z + 1] - ay);
    for (const p of runs[k]) {
      const d = Math.abs((b.xy[2 * z] - ax) * (b.xy[2 * p + 1] - ay) - (b.xy[2 * z + 1] - ay) * (b.xy[2 * p] - ax)) / len;
      slack[k] = Math.max(slack[k], d);
    }
  }
  const clear = findContacts({ xy: Float64Array.from(cxy), segs: csegs, segLoop: cloop, segSlack: slack }, 1e-9 * domain.scale, 1).length === 0;
  if (clear) {
    const tm = boxTriangulation(domain, b, keep, coarseSegs);
    let ok = true;
    const p = [0, 0];
    for (let k = 0; k < nc && ok; k++) {
      let seg = k; // coarse segment k was added as segment k
      for (const q of runs[k]) {
        const t = b.param[q];
        p[0] = b.xy[2 * q];
        p[1] = b.xy[2 * q + 1];
        // Segment seg ends at the coarse end point; its first half keeps the index.
        if (!tm.splitSegmentAt(seg, p[0], p[1], t)) {
          ok = false;
          break;
        }
        seg = tm.ns - 1;
      }
    }
    if (ok) return tm;
  }
  const all = new Uint8Array(nb).fill(1);
  const fine: number[] = [];
  for (let s = 0; s < ns; s++) fine.push(b.segments[2 * s], b.segments[2 * s + 1], s, s);
  return boxTriangulation(domain, b, all, fine);
}

/** A TriMesh of the box corners and the kept boundary points, triangulated by cdt2d. */
function boxTriangulation(domain: Domain, b: BoundaryPoints, keep: Uint8Array, segs: number[]): TriMesh {
  const nb = b.xy.length / 2;
  const tm = new TriMesh(Math.max(1024, 4 * nb), Math.max(2048, 8 * nb), Math.max(1024, 2 * nb));
  // Box corners, well outside the part so every boundary point lies strictly inside.
  const [x0, y0, x1, y1] = domain.bbox;
  const pad = 0.1 * domain.scale;
  tm.addVertex(x0 - pad, y0 - pad, 2, -1, 0, -1);
  tm.addVertex(x1 + pad, y0 - pad, 2, -1, 0, -1);
  tm.addVertex(x1 + pad, y1 + pad, 2, -1, 0, -1);
  tm.addVertex(x0 - pad, y1 + pad, 2, -1, 0, -1);
  const index = new Int32Array(nb).fill(-1);
  for (let i = 0; i < nb; i++) {
    if (!keep[i]) continue;
    index[i] = tm.addVertex(b.xy[2 * i], b.xy[2 * i + 1], 1, b.edge[i], b.param[i], b.corner[i]);
  }
  for (let k = 0; k < segs.length / 4; k++) {
    const first = segs[4 * k + 2];
    const last = segs[4 * k + 3];
    tm.addSegment(index[segs[4 * k]], index[segs[4 * k + 1]], b.segEdge[first], b.segT0[first], b.segT1[last]);
  }
  tm.triangulateInitial();
  return tm;
}

/** The boundary polygon must be clean before it goes to cdt2d, which would fail silently. */
function checkBoundary(domain: Domain, b: BoundaryPoints): void {
  const ns = b.segments.length / 2;
  const segLoop = new Int32Array(ns);
  for (let s = 0; s < ns; s++) segLoop[s] = domain.edges[b.segEdge[s]].loop;
  const contacts = findContacts({ xy: b.xy, segs: b.segments, segLoop, segSlack: new Float64Array(ns) }, 1e-9 * domain.scale, 1);
  if (contacts.length > 0) {
    const c = contacts[0];
    const l1 = domain.loops[c.loop1].label;
    const l2 = domain.loops[c.loop2].label;
    throw new AnalysisError(
      `the boundary points of the ${l1}${c.loop1 === c.loop2 ? '' : ` and the ${l2}`} come too close near (${c.x.toPrecision(5)}, ${c.y.toPrecision(5)}) for the element size there`,
      'use a smaller mesh.size or mesh.raiserSize, or widen the gap',
    );
  }
}

/** The live material triangles of tm, sorted by the Hilbert index of their centroids. */
function hilbertOrder(tm: TriMesh): Int32Array {
  let nTri = 0;
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  // the box of the material triangles' corners (not of every vertex the triangulation holds)
  for (let t = 0; t < tm.nt; t++) {
    if (!tm.talive[t] || tm.treg[t] !== 1) continue;
    nTri++;
    for (let i = 0; i < 3; i++) {
      const v = tm.tv[3 * t + i];
      x0 = Math.min(x0, tm.px[v]);
      x1 = Math.max(x1, tm.px[v]);
      y0 = Math.min(y0, tm.py[v]);
      y1 = Math.max(y1, tm.py[v]);
    }
  }
  if (nTri >= 2 ** 23) throw new InternalError(`too many triangles to order (${nTri})`);
  // key * 2^23 + t is exact in a double: the 30-bit key and a 23-bit triangle number
  const GRID = 2 ** 15;
  const scale = (GRID - 1) / Math.max(x1 - x0, y1 - y0, Number.MIN_VALUE);
  const packed = new Float64Array(nTri);
  let k = 0;
  for (let t = 0; t < tm.nt; t++) {
    if (!tm.talive[t] || tm.treg[t] !== 1) continue;
    const a = tm.tv[3 * t];
    const b = tm.tv[3 * t + 1];
    const c = tm.tv[3 * t + 2];
    const cx = Math.min(GRID - 1, Math.max(0, Math.round(((tm.px[a] + tm.px[b] + tm.px[c]) / 3 - x0) * scale)));
    const cy = Math.min(GRID - 1, Math.max(0, Math.round(((tm.py[a] + tm.py[b] + tm.py[c]) / 3 - y0) * scale)));
    packed[k++] = hilbertIndex(GRID, cx, cy) * 2 ** 23 + t;
  }
  packed.sort();
  const order = new Int32Array(nTri);
  for (let i = 0; i < nTri; i++) order[i] = packed[i] % 2 ** 23;
  return order;
}

/**
 * Position of the cell (x, y) along the Hilbert curve over an n x n grid, n a power of two
 * (the iterative form of D. Hilbert's construction, with quadrant rotations).
 */
export function hilbertIndex(n: number, x: number, y: number): number {
  let d = 0;
  for (let s = n >> 1; s > 0; s >>= 1) {
    const rx = (x & s) > 0 ? 1 : 0;
    const ry = (y & s) > 0 ? 1 : 0;
    d += s * s * ((3 * rx) ^ ry);
    if (ry === 0) {
      if (rx === 1) {
        x = n - 1 - x;
        y = n - 1 - y;
      }
      const tmp = x;
      x = y;
      y = tmp;
    }
  }
  return d;
}

/**
 * The compact linear mesh. Triangles are put in the order of their centroids along a Hilbert
 * curve and vertices numbered as the triangles first reach them, so that an element's nodes,
 * and neighbouring elements, have nearby numbers: assembly, recovery and the solver's
 * permutations then walk memory in short strides instead of at random.
 */
function extractLinear(tm: TriMesh): Mesh {
  const newIndex = new Int32Array(tm.nv).fill(-1);
  const order = hilbertOrder(tm);
  const nTri = order.length;
  const elements = new Int32Array(3 * nTri);
  let nNodes = 0;
  for (let e = 0; e < nTri; e++) {
    const t = order[e];
    for (let i = 0; i < 3; i++) {
      const v = tm.tv[3 * t + i];
      if (newIndex[v] < 0) newIndex[v] = nNodes++;
      elements[3 * e + i] = newIndex[v];
    }
  }
  const nodes = new Float64Array(2 * nNodes);
  const nodeEdge = new Int32Array(nNodes).fill(-1);
  const nodeCorner = new Int32Array(nNodes).fill(-1);
  for (let v = 0; v < tm.nv; v++) {
    const n = newIndex[v];
    if (n < 0) continue;
    nodes[2 * n] = tm.px[v];
    nodes[2 * n + 1] = tm.py[v];
    nodeEdge[n] = tm.vEdge[v];
    nodeCorner[n] = tm.vCorner[v];
  }
  const bEdges = new Int32Array(3 * tm.ns);
  const bEdgeDomain = new Int32Array(tm.ns);
  const bEdgeT = new Float64Array(2 * tm.ns);
  for (let s = 0; s < tm.ns; s++) {
    const a = newIndex[tm.segA[s]];
    const b = newIndex[tm.segB[s]];
    if (a < 0 || b < 0) throw new InternalError(`boundary segment ${s} lost its material triangle`);
    bEdges[3 * s] = a;
    bEdges[3 * s + 1] = b;
    bEdges[3 * s + 2] = -1;
    bEdgeDomain[s] = tm.segEdge[s];
    bEdgeT[2 * s] = tm.segT0[s];
    bEdgeT[2 * s + 1] = tm.segT1[s];
    // A junction node belongs to the edge that starts there.
    if (nodeEdge[a] < 0) nodeEdge[a] = tm.segEdge[s];
  }
  return {
    order: 1,
    nNodes,
    nVertices: nNodes,
    nodes,
    nElements: nTri,
    elements,
    bEdges,
    nBEdges: tm.ns,
    bEdgeDomain,
    bEdgeT,
    nodeEdge,
    nodeCorner,
  };
}

/**
 * Adds a midside node on every edge. On boundary edges it sits on the true curve at the middle
 * parameter, so curved sides are isoparametric quadratic curves; elsewhere at the chord midpoint.
 */
export function upgradeToQuadratic(lin: Mesh, domain: Domain): Mesh {
  const nv = lin.nNodes;
  const ne = lin.nElements;
  const local = [
    [0, 1],
    [1, 2],
    [2, 0],
  ];
  // Undirected edge keys min * nv + max, sorted and made unique: the k-th unique edge gets
  // midside node nv + k.
  const keys = new Float64Array(3 * ne);
  for (let e = 0; e < ne; e++) {
    for (let k = 0; k < 3; k++) {
      const a = lin.elements[3 * e + local[k][0]];
      const b = lin.elements[3 * e + local[k][1]];
      keys[3 * e + k] = a < b ? a * nv + b : b * nv + a;
    }
  }
  const sorted = keys.slice().sort();
  let nu = 0;
  for (let k = 0; k < sorted.length; k++) if (k === 0 || sorted[k] !== sorted[k - 1]) sorted[nu++] = sorted[k];
  const unique = sorted.subarray(0, nu);
  const find = (key: number) => {
    let lo = 0;
    let hi = nu;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (unique[mid] < key) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  const elements = new Int32Array(6 * ne);
  for (let e = 0; e < ne; e++) {
    for (let i = 0; i < 3; i++) elements[6 * e + i] = lin.elements[3 * e + i];
    for (let k = 0; k < 3; k++) elements[6 * e + 3 + k] = nv + find(keys[3 * e + k]);
  }
  const next = nv + nu;
  const extra = new Float64Array(2 * nu);
  for (let k = 0; k < nu; k++) {
    const a = Math.floor(unique[k] / nv);
    const b = unique[k] - a * nv;
    extra[2 * k] = 0.5 * (lin.nodes[2 * a] + lin.nodes[2 * b]);
    extra[2 * k + 1] = 0.5 * (lin.nodes[2 * a + 1] + lin.nodes[2 * b + 1]);
  }
  /** The midside node of edge a-b, or -1 when a-b is not an element edge. */
  const midOf = (a: number, b: number) => {
    const key = a < b ? a * nv + b : b * nv + a;
    const i = find(key);
    return i < nu && unique[i] === key ? nv + i : -1;
  };
  const nodes = new Float64Array(2 * next);
  nodes.set(lin.nodes);
  nodes.set(extra, 2 * nv);
  const nodeEdge = new Int32Array(next).fill(-1);
  nodeEdge.set(lin.nodeEdge);
  const nodeCorner = new Int32Array(next).fill(-1);
  nodeCorner.set(lin.nodeCorner);
  const bEdges = Int32Array.from(lin.bEdges);
  const p = [0, 0];
  for (let s = 0; s < lin.nBEdges; s++) {
    const a = bEdges[3 * s];
    const b = bEdges[3 * s + 1];
    const m = midOf(a, b);
    if (m < 0) throw new InternalError(`boundary edge ${a}-${b} is not an element edge`);
    bEdges[3 * s + 2] = m;
    const edge = domain.edges[lin.bEdgeDomain[s]];
    nodeEdge[m] = edge.id;
    if (edge.curve.kind !== 'line') {
      evaluateCurve(edge.curve, 0.5 * (lin.bEdgeT[2 * s] + lin.bEdgeT[2 * s + 1]), p);
      nodes[2 * m] = p[0];
      nodes[2 * m + 1] = p[1];
    }
  }
  return { ...lin, order: 2, nNodes: next, nodes, elements, bEdges, nodeEdge, nodeCorner };
}

/** Smallest corner angle over the triangles not forced by a sharp input corner (degrees). */
function minUnforcedAngle(mesh: Mesh, domain: Domain, minAngleDeg: number): number {
  const per = mesh.order === 2 ? 6 : 3;
  const corners = new SharpCorners(domain, Math.PI / 3);
  const n = mesh.nodes;
  // Junction nodes count as corners, not as points inside an edge.
  const edgeOf = (v: number) => (mesh.nodeCorner[v] >= 0 ? -1 : mesh.nodeEdge[v]);
  let best = 180;
  for (let e = 0; e < mesh.nElements; e++) {
    const ang = triangleMinAngle(mesh, per, e);
    if (ang >= minAngleDeg) {
      best = Math.min(best, ang);
      continue;
    }
    const v = [mesh.elements[per * e], mesh.elements[per * e + 1], mesh.elements[per * e + 2]];
    const len = (i: number) => Math.hypot(n[2 * v[(i + 1) % 3]] - n[2 * v[(i + 2) % 3]], n[2 * v[(i + 1) % 3] + 1] - n[2 * v[(i + 2) % 3] + 1]);
    let opp = 0;
    for (let i = 1; i < 3; i++) if (len(i) < len(opp)) opp = i;
    const u = v[(opp + 1) % 3];
    const w = v[(opp + 2) % 3];
    if (corners.forces(mesh.nodeCorner[v[opp]], edgeOf(u), mesh.nodeCorner[u], edgeOf(w), mesh.nodeCorner[w])) continue;
    best = Math.min(best, ang);
  }
  return best;
}

export function triangleMinAngle(mesh: Mesh, per: number, e: number): number {
  const n = mesh.nodes;
  const a = mesh.elements[per * e];
  const b = mesh.elements[per * e + 1];
  const c = mesh.elements[per * e + 2];
  const la = Math.hypot(n[2 * b] - n[2 * c], n[2 * b + 1] - n[2 * c + 1]);
  const lb = Math.hypot(n[2 * a] - n[2 * c], n[2 * a + 1] - n[2 * c + 1]);
  const lc = Math.hypot(n[2 * a] - n[2 * b], n[2 * a + 1] - n[2 * b + 1]);
  const angle = (x: number, y: number, z: number) => Math.acos(Math.max(-1, Math.min(1, (y * y + z * z - x * x) / (2 * y * z))));
  return (Math.min(angle(la, lb, lc), angle(lb, la, lc), angle(lc, la, lb)) * 180) / Math.PI;
}
