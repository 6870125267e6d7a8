/**
 * Mesh topology (src/mesh/topology.ts) against brute-force builds on random connectivities
 * (fast-check): every element is listed under each of its nodes and nowhere else, in increasing
 * order; the node adjacency is symmetric, has no self loops and no repeats, and is exactly the
 * set of node pairs sharing an element, in the order first met. No published source: these are
 * definitions, checked by exhaustive comparison.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import type { Geometry } from '../src/model/schema.js';
import { buildNodeAdjacency, findElementsAtNode, measureSizeAtNode, type MeshConnectivity } from '../src/mesh/topology.js';
import { meshGeometry } from './support/fe.js';

/** Random connectivity: nElements elements of distinct nodes among nNodes (some nodes may be unused). */
const connectivity = fc
  .record({ order: fc.constantFrom<1 | 2>(1, 2), nNodes: fc.integer({ min: 6, max: 40 }), nElements: fc.integer({ min: 0, max: 30 }), seed: fc.integer() })
  .chain(({ order, nNodes, nElements }) => {
    const per = order === 2 ? 6 : 3;
    const element = fc.shuffledSubarray(
      Array.from({ length: nNodes }, (_, i) => i),
      { minLength: per, maxLength: per },
    ).chain((nodes) => fc.shuffledSubarray(nodes, { minLength: per, maxLength: per }));
    return fc.array(element, { minLength: nElements, maxLength: nElements }).map((els): MeshConnectivity => ({ order, nNodes, nElements, elements: Int32Array.from(els.flat()) }));
  });

function row(g: { ptr: Int32Array; idx: Int32Array }, i: number): number[] {
  return Array.from(g.idx.subarray(g.ptr[i], g.ptr[i + 1]));
}

/** Node lists of the elements, as plain arrays. */
function elementNodes(m: MeshConnectivity): number[][] {
  const per = m.order === 2 ? 6 : 3;
  return Array.from({ length: m.nElements }, (_, e) => Array.from(m.elements.subarray(per * e, per * e + per)));
}

/** Brute force: scan every element for the node; the neighbours in the order first met. */
function bruteRows(m: MeshConnectivity, node: number, els: number[][]): { elements: number[]; neighbours: number[] } {
  const elements: number[] = [];
  const neighbours: number[] = [];
  els.forEach((nodes, e) => {
    if (!nodes.includes(node)) return;
    elements.push(e);
    for (const b of nodes) if (b !== node && !neighbours.includes(b)) neighbours.push(b);
  });
  return { elements, neighbours };
}

/** The rows that differ from the brute-force build, and the adjacency's self loops, repeats and missing mirror entries. */
function topologyFaults(m: MeshConnectivity): string[] {
  const adj = buildNodeAdjacency(m);
  const els = elementNodes(m);
  const faults: string[] = [];
  if (adj.ptr.length !== m.nNodes + 1) faults.push('ptr length');
  for (let i = 0; i < m.nNodes; i++) {
    const want = bruteRows(m, i, els);
    const got = findElementsAtNode(m, i);
    const nb = row(adj, i);
    if (got.join() !== want.elements.join()) faults.push(`elements of node ${i}: ${got} vs ${want.elements}`);
    if (nb.join() !== want.neighbours.join()) faults.push(`neighbours of node ${i}: ${nb} vs ${want.neighbours}`);
    if (nb.includes(i)) faults.push(`self loop at ${i}`);
    if (new Set(nb).size !== nb.length) faults.push(`repeat at ${i}`);
    for (const b of nb) if (!row(adj, b).includes(i)) faults.push(`${i} -> ${b} not mirrored`);
  }
  return faults;
}

describe('mesh topology', () => {
  it('lists every element under each of its nodes, and the adjacency is the symmetric loop-free set of pairs sharing an element (random connectivities)', () => {
    fc.assert(fc.property(connectivity, (m) => topologyFaults(m).length === 0), { numRuns: 200 });
  });

  it('agrees with the brute-force builds on generated 3- and 6-node meshes of a plate with a hole', () => {
    const plate: Geometry = { outline: { shape: 'path', path: [[0, 0], [80, 0], [80, 40], [0, 40]] }, holes: [{ shape: 'circle', center: [40, 20], diameter: 10 }] };
    for (const order of [1, 2] as const) expect(topologyFaults(meshGeometry(plate, order, { size: 8 }).mesh)).toEqual([]);
  });

  it('the element size at a node is the longest corner-to-corner side of the elements touching it (brute force over all elements)', () => {
    const plate: Geometry = { outline: { shape: 'path', path: [[0, 0], [80, 0], [80, 40], [0, 40]] }, holes: [{ shape: 'circle', center: [40, 20], diameter: 10 }] };
    for (const order of [1, 2] as const) {
      const m = meshGeometry(plate, order, { size: 8 }).mesh;
      const per = order === 2 ? 6 : 3;
      for (let node = 0; node < m.nNodes; node += 7) {
        let want = 0;
        for (let e = 0; e < m.nElements; e++) {
          const corners = [0, 1, 2].map((k) => m.elements[per * e + k]);
          if (![...m.elements.subarray(per * e, per * e + per)].includes(node)) continue;
          for (let k = 0; k < 3; k++) {
            const a = corners[k];
            const b = corners[(k + 1) % 3];
            want = Math.max(want, Math.hypot(m.nodes[2 * a] - m.nodes[2 * b], m.nodes[2 * a + 1] - m.nodes[2 * b + 1]));
          }
        }
        expect(measureSizeAtNode(m, node)).toBe(want);
        expect(want).toBeGreaterThan(0);
      }
    }
  });
});
