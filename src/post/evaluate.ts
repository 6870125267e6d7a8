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
    const kt = evaluateRaiserKt(ctx, raiser, peak, input.given.get(i));
    const held = raiser.edges.some((e) => input.edgeRole[e] === 1);
    const loaded = raiser.edges.some((e) => input.edgeRole[e] === 2);
    if (held || loaded) {
      kt.warnings.push(
        `${raiser.name} is ${held ? 'held by a support' : 'loaded'} on its own edge: its peak depends on how that ${held ? 'support' : 'load'} is idealised (${held ? 'a rigid hold' : 'a load spread over the edge as given'}), not only on its shape; model the pin, bolt or contact as it is before trusting its Kt`,
      );
    }
    return { raiser, peak, atCandidate, ...kt };
  });
  return { raisers: out, candidateStress, candidateSize };
}
