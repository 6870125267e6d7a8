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
import { curvatureRadius, curveConcavity } from '../geometry/curve.js';
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
