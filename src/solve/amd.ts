/**
 * Approximate minimum degree on the quotient graph (P. R. Amestoy, T. A. Davis and I. S. Duff,
 * "An approximate minimum degree ordering algorithm", SIAM J. Matrix Anal. Appl. 17(4), 1996),
 * with element absorption, aggressive absorption, mass elimination and supervariable detection
 * by hashing (the latter from C. Ashcraft, "Compressed graphs and the minimum degree
 * algorithm", SIAM J. Sci. Comput. 16, 1995, as used in the 1996 paper). The code is written
 * afresh.
 */

import { InternalError } from '../model/errors.js';
import { type CsrGraph, type Ordering, invertPermutation, orderNatural } from './ordering.js';

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
    if (mindeg > n) throw new InternalError('orderAmd: degree lists empty before all variables were eliminated');
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
