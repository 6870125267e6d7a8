/**
 * The results of one solved mesh, raiser by raiser: each raiser's peak, net section, nominal
 * stresses and Kt (src/post/kt.ts), whether its peak sits at a possible singular point, and the
 * stress at every singular candidate (for the series to tell whether it grows). The pipeline
 * calls this once per mesh; src/post/settle.ts reads a series of them.
 */
import type { Domain } from '../geometry/domain.js';
import { nearestBoundaryNode } from '../fem/boundary-conditions.js';
import type { Mesh } from '../mesh/types.js';
import type { StressMeasure } from '../model/schema.js';
import { evaluateRaiserKt, type KtContext, type RaiserKt, type RaiserNominalInput } from './kt.js';
import { measureField } from './peak.js';
import type { RaiserCutFinder } from './raiser-cut.js';
import { findRaiserPeaks, type Raiser, type RaiserPeak } from './raisers.js';
import type { SingularCandidate } from './singular.js';

export interface RaiserEvaluation extends RaiserKt {
  raiser: Raiser;
  peak: RaiserPeak;
  /** index of the singular candidate the peak sits at on this mesh, or -1 */
  atCandidate: number;
}

export interface MeshEvaluation {
  raisers: RaiserEvaluation[];
  /** per singular candidate: the measure at the node there (for min-principal, the most compressive) */
  candidateStress: number[];
  /** per singular candidate: the largest element edge at that node (the local mesh size) */
  candidateSize: number[];
}

/** The most raisers given a section and Kt on one mesh (our choice; the rest report their peaks). */
const MAX_EVALUATED = 40;

export interface EvaluateInput {
  domain: Domain;
  mesh: Mesh;
  stress: Float64Array;
  nodalForce: Float64Array;
  measure: StressMeasure;
  szzFactor: number;
  thickness: number;
  raisers: readonly Raiser[];
  candidates: readonly SingularCandidate[];
  finder: RaiserCutFinder;
  mirrorEdge: Uint8Array;
  /** per domain edge: 1 held by a support (other than a mirror plane), 2 loaded, 0 free */
  edgeRole: Uint8Array;
  remote?: { sxx: number; syy: number; sxy: number };
  direction?: readonly [number, number];
  /** per raiser index, what the model gives for its nominal stress */
  given: ReadonlyMap<number, RaiserNominalInput>;
  /** raisers to evaluate whatever their peak (the one named as headline, those named to report) */
  always?: readonly number[];
  units: { stress: string };
}

/** The largest edge of the elements at each node (the local element size), for the nodes asked. */
function localSize(mesh: Mesh, nodes: readonly number[]): number[] {
  const want = new Map<number, number>();
  for (const n of nodes) want.set(n, 0);
  const per = mesh.order === 2 ? 6 : 3;
  const xy = mesh.nodes;
  for (let e = 0; e < mesh.nElements; e++) {
    let has = false;
    for (let i = 0; i < per && !has; i++) has = want.has(mesh.elements[per * e + i]);
    if (!has) continue;
    let h = 0;
    for (let i = 0; i < 3; i++) {
      const a = mesh.elements[per * e + i];
      const b = mesh.elements[per * e + ((i + 1) % 3)];
      h = Math.max(h, Math.hypot(xy[2 * a] - xy[2 * b], xy[2 * a + 1] - xy[2 * b + 1]));
    }
    for (let i = 0; i < per; i++) {
      const a = mesh.elements[per * e + i];
      const cur = want.get(a);
      if (cur !== undefined && h > cur) want.set(a, h);
    }
  }
  return nodes.map((n) => want.get(n) ?? 0);
}

export function evaluateMesh(input: EvaluateInput): MeshEvaluation {
  const { mesh, stress, measure, szzFactor, raisers, candidates } = input;
  const field = measureField(stress, measure, szzFactor);
  const candNodes = candidates.map((c) => nearestBoundaryNode(mesh, c.x, c.y));
  const candidateStress = candNodes.map((n) => field[n]);
  const candidateSize = localSize(mesh, candNodes);
  const peaks = findRaiserPeaks(mesh, raisers, stress, measure, szzFactor);
  const peakSize = localSize(mesh, peaks.map((p) => p.node));
  const ctx: KtContext = {
    domain: input.domain,
    mesh,
    nodalForce: input.nodalForce,
    finder: input.finder,
    measure,
    thickness: input.thickness,
    remote: input.remote,
    direction: input.direction,
    mirrorEdge: input.mirrorEdge,
    edgeRole: input.edgeRole,
    units: input.units,
  };
  // Sections and Kt for the raisers that matter: the MAX_EVALUATED highest peaks and every one
  // the model names; a part of thousands of holes would otherwise search thousands of sections.
  const order = peaks.map((_p, i) => i).sort((a, b) => Math.abs(peaks[b].stress) - Math.abs(peaks[a].stress));
  const evaluated = new Set<number>(order.slice(0, MAX_EVALUATED));
  for (const i of input.given.keys()) evaluated.add(i);
  for (const i of input.always ?? []) evaluated.add(i);
  const cut = order.length > MAX_EVALUATED ? Math.abs(peaks[order[MAX_EVALUATED - 1]].stress) : 0;
  const out: RaiserEvaluation[] = raisers.map((raiser, i) => {
    const peak = peaks[i];
    // At a candidate: the peak within two elements of it (the elements there set the reach).
    let atCandidate = -1;
    let nearest = Infinity;
    candidates.forEach((c, k) => {
      const d = Math.hypot(peak.x - c.x, peak.y - c.y);
      if (d <= 2 * Math.max(peakSize[i], candidateSize[k]) && d < nearest) {
        nearest = d;
        atCandidate = k;
      }
    });
    const kt: RaiserKt = evaluated.has(i)
      ? evaluateRaiserKt(ctx, raiser, peak, input.given.get(i))
      : {
          flow: [1, 0],
          section: null,
          vRaiser: NaN,
          sectionGiven: false,
          loads: null,
          gross: null,
          kt: [{ kind: 'net', value: null, nominal: NaN, definition: 'not evaluated', withheld: `not evaluated: only the ${MAX_EVALUATED} raisers with the highest peaks (down to ${Number(cut.toPrecision(4))}) get sections and Kt; name this one in results.raisers or results.nominal to have it` }],
          warnings: [],
        };
    const held = raiser.edges.some((e) => input.edgeRole[e] === 1);
    const loaded = raiser.edges.some((e) => input.edgeRole[e] === 2);
    if (held) {
      // A rigid hold on the raiser's own edge: the peak sits on an idealised support, where the
      // recovered stress has no known traction to lean on and converges slowly. No Kt.
      const why = `${raiser.name} is held rigidly on its own edge: its peak sits on an idealised support, not on a free edge, and no Kt of it means what a chart's does; hold it with a pin in contact ("rigid-pin") for its Kt`;
      for (const k of kt.kt) if (k.value !== null) Object.assign(k, { value: null, withheld: why });
    } else if (loaded) {
      kt.warnings.push(
        `${raiser.name} is loaded on its own edge: its peak depends on how that load is idealised (spread over the edge as given), not only on its shape; for a pin, model it as one ("bearing" or "rigid-pin") before trusting its Kt`,
      );
    }
    return { raiser, peak, atCandidate, ...kt };
  });
  return { raisers: out, candidateStress, candidateSize };
}
