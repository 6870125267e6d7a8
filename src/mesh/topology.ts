/**
 * Who touches whom in a triangle mesh: the elements around a node (and the element size there),
 * and the nodes sharing an element with each node (node adjacency, no self loops, as flat CSR
 * arrays: entries of node i are idx[ptr[i]] .. idx[ptr[i + 1] - 1]).
 */

/** Compressed rows: entries of row i are idx[ptr[i]] .. idx[ptr[i + 1] - 1]. */
export interface CsrRows {
  readonly ptr: Int32Array;
  readonly idx: Int32Array;
}

/** The connectivity a topology needs: 3 or 6 nodes per element. */
export interface MeshConnectivity {
  readonly elements: Int32Array;
  readonly nElements: number;
  readonly nNodes: number;
  readonly order: 1 | 2;
}

/**
 * The elements touching `node` (through any of their 3 or 6 nodes), in increasing element order:
 * one pass over the connectivity, nothing built for the other nodes (every caller asks about one
 * node: the peak's).
 */
export function findElementsAtNode(mesh: MeshConnectivity, node: number): number[] {
  const per = mesh.order === 2 ? 6 : 3;
  const el = mesh.elements;
  const out: number[] = [];
  for (let e = 0; e < mesh.nElements; e++) {
    for (let i = 0; i < per; i++) {
      if (el[per * e + i] === node) {
        out.push(e);
        break;
      }
    }
  }
  return out;
}

/** The longest corner-to-corner side of the elements touching `node`: the element size there. */
export function measureSizeAtNode(mesh: MeshConnectivity & { readonly nodes: Float64Array }, node: number): number {
  const per = mesh.order === 2 ? 6 : 3;
  const { elements: el, nodes: xy } = mesh;
  let h = 0;
  for (const e of findElementsAtNode(mesh, node)) {
    for (let i = 0; i < 3; i++) {
      const a = el[per * e + i];
      const b = el[per * e + ((i + 1) % 3)];
      h = Math.max(h, Math.hypot(xy[2 * a] - xy[2 * b], xy[2 * a + 1] - xy[2 * b + 1]));
    }
  }
  return h;
}

/**
 * Node adjacency (nodes sharing an element), CSR without self loops. The neighbours of a node
 * are listed in the order first met when walking its elements in increasing order and each
 * element's nodes in local order (the nested-dissection ordering reads this order, so it is part
 * of the contract: sorted neighbours would give other, equally valid, orderings).
 */
export function buildNodeAdjacency(mesh: MeshConnectivity): CsrRows {
  const per = mesh.order === 2 ? 6 : 3;
  const n = mesh.nNodes;
  const el = mesh.elements;
  // Upper bound of neighbours through element incidence, then deduplicate per node.
  const deg = new Int32Array(n + 1);
  for (let e = 0; e < mesh.nElements; e++) for (let i = 0; i < per; i++) deg[el[per * e + i]] += per - 1;
  const start = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) start[i + 1] = start[i] + deg[i];
  const fill = start.slice(0, n);
  const raw = new Int32Array(start[n]);
  for (let e = 0; e < mesh.nElements; e++) {
    for (let i = 0; i < per; i++) {
      const a = el[per * e + i];
      for (let j = 0; j < per; j++) if (j !== i) raw[fill[a]++] = el[per * e + j];
    }
  }
  const ptr = new Int32Array(n + 1);
  const idx = new Int32Array(start[n]);
  const mark = new Int32Array(n).fill(-1);
  let w = 0;
  for (let a = 0; a < n; a++) {
    ptr[a] = w;
    for (let p = start[a]; p < start[a + 1]; p++) {
      const b = raw[p];
      if (mark[b] === a) continue;
      mark[b] = a;
      idx[w++] = b;
    }
  }
  ptr[n] = w;
  return { ptr, idx: idx.slice(0, w) };
}
