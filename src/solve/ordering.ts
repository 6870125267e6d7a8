/**
 * Fill-reducing orderings for sparse symmetric positive definite matrices.
 *
 * Every ordering is reported as `perm` (new -> old: row k of the permuted
 * matrix is row perm[k] of the original) and `invPerm` (old -> new).
 *
 *  - `orderNestedDissection`: nested dissection (A. George, "Nested dissection
 *    of a regular finite element mesh", SIAM J. Numer. Anal. 10, 1973) with
 *    separators found by recursive coordinate bisection (H. D. Simon,
 *    "Partitioning of unstructured problems for parallel processing",
 *    Computing Systems in Engineering 2, 1991; M. T. Heath and P. Raghavan,
 *    "A Cartesian parallel nested dissection algorithm", SIAM J. Matrix Anal.
 *    Appl. 16, 1995), leaves ordered by minimum degree (W. F. Tinney and
 *    J. W. Walker, 1967; A. George and J. W. H. Liu, "The evolution of the
 *    minimum degree ordering algorithm", SIAM Review 31, 1989).
 *  - `orderAmd`: approximate minimum degree on the quotient graph (P. R.
 *    Amestoy, T. A. Davis and I. S. Duff, "An approximate minimum degree
 *    ordering algorithm", SIAM J. Matrix Anal. Appl. 17(4), 1996), with
 *    element absorption, aggressive absorption, mass elimination and
 *    supervariable detection by hashing (the latter from C. Ashcraft,
 *    "Compressed graphs and the minimum degree algorithm", SIAM J. Sci.
 *    Comput. 16, 1995, as used in the 1996 paper).
 */

/** A permutation, new -> old, with its inverse (old -> new). */
export interface Ordering {
  readonly perm: Int32Array;
  readonly invPerm: Int32Array;
}

/** A graph in compressed sparse row form: neighbours of v are idx[ptr[v] .. ptr[v+1]-1]. */
export interface CsrGraph {
  readonly ptr: Int32Array;
  readonly idx: Int32Array;
}

/** The natural (identity) ordering of size n. */
export function orderNatural(n: number): Ordering {
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[i] = i;
  return { perm, invPerm: perm.slice() };
}

/** invPerm from perm; throws a RangeError if perm is not a permutation of 0..n-1. */
export function invertPermutation(perm: Int32Array): Int32Array {
  const n = perm.length;
  const inv = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    const i = perm[k];
    if (i < 0 || i >= n || inv[i] !== -1) throw new RangeError(`invertPermutation: not a permutation (entry ${k} = ${i})`);
    inv[i] = k;
  }
  return inv;
}

/** True when perm is a permutation of 0..perm.length-1. */
export function isPermutation(perm: Int32Array): boolean {
  const n = perm.length;
  const seen = new Uint8Array(n);
  for (let k = 0; k < n; k++) {
    const i = perm[k];
    if (i < 0 || i >= n || seen[i]) return false;
    seen[i] = 1;
  }
  return true;
}

/**
 * Restricts an ordering of a full index set to the kept subset: newOfOld maps
 * a full index to its index in the subset, or -1 when it was removed (as
 * returned by `extractPrincipal`). The relative order of kept indices is
 * preserved, so a good ordering of the full problem stays good.
 */
export function restrictOrdering(fullPerm: Int32Array, newOfOld: Int32Array): Ordering {
  let m = 0;
  for (let i = 0; i < newOfOld.length; i++) if (newOfOld[i] >= 0) m++;
  const perm = new Int32Array(m);
  let w = 0;
  for (let k = 0; k < fullPerm.length; k++) {
    const r = newOfOld[fullPerm[k]];
    if (r >= 0) perm[w++] = r;
  }
  if (w !== m) throw new RangeError('restrictOrdering: full permutation does not cover the kept set');
  return { perm, invPerm: invertPermutation(perm) };
}

// ---------------------------------------------------------------------------
// Nested dissection by coordinate bisection
// ---------------------------------------------------------------------------

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

/** Expands a node permutation to DOFs dofsPerNode*node + component. */
export function expandNodeOrdering(nodePerm: Int32Array, dofsPerNode: number): Ordering {
  const nn = nodePerm.length;
  const perm = new Int32Array(nn * dofsPerNode);
  for (let k = 0; k < nn; k++) {
    const v = nodePerm[k];
    for (let c = 0; c < dofsPerNode; c++) perm[k * dofsPerNode + c] = v * dofsPerNode + c;
  }
  return { perm, invPerm: invertPermutation(perm) };
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

/**
 * Exact minimum degree on a leaf of the dissection, with a dense boolean
 * adjacency matrix (bit rows): eliminating v joins its remaining neighbours into a
 * clique (the elimination graph model of S. V. Parter, 1961, and D. J. Rose,
 * 1972). The leaf's neighbours outside it (all in separators, numbered later)
 * take part as a halo that is never eliminated: they count in the degrees,
 * so nodes next to a separator tend to go last, as in the halo minimum
 * degree used with nested dissection by F. Pellegrini, J. Roman and P.
 * Amestoy, "Hybridizing nested dissection and halo approximate minimum
 * degree for efficient sparse matrix ordering", Concurrency: Practice and
 * Experience 12, 2000. Ties go to the lowest local index. Rows of the
 * adjacency matrix are bit sets: a clique is formed by OR-ing the pivot's
 * row into its neighbours' rows, and degrees are population counts.
 */
class LeafMinimumDegree {
  private cap = 0;
  private words = 0;
  private bits = new Uint32Array(0); // row t: words [t*W, (t+1)*W) of the adjacency bit matrix
  private alive = new Uint32Array(0);
  private nbrMask = new Uint32Array(0);
  private deg = new Int32Array(0);
  private done = new Uint8Array(0);
  private nbr = new Int32Array(0);
  private localOf: Int32Array = new Int32Array(0);
  private haloStamp: Int32Array = new Int32Array(0);

  constructor(private readonly maxSize: number) {}

  private ensure(total: number): void {
    if (total <= this.cap) return;
    const c = Math.max(total, 2 * this.maxSize);
    const w = (c + 31) >>> 5;
    this.cap = c;
    this.words = w;
    this.bits = new Uint32Array(c * w);
    this.alive = new Uint32Array(w);
    this.nbrMask = new Uint32Array(w);
    this.deg = new Int32Array(c);
    this.done = new Uint8Array(c);
    this.nbr = new Int32Array(c);
  }

  order(nodes: Int32Array, lo: number, hi: number, ptr: Int32Array, idx: Int32Array, stampOf: Int32Array, st: number): void {
    const m = hi - lo;
    if (m > this.maxSize) throw new RangeError('LeafMinimumDegree: leaf larger than its buffers');
    if (this.localOf.length < stampOf.length) {
      this.localOf = new Int32Array(stampOf.length);
      this.haloStamp = new Int32Array(stampOf.length).fill(-1);
    }
    const { localOf, haloStamp } = this;
    // leaf nodes 0 .. m-1, then halo nodes
    for (let t = 0; t < m; t++) {
      const v = nodes[lo + t];
      stampOf[v] = st;
      localOf[v] = t;
    }
    let total = m;
    for (let t = 0; t < m; t++) {
      const v = nodes[lo + t];
      for (let q = ptr[v]; q < ptr[v + 1]; q++) {
        const u = idx[q];
        if (stampOf[u] !== st && haloStamp[u] !== st) {
          haloStamp[u] = st;
          localOf[u] = total;
          total++;
        }
      }
    }
    this.ensure(total);
    const W = (total + 31) >>> 5;
    const stride = this.words;
    const { bits, alive, nbrMask, deg, done, nbr } = this;
    for (let t = 0; t < m; t++) bits.fill(0, t * stride, t * stride + W);
    alive.fill(0, 0, W);
    for (let t = 0; t < total; t++) alive[t >>> 5] |= 1 << (t & 31);
    done.fill(0, 0, m);
    // leaf rows only: halo rows are never needed (halo degrees do not matter)
    for (let t = 0; t < m; t++) {
      const v = nodes[lo + t];
      const row = t * stride;
      for (let q = ptr[v]; q < ptr[v + 1]; q++) {
        const u = idx[q];
        if (u === v) continue;
        const s2 = localOf[u];
        bits[row + (s2 >>> 5)] |= 1 << (s2 & 31);
      }
    }
    for (let t = 0; t < m; t++) deg[t] = popcountRow(bits, t * stride, alive, W);
    const order = new Int32Array(m);
    for (let step = 0; step < m; step++) {
      let best = -1;
      let bestDeg = 0x7fffffff;
      for (let t = 0; t < m; t++) {
        if (done[t] === 0 && deg[t] < bestDeg) {
          bestDeg = deg[t];
          best = t;
        }
      }
      const v = best;
      done[v] = 1;
      alive[v >>> 5] &= ~(1 << (v & 31));
      order[step] = nodes[lo + v];
      // remaining neighbours of v, as a mask and a list of leaf nodes
      const rv = v * stride;
      let k = 0;
      for (let w = 0; w < W; w++) {
        let x = bits[rv + w] & alive[w];
        nbrMask[w] = x;
        while (x !== 0) {
          const bit = x & -x;
          const u = (w << 5) + 31 - Math.clz32(bit);
          if (u < m) nbr[k++] = u;
          x ^= bit;
        }
      }
      // eliminating v makes its neighbours a clique
      for (let a = 0; a < k; a++) {
        const u = nbr[a];
        const ru = u * stride;
        for (let w = 0; w < W; w++) bits[ru + w] |= nbrMask[w];
        bits[ru + (u >>> 5)] &= ~(1 << (u & 31));
        deg[u] = popcountRow(bits, ru, alive, W);
      }
    }
    nodes.set(order, lo);
  }
}

/** Number of set bits of bits[row .. row+W) & mask (SWAR population count). */
function popcountRow(bits: Uint32Array, row: number, mask: Uint32Array, W: number): number {
  let c = 0;
  for (let w = 0; w < W; w++) {
    let x = bits[row + w] & mask[w];
    x -= (x >>> 1) & 0x55555555;
    x = (x & 0x33333333) + ((x >>> 2) & 0x33333333);
    x = (x + (x >>> 4)) & 0x0f0f0f0f;
    c += Math.imul(x, 0x01010101) >>> 24;
  }
  return c;
}

// ---------------------------------------------------------------------------
// Approximate minimum degree (Amestoy, Davis and Duff 1996)
// ---------------------------------------------------------------------------

const VARIABLE = 0;
const ELEMENT = 1;
const GONE = 2;

/**
 * Approximate minimum degree ordering of a symmetric graph given in CSR form
 * (both directions of each edge present; self loops and repeated entries are
 * tolerated and ignored). Returns the DOF permutation.
 *
 * The elimination is simulated on the quotient graph: each variable i keeps
 * a list [elements E_i | variables A_i] and each element e the list L_e of its
 * variables, all in one integer workspace that is compacted (and grown, never
 * capped) when it runs out. Eliminating pivot p forms L_p from A_p and the
 * L_e of its elements, which are absorbed. For each i in L_p the external
 * degree is bounded as in the 1996 paper, eq. (4):
 *     d_i = min( n - k - |i|,  d_i(old) + |L_p \ i|,
 *                |A_i \ i| + |L_p \ i| + sum_{e in E_i \ p} |L_e \ L_p| )
 * with |L_e \ L_p| computed for all e in one pass over L_p (their Algorithm 2).
 * Elements with |L_e \ L_p| = 0 are absorbed (aggressive absorption), a
 * variable whose only neighbour is p is eliminated with it (mass
 * elimination), and variables of L_p with identical lists are merged into one
 * supervariable (detected by a hash of the list, then compared exactly).
 * Members of a supervariable are numbered consecutively.
 */
export function orderAmd(graph: CsrGraph): Ordering {
  const { ptr, idx } = graph;
  const n = ptr.length - 1;
  if (n <= 0) return orderNatural(0);

  // Workspace with elbow room; lists are appended at pfree.
  let nzIn = 0;
  for (let i = 0; i < n; i++) {
    for (let q = ptr[i]; q < ptr[i + 1]; q++) if (idx[q] !== i) nzIn++;
  }
  let iwlen = Math.ceil(nzIn * 1.2) + 2 * n + 16;
  let iw = new Int32Array(iwlen);
  const pe = new Int32Array(n);
  const len = new Int32Array(n);
  const elen = new Int32Array(n);
  const status = new Uint8Array(n);
  const nv = new Int32Array(n).fill(1);
  const degree = new Int32Array(n);
  const w = new Int32Array(n);
  const head = new Int32Array(n + 1).fill(-1);
  const next = new Int32Array(n).fill(-1);
  const last = new Int32Array(n).fill(-1);
  const partial = new Int32Array(n);
  const hashOf = new Int32Array(n);
  const hashHead = new Int32Array(n).fill(-1);
  const hashNext = new Int32Array(n).fill(-1);
  const mark = new Int32Array(n);
  const rep = new Int32Array(n).fill(-1);
  const pivotStep = new Int32Array(n).fill(-1);

  // Copy the graph, dropping self loops and repeated neighbours.
  let pfree = 0;
  {
    for (let i = 0; i < n; i++) {
      pe[i] = pfree;
      const stampValue = i + 1;
      for (let q = ptr[i]; q < ptr[i + 1]; q++) {
        const j = idx[q];
        if (j < 0 || j >= n) throw new RangeError(`orderAmd: neighbour ${j} of ${i} outside [0, ${n})`);
        if (j !== i && mark[j] !== stampValue) {
          mark[j] = stampValue;
          iw[pfree++] = j;
        }
      }
      len[i] = pfree - pe[i];
    }
    mark.fill(0);
  }
  let markStamp = 0;

  const insertDegree = (i: number, d: number): void => {
    const h = head[d];
    next[i] = h;
    last[i] = -1;
    if (h !== -1) last[h] = i;
    head[d] = i;
  };
  const removeDegree = (i: number): void => {
    const nx = next[i];
    const ls = last[i];
    if (ls !== -1) next[ls] = nx;
    else head[degree[i]] = nx;
    if (nx !== -1) last[nx] = ls;
  };

  for (let i = 0; i < n; i++) {
    degree[i] = len[i];
    insertDegree(i, len[i]);
  }

  const compact = (needed: number): void => {
    let live = 0;
    for (let x = 0; x < n; x++) if (status[x] !== GONE) live += len[x];
    let newLen = iwlen;
    if (live + needed > 0.8 * iwlen) newLen = Math.ceil(1.5 * (live + needed)) + n;
    const niw = new Int32Array(newLen);
    let wr = 0;
    for (let x = 0; x < n; x++) {
      if (status[x] === GONE) continue;
      const s = pe[x];
      niw.set(iw.subarray(s, s + len[x]), wr);
      pe[x] = wr;
      wr += len[x];
    }
    iw = niw;
    iwlen = newLen;
    pfree = wr;
  };

  let wflg = 1;
  let nel = 0;
  let mindeg = 0;
  let step = 0;

  while (nel < n) {
    // 1. Pivot of least approximate degree.
    while (mindeg <= n && head[mindeg] === -1) mindeg++;
    if (mindeg > n) throw new Error('orderAmd: degree lists empty before all variables were eliminated');
    const p = head[mindeg];
    removeDegree(p);
    const nvp = nv[p];
    nel += nvp;
    pivotStep[p] = step++;
    nv[p] = -nvp;

    // 2. Form L_p at the end of the workspace.
    let bound = len[p] - elen[p];
    for (let q = 0; q < elen[p]; q++) {
      const e = iw[pe[p] + q];
      if (status[e] === ELEMENT) bound += len[e];
    }
    if (pfree + bound > iwlen) compact(bound);
    const pstart = pfree;
    let degme = 0;
    {
      const pp = pe[p];
      const ep = elen[p];
      const lp = len[p];
      for (let q = 0; q < lp; q++) {
        const entry = iw[pp + q];
        if (q < ep) {
          if (status[entry] !== ELEMENT) continue;
          const pe2 = pe[entry];
          const le = len[entry];
          for (let r = 0; r < le; r++) {
            const i = iw[pe2 + r];
            const nvi = nv[i];
            if (status[i] === VARIABLE && nvi > 0) {
              degme += nvi;
              nv[i] = -nvi;
              iw[pfree++] = i;
              removeDegree(i);
            }
          }
          status[entry] = GONE; // absorbed into p
        } else {
          const i = entry;
          const nvi = nv[i];
          if (status[i] === VARIABLE && nvi > 0) {
            degme += nvi;
            nv[i] = -nvi;
            iw[pfree++] = i;
            removeDegree(i);
          }
        }
      }
    }
    status[p] = ELEMENT;
    pe[p] = pstart;
    len[p] = pfree - pstart;
    elen[p] = 0;
    const pend = pfree;

    // 3. |L_e \ L_p| for every element e adjacent to L_p: w[e] - wflg.
    if (wflg > 0x3fffffff - n) {
      w.fill(0);
      wflg = 1;
    }
    for (let q = pstart; q < pend; q++) {
      const i = iw[q];
      const nvi = -nv[i];
      const pi = pe[i];
      const ei = elen[i];
      for (let r = 0; r < ei; r++) {
        const e = iw[pi + r];
        if (status[e] !== ELEMENT) continue;
        const we = w[e];
        if (we >= wflg) w[e] = we - nvi;
        else w[e] = degree[e] + wflg - nvi;
      }
    }

    // 4. Prune lists, bound degrees, mass elimination, hash.
    for (let q = pstart; q < pend; q++) {
      const i = iw[q];
      const nvi = -nv[i];
      const pi = pe[i];
      const ei = elen[i];
      const li = len[i];
      let deg = 0;
      let hash = 0;
      let wr = pi;
      for (let r = 0; r < ei; r++) {
        const e = iw[pi + r];
        if (status[e] !== ELEMENT) continue;
        const we = w[e] - wflg;
        if (we > 0) {
          deg += we;
          iw[wr++] = e;
          hash = (hash + e) % n;
        } else {
          status[e] = GONE; // aggressive absorption: L_e is inside L_p
        }
      }
      const kElems = wr - pi;
      for (let r = ei; r < li; r++) {
        const j = iw[pi + r];
        if (status[j] !== VARIABLE || nv[j] <= 0) continue;
        deg += nv[j];
        iw[wr++] = j;
        hash = (hash + j) % n;
      }
      const kVars = wr - pi - kElems;
      if (kElems === 0 && kVars === 0) {
        // Mass elimination: i is adjacent to p only.
        status[i] = GONE;
        rep[i] = p;
        nv[i] = 0;
        nel += nvi;
        degme -= nvi;
        continue;
      }
      // Put p first: [p | elements | variables]; one entry at least was removed.
      const end = pi + kElems + kVars;
      if (kVars > 0) iw[end] = iw[pi + kElems];
      if (kElems > 0) iw[pi + kElems] = iw[pi];
      iw[pi] = p;
      len[i] = kElems + kVars + 1;
      elen[i] = kElems + 1;
      partial[i] = deg;
      hash = (hash + p) % n;
      hashOf[i] = hash;
      hashNext[i] = hashHead[hash];
      hashHead[hash] = i;
    }

    // 5. Supervariables: compare variables of L_p that share a hash.
    for (let q = pstart; q < pend; q++) {
      const i0 = iw[q];
      if (status[i0] !== VARIABLE) continue;
      const h = hashOf[i0];
      let i = hashHead[h];
      if (i === -1) continue;
      hashHead[h] = -1;
      while (i !== -1) {
        markStamp++;
        if (markStamp === 0x7fffffff) {
          mark.fill(0);
          markStamp = 1;
        }
        const pi = pe[i];
        const li = len[i];
        for (let r = 0; r < li; r++) mark[iw[pi + r]] = markStamp;
        let jprev = i;
        let j = hashNext[i];
        while (j !== -1) {
          const jn = hashNext[j];
          let same = len[j] === li && elen[j] === elen[i];
          if (same) {
            const pj = pe[j];
            for (let r = 0; r < li; r++) {
              if (mark[iw[pj + r]] !== markStamp) {
                same = false;
                break;
              }
            }
          }
          if (same) {
            nv[i] += nv[j]; // both carry the in-L_p negative flag
            nv[j] = 0;
            status[j] = GONE;
            rep[j] = i;
            hashNext[jprev] = jn;
          } else {
            jprev = j;
          }
          j = jn;
        }
        i = hashNext[i];
      }
    }

    // 6. Final degrees, back into the degree lists; compress L_p.
    let wr = pstart;
    for (let q = pstart; q < pend; q++) {
      const i = iw[q];
      if (status[i] !== VARIABLE) continue;
      const nvi = -nv[i];
      nv[i] = nvi;
      const lpOut = degme - nvi;
      let d = degree[i] + lpOut;
      const d2 = partial[i] + lpOut;
      if (d2 < d) d = d2;
      const d3 = n - nel - nvi;
      if (d3 < d) d = d3;
      if (d < 0) d = 0;
      degree[i] = d;
      insertDegree(i, d);
      if (d < mindeg) mindeg = d;
      iw[wr++] = i;
    }
    len[p] = wr - pstart;
    pfree = wr;
    degree[p] = degme; // weighted size |L_p| of the new element
    nv[p] = nvp;
    wflg += n + 1;
  }

  // Each variable is numbered with the pivot it was eliminated with.
  const groupOf = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    let r = i;
    while (pivotStep[r] < 0) r = rep[r];
    // path compression
    let c = i;
    while (pivotStep[c] < 0) {
      const nx = rep[c];
      rep[c] = r;
      c = nx;
    }
    groupOf[i] = pivotStep[r];
  }
  const start = new Int32Array(step + 1);
  for (let i = 0; i < n; i++) start[groupOf[i] + 1]++;
  for (let s = 0; s < step; s++) start[s + 1] += start[s];
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[start[groupOf[i]]++] = i;
  return { perm, invPerm: invertPermutation(perm) };
}
