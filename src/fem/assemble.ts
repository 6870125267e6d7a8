/**
 * Assembly of the stiffness matrix with the fixed degrees of freedom removed symmetrically:
 * only free-free entries enter the matrix (lower triangle, as the solver stores it), and the
 * prescribed values move to the right-hand side, f_f - K_fc u_c. The matrix stays symmetric
 * positive definite when the supports stop every rigid motion.
 */
import type { CsrGraph, SymmetricCsc } from '../solve/index.js';
import { buildNodeAdjacency } from '../mesh/topology.js';
import type { Mesh } from '../mesh/types.js';
import { P2Scratch, internalForceP2, stiffnessP1, stiffnessP2 } from './elements.js';

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

export function assembleSystem(mesh: Mesh, D: Float64Array, thickness: number, fFull: Float64Array, c: Constraints, graph?: CsrGraph): FeSystem {
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
  // Each node pair (a, b >= a) of an element finds b in a's short list once and adds its 2x2
  // block through the four stored positions. The sums run in element order, as the triplet
  // assembly summed them, so K is the same to the last bit.
  const { K, upper } = freePatternWithSlots(mesh, graph ?? buildNodeAdjacency(mesh), dofFree, nFree);
  const { ptr: uptr, idx: uidx, slot } = upper;
  const values = K.values;
  const per = mesh.order === 2 ? 6 : 3;
  const el = mesh.elements;
  forEachElementStiffness(mesh, D, thickness, (e, ke, dofs) => {
    const nd = 2 * per;
    const o = per * e;
    for (let i = 0; i < per; i++) {
      const na = el[o + i];
      for (let j = 0; j < per; j++) {
        const nb = el[o + j];
        if (nb < na) continue;
        let p = uptr[na];
        while (uidx[p] !== nb) p++;
        const s4 = 4 * p;
        // rows x_b, y_b (local 2j, 2j+1) in columns x_a, y_a (local 2i, 2i+1)
        const r0 = 2 * j * nd + 2 * i;
        const r1 = r0 + nd;
        let q = slot[s4];
        if (q >= 0) values[q] += ke[r0];
        q = slot[s4 + 1];
        if (q >= 0) values[q] += ke[r1];
        q = slot[s4 + 2];
        if (q >= 0) values[q] += ke[r0 + 1];
        q = slot[s4 + 3];
        if (q >= 0) values[q] += ke[r1 + 1];
      }
    }
    // prescribed values: f_f -= K_fc u_c, each f[ri] taking its terms in the order j = 0, 1, ...
    for (let j = 0; j < nd; j++) {
      const u = c.value[dofs[j]];
      if (u === 0 || dofFree[dofs[j]] >= 0) continue;
      for (let i = 0; i < nd; i++) {
        const ri = dofFree[dofs[i]];
        if (ri >= 0) f[ri] -= ke[i * nd + j] * u;
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
 * With it, for each node a the sorted list of nodes b >= a coupled to it (a first) with,
 * per entry, the positions in K.values of (x_b, x_a), (y_b, x_a), (x_b, y_a), (y_b, y_a) as
 * (row, column), -1 where a DOF is fixed or the entry is above the diagonal.
 */
function freePatternWithSlots(mesh: Mesh, g: CsrGraph, dofFree: Int32Array, nFree: number): { K: SymmetricCsc; upper: { ptr: Int32Array; idx: Int32Array; slot: Int32Array } } {
  const n = mesh.nNodes;
  const uptr = new Int32Array(n + 1);
  for (let a = 0; a < n; a++) {
    let cnt = 1;
    for (let p = g.ptr[a]; p < g.ptr[a + 1]; p++) if (g.idx[p] > a) cnt++;
    uptr[a + 1] = uptr[a] + cnt;
  }
  const uidx = new Int32Array(uptr[n]);
  for (let a = 0; a < n; a++) {
    let w = uptr[a];
    uidx[w++] = a;
    // insertion sort: the lists are short (3-15 nodes)
    for (let p = g.ptr[a]; p < g.ptr[a + 1]; p++) {
      const b = g.idx[p];
      if (b <= a) continue;
      let q = w++;
      while (q > uptr[a] + 1 && uidx[q - 1] > b) {
        uidx[q] = uidx[q - 1];
        q--;
      }
      uidx[q] = b;
    }
  }
  // Column (a, x) holds x_a, y_a (if free), then x_b, y_b of every b > a (where free); column
  // (a, y) holds y_a, then the same x_b, y_b. Counts first.
  const colPtr = new Int32Array(nFree + 1);
  for (let a = 0; a < n; a++) {
    let below = 0; // free DOFs of the nodes b > a
    for (let p = uptr[a] + 1; p < uptr[a + 1]; p++) {
      const b = uidx[p];
      if (dofFree[2 * b] >= 0) below++;
      if (dofFree[2 * b + 1] >= 0) below++;
    }
    const fx = dofFree[2 * a];
    const fy = dofFree[2 * a + 1];
    if (fx >= 0) colPtr[fx + 1] = below + 1 + (fy >= 0 ? 1 : 0);
    if (fy >= 0) colPtr[fy + 1] = below + 1;
  }
  for (let j = 0; j < nFree; j++) colPtr[j + 1] += colPtr[j];
  const rowIndex = new Int32Array(colPtr[nFree]);
  const slot = new Int32Array(4 * uptr[n]).fill(-1);
  for (let a = 0; a < n; a++) {
    const fx = dofFree[2 * a];
    const fy = dofFree[2 * a + 1];
    let wx = fx >= 0 ? colPtr[fx] : -1;
    let wy = fy >= 0 ? colPtr[fy] : -1;
    const s0 = 4 * uptr[a];
    // the node with itself: (x_a, x_a), (y_a, x_a), (y_a, y_a)
    if (fx >= 0) {
      slot[s0] = wx;
      rowIndex[wx++] = fx;
      if (fy >= 0) {
        slot[s0 + 1] = wx;
        rowIndex[wx++] = fy;
      }
    }
    if (fy >= 0) {
      slot[s0 + 3] = wy;
      rowIndex[wy++] = fy;
    }
    for (let p = uptr[a] + 1; p < uptr[a + 1]; p++) {
      const b = uidx[p];
      const rx = dofFree[2 * b];
      const ry = dofFree[2 * b + 1];
      const s4 = 4 * p;
      if (fx >= 0) {
        if (rx >= 0) {
          slot[s4] = wx;
          rowIndex[wx++] = rx;
        }
        if (ry >= 0) {
          slot[s4 + 1] = wx;
          rowIndex[wx++] = ry;
        }
      }
      if (fy >= 0) {
        if (rx >= 0) {
          slot[s4 + 2] = wy;
          rowIndex[wy++] = rx;
        }
        if (ry >= 0) {
          slot[s4 + 3] = wy;
          rowIndex[wy++] = ry;
        }
      }
    }
  }
  return { K: { n: nFree, colPtr, rowIndex, values: new Float64Array(colPtr[nFree]) }, upper: { ptr: uptr, idx: uidx, slot } };
}
/**
 * r = K u over the whole mesh (all DOFs), element by element: the nodal internal forces. For
 * 6-node elements r_e = t sum_q w_q det J B_q^T sigma_q by the stiffness rule, which is K_e u_e
 * without forming K_e.
 */
export function internalForces(mesh: Mesh, D: Float64Array, thickness: number, u: Float64Array): Float64Array {
  const r = new Float64Array(2 * mesh.nNodes);
  if (mesh.order === 2) {
    const s = new P2Scratch();
    const ue = new Float64Array(12);
    const re = new Float64Array(12);
    const el = mesh.elements;
    for (let e = 0; e < mesh.nElements; e++) {
      for (let i = 0; i < 6; i++) {
        const n = el[6 * e + i];
        ue[2 * i] = u[2 * n];
        ue[2 * i + 1] = u[2 * n + 1];
      }
      internalForceP2(mesh.nodes, el, e, D, thickness, ue, re, s);
      for (let i = 0; i < 6; i++) {
        const n = el[6 * e + i];
        r[2 * n] += re[2 * i];
        r[2 * n + 1] += re[2 * i + 1];
      }
    }
    return r;
  }
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
