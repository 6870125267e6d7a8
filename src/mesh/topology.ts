/**
 * Who touches whom in a triangle mesh, built once as flat CSR arrays: the elements around each
 * node, and the nodes sharing an element with each node (node adjacency, no self loops).
 * Entries of node i are idx[ptr[i]] .. idx[ptr[i + 1] - 1].
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

/** The elements touching each node (through any of its 3 or 6 nodes), in increasing element order. */
export function buildNodeElements(mesh: MeshConnectivity): CsrRows {
  const per = mesh.order === 2 ? 6 : 3;
  const { elements: el, nElements, nNodes } = mesh;
  const ptr = new Int32Array(nNodes + 1);
  for (let k = 0; k < per * nElements; k++) ptr[el[k] + 1]++;
  for (let i = 0; i < nNodes; i++) ptr[i + 1] += ptr[i];
  const fill = ptr.slice(0, nNodes);
  const idx = new Int32Array(ptr[nNodes]);
  for (let e = 0; e < nElements; e++) for (let i = 0; i < per; i++) idx[fill[el[per * e + i]]++] = e;
  return { ptr, idx };
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
