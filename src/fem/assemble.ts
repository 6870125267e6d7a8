/**
 * Assembly of the stiffness matrix with the fixed degrees of freedom removed symmetrically:
 * only free-free entries enter the matrix (lower triangle, as the solver stores it), and the
 * prescribed values move to the right-hand side, f_f - K_fc u_c. The matrix stays symmetric
 * positive definite when the supports stop every rigid motion.
 */
import type { CsrGraph, SymmetricCsc } from '../solve/index.js';
import type { Mesh } from '../mesh/types.js';
import { P2Scratch, stiffnessP1, stiffnessP2 } from './elements.js';

export interface Constraints {
  /** per DOF: 1 when prescribed */
  fixed: Uint8Array;
  /** per DOF: the prescribed value (0 for supports) */
  value: Float64Array;
}

export interface FeSystem {
  K: SymmetricCsc;
  /** right-hand side on the free DOFs */
  f: Float64Array;
  /** free index -> full DOF */
  freeDof: Int32Array;
  /** full DOF -> free index, or -1 when fixed */
  dofFree: Int32Array;
}

/** Calls visit(e, ke, dofs) for every element with its stiffness (row-major) and DOF numbers. */
export function forEachElementStiffness(
  mesh: Mesh,
  D: Float64Array,
  thickness: number,
  visit: (e: number, ke: Float64Array, dofs: Int32Array) => void,
): void {
  const per = mesh.order === 2 ? 6 : 3;
  const nd = 2 * per;
  const ke = new Float64Array(nd * nd);
  const dofs = new Int32Array(nd);
  const B = new Float64Array(18);
  const s = new P2Scratch();
  for (let e = 0; e < mesh.nElements; e++) {
    if (per === 3) stiffnessP1(mesh.nodes, mesh.elements, e, D, thickness, ke, B);
    else stiffnessP2(mesh.nodes, mesh.elements, e, D, thickness, ke, s);
    for (let i = 0; i < per; i++) {
      const n = mesh.elements[per * e + i];
      dofs[2 * i] = 2 * n;
      dofs[2 * i + 1] = 2 * n + 1;
    }
    visit(e, ke, dofs);
  }
}

export function assembleSystem(mesh: Mesh, D: Float64Array, thickness: number, fFull: Float64Array, c: Constraints): FeSystem {
  const nDof = 2 * mesh.nNodes;
  const dofFree = new Int32Array(nDof);
  let nFree = 0;
  for (let d = 0; d < nDof; d++) dofFree[d] = c.fixed[d] ? -1 : nFree++;
  const freeDof = new Int32Array(nFree);
  for (let d = 0; d < nDof; d++) if (dofFree[d] >= 0) freeDof[dofFree[d]] = d;
  const f = new Float64Array(nFree);
  for (let d = 0; d < nDof; d++) if (dofFree[d] >= 0) f[dofFree[d]] = fFull[d];

  // The lower-triangle pattern of K on the free DOFs comes from the node graph (two nodes are
  // coupled when they share an element), and every element's entries are added in place: no
  // coordinate triplets (for 1e6 DOF of 6-node elements those are 2e7 entries to bucket twice).
  // The sums run in element order, as the triplet assembly summed them, so K is the same to
  // the last bit.
  const K = freeStiffnessPattern(mesh, dofFree, nFree);
  const { colPtr, rowIndex, values } = K;
  forEachElementStiffness(mesh, D, thickness, (_e, ke, dofs) => {
    const nd = dofs.length;
    // columns outer, rows inner: each f[ri] still receives its terms in the order j = 0, 1, ...
    for (let j = 0; j < nd; j++) {
      const cj = dofFree[dofs[j]];
      let prev = -1;
      for (let i = 0; i < nd; i++) {
        const ri = dofFree[dofs[i]];
        if (ri < 0) continue;
        const v = ke[i * nd + j];
        if (cj < 0) {
          const u = c.value[dofs[j]];
          if (u !== 0) f[ri] -= v * u;
          continue;
        }
        if (ri < cj) continue;
        // row ri in column cj (rows sorted); a node's y row follows its x row
        let lo: number;
        if ((i & 1) === 1 && prev >= 0 && rowIndex[prev + 1] === ri) lo = prev + 1;
        else {
          lo = colPtr[cj];
          let hi = colPtr[cj + 1] - 1;
          while (lo < hi) {
            const mid = (lo + hi) >> 1;
            if (rowIndex[mid] < ri) lo = mid + 1;
            else hi = mid;
          }
        }
        prev = (i & 1) === 0 ? lo : -1;
        values[lo] += v;
      }
    }
  });
  return { K, f, freeDof, dofFree };
}

/**
 * The lower triangle pattern (CSC, rows sorted, values zero) of the stiffness matrix on the free
 * DOFs: column of free DOF (node a, component k) holds the free DOFs >= it of node a and of the
 * nodes sharing an element with a. Free DOF numbers increase with the full DOF 2 * node + c, so
 * the rows of a column come out sorted when the node's neighbours are.
 */
export function freeStiffnessPattern(mesh: Mesh, dofFree: Int32Array, nFree: number): SymmetricCsc {
  const g = meshNodeGraph(mesh);
  const n = mesh.nNodes;
  // neighbours of each node with the node itself, sorted
  const sptr = new Int32Array(n + 1);
  for (let a = 0; a < n; a++) sptr[a + 1] = sptr[a] + (g.ptr[a + 1] - g.ptr[a]) + 1;
  const sidx = new Int32Array(sptr[n]);
  for (let a = 0; a < n; a++) {
    let w = sptr[a];
    sidx[w++] = a;
    // insertion sort: the lists are short (6-30 nodes)
    for (let p = g.ptr[a]; p < g.ptr[a + 1]; p++) {
      const b = g.idx[p];
      let q = w++;
      while (q > sptr[a] && sidx[q - 1] > b) {
        sidx[q] = sidx[q - 1];
        q--;
      }
      sidx[q] = b;
    }
  }
  const colPtr = new Int32Array(nFree + 1);
  let rowIndexOut = new Int32Array(0);
  for (let pass = 0; pass < 2; pass++) {
    let nz = 0;
    for (let d = 0; d < 2 * n; d++) {
      const cj = dofFree[d];
      if (cj < 0) continue;
      const a = d >> 1;
      if (pass === 0) {
        let cnt = 0;
        for (let p = sptr[a]; p < sptr[a + 1]; p++) {
          const b = sidx[p];
          if (dofFree[2 * b] >= cj) cnt++;
          if (dofFree[2 * b + 1] >= cj) cnt++;
        }
        colPtr[cj + 1] = cnt;
      } else {
        for (let p = sptr[a]; p < sptr[a + 1]; p++) {
          const b = sidx[p];
          const r0 = dofFree[2 * b];
          const r1 = dofFree[2 * b + 1];
          if (r0 >= cj) rowIndexOut[nz++] = r0;
          if (r1 >= cj) rowIndexOut[nz++] = r1;
        }
      }
    }
    if (pass === 0) {
      for (let j = 0; j < nFree; j++) colPtr[j + 1] += colPtr[j];
      rowIndexOut = new Int32Array(colPtr[nFree]);
    }
  }
  return { n: nFree, colPtr, rowIndex: rowIndexOut, values: new Float64Array(colPtr[nFree]) };
}
/** r = K u over the whole mesh (all DOFs), element by element: the nodal internal forces. */
export function internalForces(mesh: Mesh, D: Float64Array, thickness: number, u: Float64Array): Float64Array {
  const r = new Float64Array(2 * mesh.nNodes);
  forEachElementStiffness(mesh, D, thickness, (_e, ke, dofs) => {
    const nd = dofs.length;
    for (let i = 0; i < nd; i++) {
      let s = 0;
      for (let j = 0; j < nd; j++) s += ke[i * nd + j] * u[dofs[j]];
      r[dofs[i]] += s;
    }
  });
  return r;
}

/** Node adjacency of the mesh (nodes sharing an element), CSR without self loops. */
export function meshNodeGraph(mesh: Mesh): CsrGraph {
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
