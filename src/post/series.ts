/** The record of a series of meshes, and the series of values its stopping rule watches. */
import type { Mesh } from '../mesh/types.js';
import type { MeshEvaluation } from './evaluate.js';
import type { KtKind } from './kt.js';
import type { Peak } from './peak.js';
import type { Settlement } from './settle.js';

export interface MeshRecord {
  elements: number;
  nodes: number;
  dofs: number;
  /** size factor of the family member: the mesh size at the peak relative to the first family mesh */
  relativeSize: number;
  /** the highest stress anywhere in the part, and where */
  peak: number;
  peakX: number;
  peakY: number;
  /** per raiser: its peak and its Kt values on this mesh (null where withheld) */
  raisers: { peak: number; kt: Partial<Record<KtKind, number | null>> }[];
  timeMs: number;
  atSharpCorner: boolean;
}

/** What a series records of one analysis. */
export interface RecordedMesh {
  mesh: Mesh;
  peak: Peak;
  evaluation: MeshEvaluation;
  timeMs: { total: number };
}

/** What a band is of: a raiser's Kt of one kind or its peak, or (raiser -1) the part's highest stress. */
export interface TrackedQuantity {
  raiser: number;
  kind: KtKind | 'peak';
}

/** One mesh of a series as its record: the mesh's size, the part's peak and each raiser's peak and Kt values. */
export function recordMesh(a: RecordedMesh, relativeSize: number): MeshRecord {
  return {
    elements: a.mesh.nElements,
    nodes: a.mesh.nNodes,
    dofs: 2 * a.mesh.nNodes,
    relativeSize,
    peak: a.peak.stress,
    peakX: a.peak.x,
    peakY: a.peak.y,
    raisers: a.evaluation.raisers.map((r) => ({ peak: r.peak.stress, kt: Object.fromEntries(r.kt.map((k) => [k.kind, k.value])) })),
    timeMs: a.timeMs.total,
    atSharpCorner: a.peak.atSharpCorner,
  };
}

/**
 * The series the stopping rule watches: the governing raiser's headline Kt (the meshes where it
 * has a value), else that raiser's peak, else the part's highest stress.
 */
export function trackSeries(meshes: readonly MeshRecord[], s: Settlement): { quantity: TrackedQuantity; sizes: number[]; values: number[] } {
  const g = s.governing;
  if (g >= 0) {
    const kind = s.raisers[g].primary;
    const sizes: number[] = [];
    const values: number[] = [];
    for (const m of meshes) {
      const v = kind ? m.raisers[g].kt[kind] : Math.abs(m.raisers[g].peak);
      if (v === null || v === undefined) continue;
      sizes.push(m.relativeSize);
      values.push(v);
    }
    return { quantity: { raiser: g, kind: kind ?? 'peak' }, sizes, values };
  }
  return { quantity: { raiser: -1, kind: 'peak' }, sizes: meshes.map((m) => m.relativeSize), values: meshes.map((m) => Math.abs(m.peak)) };
}
