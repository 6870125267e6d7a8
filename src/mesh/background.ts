/**
 * A size field carried by an existing mesh: desired element sizes per element (from an error
 * estimate) become nodal sizes, limited so that they grow by at most the grading rate per unit
 * distance along mesh edges (a Lipschitz extension over the mesh graph), and are interpolated
 * linearly inside the old elements. Outside the old mesh it places no limit.
 */
import { FieldProbe } from './probe.js';
import type { Mesh } from './types.js';

export interface SizeLimit {
  at(x: number, y: number): number;
}

export class MeshSizeLimit implements SizeLimit {
  private readonly probe: FieldProbe;
  readonly nodal: Float64Array;
  readonly minSize: number;

  /** `desired[e]` is the size wanted in element e (Infinity for no wish). */
  constructor(private readonly mesh: Mesh, desired: Float64Array, grading: number) {
    const per = mesh.order === 2 ? 6 : 3;
    const h = new Float64Array(mesh.nNodes).fill(Infinity);
    for (let e = 0; e < mesh.nElements; e++) {
      for (let k = 0; k < per; k++) {
        const v = mesh.elements[per * e + k];
        if (desired[e] < h[v]) h[v] = desired[e];
      }
    }
    // Grading: h[a] <= h[b] + g |ab| over element edges, by repeated sweeps until nothing changes.
    const n = mesh.nodes;
    for (let sweep = 0; sweep < 200; sweep++) {
      let changed = false;
      for (let e = 0; e < mesh.nElements; e++) {
        for (let i = 0; i < 3; i++) {
          const a = mesh.elements[per * e + i];
          const b = mesh.elements[per * e + ((i + 1) % 3)];
          const len = Math.hypot(n[2 * a] - n[2 * b], n[2 * a + 1] - n[2 * b + 1]);
          if (h[b] + grading * len < h[a]) {
            h[a] = h[b] + grading * len;
            changed = true;
          } else if (h[a] + grading * len < h[b]) {
            h[b] = h[a] + grading * len;
            changed = true;
          }
        }
      }
      if (!changed) break;
    }
    this.nodal = h;
    let m = Infinity;
    for (let i = 0; i < mesh.nVertices; i++) m = Math.min(m, h[i]);
    this.minSize = m;
    this.probe = new FieldProbe(mesh);
  }

  at(x: number, y: number): number {
    const e = this.probe.findElement(x, y);
    if (e < 0) return Infinity;
    const per = this.mesh.order === 2 ? 6 : 3;
    const el = this.mesh.elements;
    const o = per * e;
    const h0 = this.nodal[el[o]];
    const h1 = this.nodal[el[o + 1]];
    const h2 = this.nodal[el[o + 2]];
    if (h0 === Infinity || h1 === Infinity || h2 === Infinity) return Math.min(h0, h1, h2) === Infinity ? Infinity : Math.max(Math.min(h0, h1, h2), 0);
    const xi = this.probe.foundXi;
    const eta = this.probe.foundEta;
    return (1 - xi - eta) * h0 + xi * h1 + eta * h2;
  }
}
