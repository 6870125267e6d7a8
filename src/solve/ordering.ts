/**
 * What the fill-reducing orderings share: the Ordering and graph types, the natural ordering,
 * permutation helpers, and the restriction of an ordering to a kept subset.
 *
 * Every ordering is reported as `perm` (new -> old: row k of the permuted matrix is row perm[k]
 * of the original) and `invPerm` (old -> new). The orderings themselves, one module each:
 *  - nested-dissection.ts: nested dissection from node coordinates (the default where the mesh
 *    is known);
 *  - minimum-degree.ts: exact minimum degree with a halo, on the leaves of the dissection;
 *  - amd.ts: approximate minimum degree on the matrix graph (the default without a mesh).
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
