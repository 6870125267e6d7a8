/**
 * Minimum degree ordering of the small leaves of a nested dissection (W. F. Tinney and J. W.
 * Walker, 1967; A. George and J. W. H. Liu, "The evolution of the minimum degree ordering
 * algorithm", SIAM Review 31, 1989), exact, with the leaf's separator neighbours as a halo.
 */

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
export class LeafMinimumDegree {
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
