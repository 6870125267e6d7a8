/**
 * Stress raisers: the features of a part that concentrate stress, each with its own peak.
 *
 * A raiser is found from the geometry alone (so it is the same on every mesh of a series):
 *  - every hole, whole (its straight sides and corner arcs together: "hole 3 "slot"");
 *  - every run of concave curved edges of the outline with no corner between them: notch
 *    roots, shoulder fillets, inside corner radii, the quarter of a hole cut by a symmetry
 *    plane ("fillet at corner 4", "arc "notch" (outline edge 2)").
 * Concave means the material lies outside the curve's circle of curvature (curveConcavity), the
 * features the mesher grades for. Convex arcs (a rounded lug end) and straight edges are not
 * raisers; sharp re-entrant corners are singular points, not raisers (src/post/singular.ts).
 *
 * Each raiser's peak is the largest value of the measure on its own boundary (between nodes too,
 * along the 6-node edges) and at the nodes of the elements touching that boundary, so a peak
 * just inside the surface (under a contact load, say) is not missed.
 */
import { curvatureRadius, curveConcavity, evaluateCurve, sampleCurvesBox } from '../geometry/curve.js';
import type { Domain } from '../geometry/domain.js';
import type { Mesh } from '../mesh/types.js';
import type { StressMeasure } from '../model/schema.js';
import { measureField, refineAlongBoundary } from './peak.js';
import { vertexElements } from './recover.js';

export interface Raiser {
  /** position in the list of raisers */
  index: number;
  /** what a person calls it: 'hole 2 "bolt hole"', 'fillet at corner 4' */
  name: string;
  kind: 'hole' | 'outline';
  loop: number;
  /** the domain edges it is made of */
  edges: number[];
  /** the names a model file may use for it: the hole's name, "hole N", its edges' tags, its name */
  aliases: string[];
  /** smallest radius of curvature of its concave curved edges (Infinity when it has none) */
  radius: number;
}

export interface RaiserPeak {
  /** the measure's value (for min-principal, the most compressive) */
  stress: number;
  x: number;
  y: number;
  /** the node nearest the peak */
  node: number;
  sxx: number;
  syy: number;
  sxy: number;
  onBoundary: boolean;
}

function smallestRadius(domain: Domain, edges: number[]): number {
  let r = Infinity;
  for (const id of edges) {
    const c = domain.edges[id].curve;
    if (curveConcavity(c) !== 1) continue;
    for (let k = 0; k <= 16; k++) r = Math.min(r, curvatureRadius(c, k / 16));
  }
  return r;
}

/** The raisers of a domain, holes first, then the outline's concave runs in order of travel. */
export function findRaisers(domain: Domain): Raiser[] {
  const out: Raiser[] = [];
  for (const loop of domain.loops) {
    if (loop.hole === 0) continue;
    const tags = new Set<string>();
    for (const id of loop.edges) for (const t of domain.edges[id].tags) tags.add(t);
    const aliases = [`hole ${loop.hole}`, loop.label, ...(loop.name ? [loop.name] : []), ...tags];
    out.push({ index: out.length, name: loop.label, kind: 'hole', loop: loop.index, edges: loop.edges.slice(), aliases, radius: smallestRadius(domain, loop.edges) });
  }
  const outline = domain.loops[0];
  const n = outline.edges.length;
  const concave = outline.edges.map((id) => curveConcavity(domain.edges[id].curve) === 1);
  const cornerAt = new Set(domain.corners.filter((c) => c.loop === 0).map((c) => c.edgeOut));
  // Runs of concave edges joined without a corner; a run may wrap past the loop's first edge.
  // (An outline is convex somewhere, so a run always has a first edge.)
  let start = 0;
  while (!(concave[start] && (!concave[(start - 1 + n) % n] || cornerAt.has(outline.edges[start])))) {
    if (++start >= n) return out;
  }
  const seen = new Uint8Array(n);
  for (let k0 = 0; k0 < n; k0++) {
    const k = (start + k0) % n;
    if (!concave[k] || seen[k]) continue;
    const run: number[] = [];
    let j = k;
    do {
      run.push(outline.edges[j]);
      seen[j] = 1;
      j = (j + 1) % n;
    } while (concave[j] && !seen[j] && !cornerAt.has(outline.edges[j]));
    const first = domain.edges[run[0]];
    const tags = new Set<string>();
    for (const id of run) for (const t of domain.edges[id].tags) tags.add(t);
    out.push({ index: out.length, name: first.feature, kind: 'outline', loop: 0, edges: run, aliases: [first.feature, first.label, ...tags], radius: smallestRadius(domain, run) });
  }
  return out;
}

/**
 * The raisers a name in a model file may refer to: exact aliases first (a hole's name, "hole 2",
 * an edge tag, the printed name), case-insensitive.
 */
export function matchRaisers(raisers: readonly Raiser[], name: string): Raiser[] {
  const want = name.trim().toLowerCase();
  return raisers.filter((r) => r.aliases.some((a) => a.toLowerCase() === want));
}

/** Per raiser, the peak of the measure on and next to its boundary. */
export function findRaiserPeaks(mesh: Mesh, raisers: readonly Raiser[], stress: Float64Array, measure: StressMeasure, szzFactor: number): RaiserPeak[] {
  const field = measureField(stress, measure, szzFactor);
  const sign = measure === 'min-principal' ? -1 : 1;
  let nDomainEdges = 0;
  for (const r of raisers) for (const e of r.edges) nDomainEdges = Math.max(nDomainEdges, e + 1);
  const owner = new Int32Array(Math.max(nDomainEdges, 1)).fill(-1);
  for (const r of raisers) for (const e of r.edges) owner[e] = r.index;
  const segOwner = (s: number) => {
    const d = mesh.bEdgeDomain[s];
    return d < owner.length ? owner[d] : -1;
  };
  const per = mesh.order === 2 ? 6 : 3;
  const incid = vertexElements(mesh);
  const best = new Int32Array(raisers.length).fill(-1);
  const onB = new Uint8Array(raisers.length);
  const mark = new Int32Array(mesh.nNodes).fill(-1);
  const consider = (r: number, node: number, boundary: boolean) => {
    const b = best[r];
    if (b < 0 || sign * field[node] > sign * field[b]) {
      best[r] = node;
      onB[r] = boundary ? 1 : 0;
    }
  };
  for (let s = 0; s < mesh.nBEdges; s++) {
    const r = segOwner(s);
    if (r < 0) continue;
    for (let k = 0; k < 3; k++) {
      const node = mesh.bEdges[3 * s + k];
      if (node >= 0) consider(r, node, true);
    }
  }
  // One layer of elements next to the boundary.
  for (let s = 0; s < mesh.nBEdges; s++) {
    const r = segOwner(s);
    if (r < 0) continue;
    for (let k = 0; k < 2; k++) {
      const v = mesh.bEdges[3 * s + k];
      for (let p = incid.ptr[v]; p < incid.ptr[v + 1]; p++) {
        const e = incid.idx[p];
        for (let i = 0; i < per; i++) {
          const node = mesh.elements[per * e + i];
          if (mark[node] === r) continue;
          mark[node] = r;
          consider(r, node, false);
        }
      }
    }
  }
  return raisers.map((raiser, r) => {
    const node = best[r];
    let value = field[node];
    let x = mesh.nodes[2 * node];
    let y = mesh.nodes[2 * node + 1];
    let sxx = stress[3 * node];
    let syy = stress[3 * node + 1];
    let sxy = stress[3 * node + 2];
    const refined = refineAlongBoundary(mesh, stress, node, measure, szzFactor, sign, (s) => segOwner(s) === raiser.index);
    if (refined && sign * refined.value > sign * value) ({ value, x, y, sxx, syy, sxy } = refined);
    return { stress: value, x, y, node, sxx, syy, sxy, onBoundary: onB[r] === 1 || refined !== null };
  });
}

/** What a raiser is, in the dimensions a drawing gives it (model length units, angles in degrees). */
export type RaiserShape =
  | { type: 'circle'; center: [number, number]; diameter: number; extent: [number, number, number, number] }
  | { type: 'ellipse'; center: [number, number]; semiAxes: [number, number]; angleDeg: number; extent: [number, number, number, number] }
  | { type: 'rounded-rectangle'; center: [number, number]; width: number; height: number; cornerRadius: number; angleDeg: number; extent: [number, number, number, number] }
  | { type: 'slot'; ends: [[number, number], [number, number]]; width: number; length: number; extent: [number, number, number, number] }
  | { type: 'arc'; center: [number, number]; radius: number; sweepDeg: number; from: [number, number]; to: [number, number]; extent: [number, number, number, number] }
  | { type: 'curve'; radius: number | null; extent: [number, number, number, number] };

/**
 * The shape of a raiser read from its domain edges (the geometry, not the mesh): a whole circle
 * (centre, diameter), a whole ellipse (centre, semi-axes, angle), a slot (two half circles of
 * one radius joined by straight sides: width, overall length, end centres), a rectangle with
 * rounded corners (centre, sides, corner radius, angle), a single arc (a
 * fillet or notch root: centre, radius, sweep, ends), or else its smallest concave radius and
 * its extent.
 */
export function describeRaiserShape(domain: Domain, r: Raiser): RaiserShape {
  const curves = r.edges.map((id) => domain.edges[id].curve);
  const extent = sampleCurvesBox(curves, 256);
  const full = (s: number) => Math.abs(Math.abs(s) - 2 * Math.PI) < 1e-9;
  const c0 = curves[0];
  if (curves.length === 1 && c0.kind === 'arc' && full(c0.sweep)) return { type: 'circle', center: [c0.cx, c0.cy], diameter: 2 * c0.r, extent };
  if (curves.length === 1 && c0.kind === 'ellipse' && full(c0.sweep)) {
    let deg = (((c0.rot * 180) / Math.PI) % 180 + 180) % 180;
    if (Math.abs(deg - 180) < 1e-9) deg = 0;
    return { type: 'ellipse', center: [c0.cx, c0.cy], semiAxes: [c0.a, c0.b], angleDeg: deg, extent };
  }
  // Arcs of one circle in a row (a half circle is often made of two quarters) are one arc here.
  type Arc = Extract<typeof c0, { kind: 'arc' }>;
  const groups: { arc: Arc; sweep: number; first: Arc; last: Arc }[] = [];
  const lines: Extract<typeof c0, { kind: 'line' }>[] = [];
  const same = (a: Arc, b: Arc) => Math.abs(a.r - b.r) <= 1e-9 * a.r && Math.hypot(a.cx - b.cx, a.cy - b.cy) <= 1e-9 * a.r;
  let other = false;
  for (const c of curves) {
    if (c.kind === 'line') lines.push(c);
    else if (c.kind === 'arc') {
      const g = groups[groups.length - 1];
      if (g && g.last === curves[curves.indexOf(c) - 1] && same(g.arc, c)) {
        g.sweep += c.sweep;
        g.last = c;
      } else groups.push({ arc: c, sweep: c.sweep, first: c, last: c });
    } else other = true;
  }
  if (groups.length > 1 && curves[curves.length - 1] === groups[groups.length - 1].last && curves[0] === groups[0].first && same(groups[0].arc, groups[groups.length - 1].arc) && r.kind === 'hole') {
    const g = groups.pop()!;
    groups[0].sweep += g.sweep;
    groups[0].first = g.first;
  }
  const near = (v: number, w: number) => Math.abs(Math.abs(v) - w) < 1e-9;
  const rad = groups[0]?.arc.r ?? 0;
  const allR = groups.every((g) => Math.abs(g.arc.r - rad) <= 1e-9 * rad);
  if (!other && r.kind === 'hole' && groups.length === 2 && lines.length === 2 && allR && groups.every((g) => near(g.sweep, Math.PI))) {
    const [a, b] = groups.map((g) => g.arc);
    return { type: 'slot', ends: [[a.cx, a.cy], [b.cx, b.cy]], width: 2 * rad, length: Math.hypot(b.cx - a.cx, b.cy - a.cy) + 2 * rad, extent };
  }
  if (!other && r.kind === 'hole' && groups.length === 4 && lines.length === 4 && allR && groups.every((g) => near(g.sweep, Math.PI / 2))) {
    const side = lines.map((l) => Math.hypot(l.x1 - l.x0, l.y1 - l.y0) + 2 * rad);
    const cx = groups.reduce((t, g) => t + g.arc.cx, 0) / 4;
    const cy = groups.reduce((t, g) => t + g.arc.cy, 0) / 4;
    let deg = ((((Math.atan2(lines[0].y1 - lines[0].y0, lines[0].x1 - lines[0].x0) * 180) / Math.PI) % 180) + 180) % 180;
    let [w, h] = [side[0], side[1]];
    if (deg >= 90 - 1e-9) [deg, w, h] = [deg - 90, h, w];
    if (Math.abs(deg) < 1e-9) deg = 0;
    return { type: 'rounded-rectangle', center: [cx, cy], width: w, height: h, cornerRadius: rad, angleDeg: deg, extent };
  }
  if (!other && groups.length === 1 && lines.length === 0) {
    const g = groups[0];
    const from = [0, 0];
    const to = [0, 0];
    evaluateCurve(g.first, 0, from);
    evaluateCurve(g.last, 1, to);
    return { type: 'arc', center: [g.arc.cx, g.arc.cy], radius: g.arc.r, sweepDeg: (Math.abs(g.sweep) * 180) / Math.PI, from: [from[0], from[1]], to: [to[0], to[1]], extent };
  }
  return { type: 'curve', radius: Number.isFinite(r.radius) ? r.radius : null, extent };
}
