/**
 * Nested dissection (A. George, "Nested dissection of a regular finite element mesh", SIAM J.
 * Numer. Anal. 10, 1973) with separators found by recursive coordinate bisection (H. D. Simon,
 * "Partitioning of unstructured problems for parallel processing", Computing Systems in
 * Engineering 2, 1991; M. T. Heath and P. Raghavan, "A Cartesian parallel nested dissection
 * algorithm", SIAM J. Matrix Anal. Appl. 16, 1995), leaves ordered by minimum degree
 * (minimum-degree.ts).
 */

import { type CsrGraph, type Ordering, expandNodeOrdering, invertPermutation } from './ordering.js';
import { LeafMinimumDegree } from './minimum-degree.js';

export interface NestedDissectionOptions {
  /** ranges of at most this many nodes are not split further but ordered by minimum degree (default 128) */
  readonly leafSize?: number;
}

/**
 * Nested dissection ordering of the nodes of a finite element mesh, from
 * node coordinates and the node adjacency graph (no self loops needed; they
 * are ignored). Returns the node permutation.
 *
 * Each range of nodes is split at the median of its longer bounding box
 * extent (ties broken by node number, so the split always halves the range).
 * Of the two one-sided boundaries (nodes of one half with a neighbour in the
 * other) the smaller is the separator; then any separator node without a
 * neighbour in its own half moves to the other half, which keeps the
 * separating property and shrinks the separator. The layout of a range is
 * [half A | half B | separator], so separators are numbered after the parts
 * they separate. Ranges of at most leafSize nodes are ordered by exact
 * minimum degree on their induced subgraph. Work is driven by an explicit
 * stack of ranges.
 */
export function orderNestedDissectionNodes(
  nodeAdjacency: CsrGraph,
  coords: Float64Array,
  options: NestedDissectionOptions = {},
): Ordering {
  const nn = coords.length >> 1;
  const { ptr, idx } = nodeAdjacency;
  if (coords.length !== 2 * nn) throw new RangeError('orderNestedDissection: coords length is odd');
  if (ptr.length !== nn + 1) {
    throw new RangeError(`orderNestedDissection: adjacency has ${ptr.length - 1} nodes, coords ${nn}`);
  }
  const leafSize = options.leafSize ?? 128;
  if (!(leafSize >= 2)) throw new RangeError('orderNestedDissection: leafSize must be >= 2');

  const nodes = new Int32Array(nn);
  for (let i = 0; i < nn; i++) nodes[i] = i;
  for (let i = 0; i < coords.length; i++) {
    if (!Number.isFinite(coords[i])) throw new RangeError(`orderNestedDissection: coordinate ${i} is ${coords[i]}`);
  }
  // longest edge projections, to limit the boundary search to a band
  let maxEdgeDx = 0;
  let maxEdgeDy = 0;
  for (let v = 0; v < nn; v++) {
    for (let q = ptr[v]; q < ptr[v + 1]; q++) {
      const u = idx[q];
      if (u < 0 || u >= nn) throw new RangeError(`orderNestedDissection: neighbour ${u} of node ${v} outside [0, ${nn})`);
      const dx = Math.abs(coords[2 * u] - coords[2 * v]);
      const dy = Math.abs(coords[2 * u + 1] - coords[2 * v + 1]);
      if (dx > maxEdgeDx) maxEdgeDx = dx;
      if (dy > maxEdgeDy) maxEdgeDy = dy;
    }
  }
  const stampOf = new Int32Array(nn).fill(-1);
  const side = new Int8Array(nn);
  const tmp = new Int32Array(nn);
  const leafWork = new LeafMinimumDegree(leafSize);

  let stack = new Int32Array(64);
  let top = 0;
  stack[top++] = 0;
  stack[top++] = nn;
  let stamp = 0;

  while (top > 0) {
    const hi = stack[--top];
    const lo = stack[--top];
    const size = hi - lo;
    if (size <= leafSize) {
      if (size > 1) leafWork.order(nodes, lo, hi, ptr, idx, stampOf, ++stamp);
      continue;
    }
    // Longer extent of the bounding box.
    let minX = Infinity;
    let maxX = -Infinity;
    let minY = Infinity;
    let maxY = -Infinity;
    for (let k = lo; k < hi; k++) {
      const v = nodes[k];
      const x = coords[2 * v];
      const y = coords[2 * v + 1];
      if (x < minX) minX = x;
      if (x > maxX) maxX = x;
      if (y < minY) minY = y;
      if (y > maxY) maxY = y;
    }
    const axis = maxX - minX >= maxY - minY ? 0 : 1;
    const mid = lo + (size >> 1);
    selectByCoordinate(nodes, lo, hi, mid, coords, axis);

    const st = ++stamp;
    for (let k = lo; k < hi; k++) {
      const v = nodes[k];
      stampOf[v] = st;
      side[v] = k < mid ? 0 : 1;
    }
    // One-sided boundaries: count each. Only nodes within the longest edge
    // projection of the cut can have a neighbour across it.
    const cut = coords[2 * nodes[mid] + axis];
    const band = axis === 0 ? maxEdgeDx : maxEdgeDy;
    const bandLo = cut - band;
    const bandHi = cut + band;
    let countA = 0;
    let countB = 0;
    for (let k = lo; k < hi; k++) {
      const v = nodes[k];
      const cv = coords[2 * v + axis];
      if (cv < bandLo || cv > bandHi) continue;
      const sv = side[v];
      for (let q = ptr[v]; q < ptr[v + 1]; q++) {
        const u = idx[q];
        if (stampOf[u] === st && side[u] !== sv) {
          if (sv === 0) countA++;
          else countB++;
          break;
        }
      }
    }
    const sepSide = countA <= countB ? 0 : 1;
    const otherSide = 1 - sepSide;
    // Mark the separator (side 2).
    let ns = 0;
    const kFrom = sepSide === 0 ? lo : mid;
    const kTo = sepSide === 0 ? mid : hi;
    for (let k = kFrom; k < kTo; k++) {
      const v = nodes[k];
      const cv = coords[2 * v + axis];
      if (cv < bandLo || cv > bandHi) continue;
      for (let q = ptr[v]; q < ptr[v + 1]; q++) {
        const u = idx[q];
        if (stampOf[u] === st && side[u] === otherSide) {
          tmp[ns++] = v;
          break;
        }
      }
    }
    for (let t = 0; t < ns; t++) side[tmp[t]] = 2;
    // Improvement: a separator node with no neighbour left in its own half
    // can join the other half without creating an edge between the halves.
    // When the separator is its whole half, moving every node would give the
    // other half the whole range and no progress, so that case is left as is.
    const ownHalf = sepSide === 0 ? mid - lo : hi - mid;
    for (let t = 0; t < ns && ns < ownHalf; t++) {
      const v = tmp[t];
      let touchesOwn = false;
      for (let q = ptr[v]; q < ptr[v + 1]; q++) {
        const u = idx[q];
        if (stampOf[u] === st && side[u] === sepSide) {
          touchesOwn = true;
          break;
        }
      }
      if (!touchesOwn) side[v] = otherSide as 0 | 1;
    }
    // Stable partition of the range into [A | B | S].
    let na = 0;
    let nb = 0;
    for (let k = lo; k < hi; k++) {
      const s = side[nodes[k]];
      if (s === 0) na++;
      else if (s === 1) nb++;
    }
    let wa = lo;
    let wb = lo + na;
    let wsep = lo + na + nb;
    for (let k = lo; k < hi; k++) {
      const v = nodes[k];
      const s = side[v];
      if (s === 0) tmp[wa++] = v;
      else if (s === 1) tmp[wb++] = v;
      else tmp[wsep++] = v;
    }
    nodes.set(tmp.subarray(lo, hi), lo);
    if (top + 4 > stack.length) {
      const grown = new Int32Array(stack.length * 2);
      grown.set(stack);
      stack = grown;
    }
    if (nb > 0) {
      stack[top++] = lo + na;
      stack[top++] = lo + na + nb;
    }
    if (na > 0) {
      stack[top++] = lo;
      stack[top++] = lo + na;
    }
    // Both pushed ranges are smaller than this one: half A lies inside one
    // half, and half B misses at least one node of the separator's half.
  }
  return { perm: nodes, invPerm: invertPermutation(nodes) };
}

/**
 * Nested dissection ordering of the degrees of freedom: the node ordering of
 * `orderNestedDissectionNodes` expanded so node v's DOFs dofsPerNode*v + c
 * (c = 0 .. dofsPerNode-1) stay together and in component order.
 */
export function orderNestedDissection(
  nodeAdjacency: CsrGraph,
  coords: Float64Array,
  dofsPerNode: number,
  options: NestedDissectionOptions = {},
): Ordering {
  if (!Number.isInteger(dofsPerNode) || dofsPerNode < 1) {
    throw new RangeError(`orderNestedDissection: dofsPerNode must be a positive integer, got ${dofsPerNode}`);
  }
  const nodeOrder = orderNestedDissectionNodes(nodeAdjacency, coords, options);
  return expandNodeOrdering(nodeOrder.perm, dofsPerNode);
}

/**
 * Rearranges nodes[lo:hi] so that nodes[k] for k < target compare <= nodes[target]
 * <= nodes[k] for k > target, comparing (coordinate on axis, node number).
 * Iterative quickselect (C. A. R. Hoare, "Algorithm 65: Find", CACM 4, 1961)
 * with a median-of-three pivot.
 */
function selectByCoordinate(nodes: Int32Array, lo: number, hi: number, target: number, coords: Float64Array, axis: number): void {
  let l = lo;
  let r = hi - 1;
  while (r > l) {
    const m = (l + r) >> 1;
    // median of three into position m
    if (less(nodes[m], nodes[l], coords, axis)) swap(nodes, m, l);
    if (less(nodes[r], nodes[l], coords, axis)) swap(nodes, r, l);
    if (less(nodes[r], nodes[m], coords, axis)) swap(nodes, r, m);
    const pv = nodes[m];
    let i = l;
    let j = r;
    while (i <= j) {
      while (less(nodes[i], pv, coords, axis)) i++;
      while (less(pv, nodes[j], coords, axis)) j--;
      if (i <= j) {
        swap(nodes, i, j);
        i++;
        j--;
      }
    }
    if (target <= j) r = j;
    else if (target >= i) l = i;
    else return;
  }
}

function less(a: number, b: number, coords: Float64Array, axis: number): boolean {
  const ka = coords[2 * a + axis];
  const kb = coords[2 * b + axis];
  return ka < kb || (ka === kb && a < b);
}

function swap(a: Int32Array, i: number, j: number): void {
  const t = a[i];
  a[i] = a[j];
  a[j] = t;
}

