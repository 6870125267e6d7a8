/**
 * Nested dissection (A. George, "Nested dissection of a regular finite element mesh", SIAM J.
 * Numer. Anal. 10, 1973) with separators found by recursive coordinate bisection (H. D. Simon,
 * "Partitioning of unstructured problems for parallel processing", Computing Systems in
 * Engineering 2, 1991; M. T. Heath and P. Raghavan, "A Cartesian parallel nested dissection
 * algorithm", SIAM J. Matrix Anal. Appl. 16, 1995), leaves ordered by minimum degree
 * (minimum-degree.ts); each separator improved by vertex moves (SeparatorRefiner).
 */

import { type CsrGraph, type Ordering, expandNodeOrdering, invertPermutation } from './ordering.js';
import { LeafMinimumDegree } from './minimum-degree.js';

export interface NestedDissectionOptions {
  /** ranges of at most this many nodes are not split further but ordered by minimum degree (default 128) */
  readonly leafSize?: number;
}

/** The cut directions tried for each range: the two axes and the two diagonals. */
const DIRECTIONS: readonly (readonly [number, number])[] = [
  [1, 0],
  [0, 1],
  [Math.SQRT1_2, Math.SQRT1_2],
  [Math.SQRT1_2, -Math.SQRT1_2],
];

/** Ranges of at least this many nodes try every direction; smaller ones cut across their principal axis. */
const TRY_DIRECTIONS_FROM = 1024;

/** How far a refined separator may unbalance the halves: the larger at most (1 + this) / 2 of the range. */
const IMBALANCE = 0.2;

/**
 * Nested dissection ordering of the nodes of a finite element mesh, from
 * node coordinates and the node adjacency graph (no self loops needed; they
 * are ignored). Returns the node permutation.
 *
 * Each range of nodes is split at the median of its nodes projected on the
 * range's principal axis (inertial bisection: the direction of largest
 * spread of its nodes; ties broken by node number, so the split always
 * halves the range). Ranges of TRY_DIRECTIONS_FROM nodes or more also try
 * the axes and the diagonals and keep the direction whose smaller one-sided
 * boundary (nodes of one half with a neighbour in the other) is smallest.
 * That boundary is the separator; a separator
 * node without a neighbour in its own half moves to the other half. The
 * separator is then improved by vertex moves in the manner of Fiduccia and
 * Mattheyses (C. M. Fiduccia and R. M. Mattheyses, "A linear-time heuristic
 * for improving network partitions", 19th Design Automation Conference,
 * 1982), as done for vertex separators in multilevel nested dissection (G.
 * Karypis and V. Kumar, "A fast and high quality multilevel scheme for
 * partitioning irregular graphs", SIAM J. Sci. Comput. 20, 1998, sec. 4.2):
 * see SeparatorRefiner. The layout of a range is [half A | half B |
 * separator], so separators are numbered after the parts they separate.
 * Ranges of at most leafSize nodes are ordered by exact minimum degree on
 * their induced subgraph. Work is driven by an explicit stack of ranges.
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
  // longest edge projection on each direction, to limit the boundary search to a band
  const band = new Float64Array(DIRECTIONS.length);
  let longestEdge2 = 0;
  for (let v = 0; v < nn; v++) {
    for (let q = ptr[v]; q < ptr[v + 1]; q++) {
      const u = idx[q];
      if (u < 0 || u >= nn) throw new RangeError(`orderNestedDissection: neighbour ${u} of node ${v} outside [0, ${nn})`);
      const dx = coords[2 * u] - coords[2 * v];
      const dy = coords[2 * u + 1] - coords[2 * v + 1];
      const len2 = dx * dx + dy * dy;
      if (len2 > longestEdge2) longestEdge2 = len2;
      // the axes and the diagonals (DIRECTIONS), written out: this loop runs once per edge
      const ax = Math.abs(dx);
      const ay = Math.abs(dy);
      const d1 = Math.abs(Math.SQRT1_2 * (dx + dy));
      const d2 = Math.abs(Math.SQRT1_2 * (dx - dy));
      if (ax > band[0]) band[0] = ax;
      if (ay > band[1]) band[1] = ay;
      if (d1 > band[2]) band[2] = d1;
      if (d2 > band[3]) band[3] = d2;
    }
  }
  const longestEdge = Math.sqrt(longestEdge2);
  const stampOf = new Int32Array(nn).fill(-1);
  const side = new Int8Array(nn);
  const tmp = new Int32Array(nn);
  const trial = new Int32Array(nn);
  const key = new Float64Array(nn);
  const leafWork = new LeafMinimumDegree(leafSize);
  const refiner = new SeparatorRefiner(nn);
  let stamp = 0;

  /** Marks nodes[lo:hi] split at mid, counts the one-sided boundaries within the band of the cut. */
  const countBoundaries = (arr: Int32Array, lo: number, hi: number, mid: number, b: number): { st: number; countA: number; countB: number } => {
    const st = ++stamp;
    for (let k = lo; k < hi; k++) {
      const v = arr[k];
      stampOf[v] = st;
      side[v] = k < mid ? 0 : 1;
    }
    const cut = key[arr[mid]];
    let countA = 0;
    let countB = 0;
    for (let k = lo; k < hi; k++) {
      const v = arr[k];
      const kv = key[v];
      if (kv < cut - b || kv > cut + b) continue;
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
    return { st, countA, countB };
  };
  // direction DIRECTIONS.length is the principal axis of the current range
  const principal: [number, number] = [1, 0];
  const principalDirection = (lo: number, hi: number): void => {
    let mx = 0;
    let my = 0;
    for (let k = lo; k < hi; k++) {
      mx += coords[2 * nodes[k]];
      my += coords[2 * nodes[k] + 1];
    }
    mx /= hi - lo;
    my /= hi - lo;
    let sxx = 0;
    let syy = 0;
    let sxy = 0;
    for (let k = lo; k < hi; k++) {
      const dx = coords[2 * nodes[k]] - mx;
      const dy = coords[2 * nodes[k] + 1] - my;
      sxx += dx * dx;
      syy += dy * dy;
      sxy += dx * dy;
    }
    const angle = 0.5 * Math.atan2(2 * sxy, sxx - syy);
    principal[0] = Math.cos(angle);
    principal[1] = Math.sin(angle);
  };
  // an edge projects on any unit direction within its length, so the longest edge bounds the principal band
  const bandOf = (d: number): number => (d < DIRECTIONS.length ? band[d] : longestEdge);
  const project = (lo: number, hi: number, d: number): void => {
    const [cx, cy] = d < DIRECTIONS.length ? DIRECTIONS[d] : principal;
    for (let k = lo; k < hi; k++) {
      const v = nodes[k];
      key[v] = cx * coords[2 * v] + cy * coords[2 * v + 1];
    }
  };

  let stack = new Int32Array(64);
  let top = 0;
  stack[top++] = 0;
  stack[top++] = nn;

  while (top > 0) {
    const hi = stack[--top];
    const lo = stack[--top];
    const size = hi - lo;
    if (size <= leafSize) {
      if (size > 1) leafWork.order(nodes, lo, hi, ptr, idx, stampOf, ++stamp);
      continue;
    }
    const mid = lo + (size >> 1);
    // The principal axis of the range's nodes (inertial bisection); large ranges also try the
    // axes and the diagonals, and keep the direction with the smallest separator at the median.
    principalDirection(lo, hi);
    let best = DIRECTIONS.length;
    if (size >= TRY_DIRECTIONS_FROM) {
      let bestCount = Infinity;
      for (let d = 0; d <= DIRECTIONS.length; d++) {
        project(lo, hi, d);
        trial.set(nodes.subarray(lo, hi), lo);
        selectByKey(trial, lo, hi, mid, key);
        const { countA, countB } = countBoundaries(trial, lo, hi, mid, bandOf(d));
        if (Math.min(countA, countB) < bestCount) {
          bestCount = Math.min(countA, countB);
          best = d;
        }
      }
    }
    project(lo, hi, best);
    selectByKey(nodes, lo, hi, mid, key);
    const { st, countA, countB } = countBoundaries(nodes, lo, hi, mid, bandOf(best));
    const cut = key[nodes[mid]];
    const bandLo = cut - bandOf(best);
    const bandHi = cut + bandOf(best);
    const sepSide = countA <= countB ? 0 : 1;
    const otherSide = 1 - sepSide;
    // Mark the separator (side 2).
    let ns = 0;
    const kFrom = sepSide === 0 ? lo : mid;
    const kTo = sepSide === 0 ? mid : hi;
    for (let k = kFrom; k < kTo; k++) {
      const v = nodes[k];
      const kv = key[v];
      if (kv < bandLo || kv > bandHi) continue;
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
    refiner.refine(nodes, lo, hi, side, stampOf, st, ptr, idx);
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
    // Both pushed ranges are smaller than this one: the refinement keeps each half
    // at most (1 + IMBALANCE) / 2 of the range, and at least one node in each half.
  }
  return { perm: nodes, invPerm: invertPermutation(nodes) };
}

/**
 * Improves a vertex separator S between halves A and B of one range by moving separator
 * nodes into a half. Moving v from S into A pulls v's neighbours in B into S: the separator
 * changes by |N(v) in B| - 1 (its gain is 1 - |N(v) in B|). Each pass makes the best move of a
 * node not yet moved in the pass, again and again, also through moves that make the separator
 * larger for a while (so it can climb out of a local minimum), keeping each half at most
 * (1 + IMBALANCE) / 2 of the range and non-empty; the pass stops after 32 moves without a new
 * best and rolls back to the best separator seen. Passes repeat while they improve, at most 4.
 * Gains are kept per separator node and updated for the neighbours of each move.
 */
export class SeparatorRefiner {
  /** separator nodes; posInSep[v] their places, -1 outside */
  private readonly sep: Int32Array;
  private readonly posInSep: Int32Array;
  /** gain of moving v to A (1 - neighbours in B) and to B (1 - neighbours in A) */
  private readonly gainA: Int32Array;
  private readonly gainB: Int32Array;
  private readonly moved: Int32Array;
  /** the moves of a pass: node, side it went to, and the nodes it pulled into the separator */
  private readonly logNode: Int32Array;
  private readonly logSide: Int8Array;
  private readonly logPulledEnd: Int32Array;
  private readonly pulled: Int32Array;
  private passStamp = 0;

  constructor(nn: number) {
    this.sep = new Int32Array(nn);
    this.posInSep = new Int32Array(nn).fill(-1);
    this.gainA = new Int32Array(nn);
    this.gainB = new Int32Array(nn);
    this.moved = new Int32Array(nn);
    this.logNode = new Int32Array(nn);
    this.logSide = new Int8Array(nn);
    this.logPulledEnd = new Int32Array(nn + 1);
    this.pulled = new Int32Array(nn);
  }

  refine(nodes: Int32Array, lo: number, hi: number, side: Int8Array, stampOf: Int32Array, st: number, ptr: Int32Array, idx: Int32Array): void {
    const { sep, posInSep, gainA, gainB, moved } = this;
    let nA = 0;
    let nB = 0;
    let nS = 0;
    for (let k = lo; k < hi; k++) {
      const v = nodes[k];
      if (side[v] === 0) nA++;
      else if (side[v] === 1) nB++;
      else {
        posInSep[v] = nS;
        sep[nS++] = v;
      }
    }
    if (nS === 0) return;
    const maxSide = ((1 + IMBALANCE) * (hi - lo)) / 2;
    const gainsOf = (v: number): void => {
      let inA = 0;
      let inB = 0;
      for (let q = ptr[v]; q < ptr[v + 1]; q++) {
        const u = idx[q];
        if (stampOf[u] !== st) continue;
        if (side[u] === 0) inA++;
        else if (side[u] === 1) inB++;
      }
      gainA[v] = 1 - inB;
      gainB[v] = 1 - inA;
    };
    const addToSep = (v: number): void => {
      posInSep[v] = nS;
      sep[nS++] = v;
    };
    const removeFromSep = (v: number): void => {
      const p = posInSep[v];
      const last = sep[--nS];
      sep[p] = last;
      posInSep[last] = p;
      posInSep[v] = -1;
    };
    for (let t = 0; t < nS; t++) gainsOf(sep[t]);
    for (let pass = 0; pass < 4; pass++) {
      const ps = ++this.passStamp;
      let moves = 0;
      let pulledTop = 0;
      let bestSize = nS;
      let bestAt = 0;
      let sinceBest = 0;
      this.logPulledEnd[0] = 0;
      while (sinceBest < 32) {
        let bv = -1;
        let bto = 0;
        let bg = -Infinity;
        for (let t = 0; t < nS; t++) {
          const v = sep[t];
          if (moved[v] === ps) continue;
          // to A pulls (1 - gainA) nodes out of B; both halves must stay non-empty and balanced
          const ga = gainA[v];
          if (nA + 1 <= maxSide && nB - (1 - ga) >= 1 && (ga > bg || (ga === bg && nA < nB))) {
            bg = ga;
            bv = v;
            bto = 0;
          }
          const gb = gainB[v];
          if (nB + 1 <= maxSide && nA - (1 - gb) >= 1 && (gb > bg || (gb === bg && nB < nA))) {
            bg = gb;
            bv = v;
            bto = 1;
          }
        }
        if (bv < 0) break;
        const other = 1 - bto;
        // v joins side bto: its neighbours on the other side enter the separator
        removeFromSep(bv);
        side[bv] = bto;
        moved[bv] = ps;
        if (bto === 0) nA++;
        else nB++;
        for (let q = ptr[bv]; q < ptr[bv + 1]; q++) {
          const u = idx[q];
          if (stampOf[u] !== st) continue;
          if (side[u] === other) {
            side[u] = 2;
            if (other === 0) nA--;
            else nB--;
            addToSep(u);
            this.pulled[pulledTop++] = u;
          }
        }
        // the gains of separator nodes next to what changed
        gainsOfAround(bv);
        for (let t = this.logPulledEnd[moves]; t < pulledTop; t++) {
          gainsOf(this.pulled[t]);
          gainsOfAround(this.pulled[t]);
        }
        this.logNode[moves] = bv;
        this.logSide[moves] = bto;
        this.logPulledEnd[++moves] = pulledTop;
        if (nS < bestSize) {
          bestSize = nS;
          bestAt = moves;
          sinceBest = 0;
        } else sinceBest++;
      }
      // Roll back the moves after the best separator.
      for (let m = moves - 1; m >= bestAt; m--) {
        const v = this.logNode[m];
        const other = 1 - this.logSide[m];
        for (let t = this.logPulledEnd[m]; t < this.logPulledEnd[m + 1]; t++) {
          const u = this.pulled[t];
          removeFromSep(u);
          side[u] = other;
          if (other === 0) nA++;
          else nB++;
        }
        if (this.logSide[m] === 0) nA--;
        else nB--;
        side[v] = 2;
        addToSep(v);
      }
      if (moves > bestAt) for (let t = 0; t < nS; t++) gainsOf(sep[t]);
      if (bestAt === 0) break;
    }
    for (let t = 0; t < nS; t++) posInSep[sep[t]] = -1;

    function gainsOfAround(v: number): void {
      for (let q = ptr[v]; q < ptr[v + 1]; q++) {
        const u = idx[q];
        if (stampOf[u] === st && side[u] === 2) gainsOf(u);
      }
    }
  }
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
 * <= nodes[k] for k > target, comparing (key, node number).
 * Iterative quickselect (C. A. R. Hoare, "Algorithm 65: Find", CACM 4, 1961)
 * with a median-of-three pivot.
 */
function selectByKey(nodes: Int32Array, lo: number, hi: number, target: number, key: Float64Array): void {
  let l = lo;
  let r = hi - 1;
  while (r > l) {
    const m = (l + r) >> 1;
    // median of three into position m
    if (less(nodes[m], nodes[l], key)) swap(nodes, m, l);
    if (less(nodes[r], nodes[l], key)) swap(nodes, r, l);
    if (less(nodes[r], nodes[m], key)) swap(nodes, r, m);
    const pv = nodes[m];
    let i = l;
    let j = r;
    while (i <= j) {
      while (less(nodes[i], pv, key)) i++;
      while (less(pv, nodes[j], key)) j--;
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

function less(a: number, b: number, key: Float64Array): boolean {
  const ka = key[a];
  const kb = key[b];
  return ka < kb || (ka === kb && a < b);
}

function swap(a: Int32Array, i: number, j: number): void {
  const t = a[i];
  a[i] = a[j];
  a[j] = t;
}
