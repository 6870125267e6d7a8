/**
 * The elimination tree of a symmetric matrix and what is read from it: children lists, a
 * postorder, and the column counts of the Cholesky factor L. These are the first phase of the
 * symbolic analysis (symbolic.ts); they look at the pattern only, never at values.
 *
 * Sources (the code is written afresh):
 *  - elimination tree: J. W. H. Liu, "A compact row storage scheme for Cholesky factors using
 *    elimination trees", ACM TOMS 12, 1986, and "The role of elimination trees in sparse
 *    factorization", SIAM J. Matrix Anal. Appl. 11, 1990 (path-compressed ancestor algorithm);
 *  - postorder of the tree: an equivalent reordering with the same fill (Liu 1990), which makes
 *    supernodes contiguous;
 *  - column counts of L: J. R. Gilbert, E. G. Ng and B. W. Peyton, "An efficient algorithm to
 *    compute row and column counts for sparse Cholesky factorization", SIAM J. Matrix Anal.
 *    Appl. 15, 1994 (row subtrees, their leaves and least common ancestors by disjoint sets).
 */

import { InternalError } from '../model/errors.js';
import type { SymmetricCsc } from './sparse.js';

/**
 * Children lists of a forest given by parent (-1 for a root): the children of v are
 * head[v], next[head[v]], ... in increasing order, -1 ending each list.
 */
export function childLists(parent: Int32Array): { head: Int32Array; next: Int32Array } {
  const n = parent.length;
  const head = new Int32Array(n).fill(-1);
  const next = new Int32Array(n).fill(-1);
  // insert in decreasing order at the head, so each list comes out increasing
  for (let j = n - 1; j >= 0; j--) {
    const p = parent[j];
    if (p !== -1) {
      next[j] = head[p];
      head[p] = j;
    }
  }
  return { head, next };
}

/**
 * Elimination tree of a symmetric matrix given by its upper-triangle pattern
 * (column j lists rows i <= j): parent[j] = min{ i > j : L(i, j) != 0 } or -1.
 * Liu's algorithm with path compression (ancestor array), O(nnz alpha(n)).
 */
export function eliminationTree(n: number, upperColPtr: Int32Array, upperRowIndex: Int32Array): Int32Array {
  const parent = new Int32Array(n).fill(-1);
  const ancestor = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    for (let p = upperColPtr[k]; p < upperColPtr[k + 1]; p++) {
      let i = upperRowIndex[p];
      // climb from i to the root of its current subtree, pointing the path at k
      while (i !== -1 && i < k) {
        const next = ancestor[i];
        ancestor[i] = k;
        if (next === -1) {
          parent[i] = k;
          break;
        }
        i = next;
      }
    }
  }
  return parent;
}

/**
 * A postorder of the forest given by parent (children visited in increasing
 * order), by an explicit-stack depth-first search. Returns post with
 * post[k] = the k-th node in postorder.
 */
export function postorderTree(parent: Int32Array): Int32Array {
  const n = parent.length;
  const { head, next } = childLists(parent);
  const post = new Int32Array(n);
  const stack = new Int32Array(n);
  let k = 0;
  for (let root = 0; root < n; root++) {
    if (parent[root] !== -1) continue;
    let top = 0;
    stack[0] = root;
    while (top >= 0) {
      const v = stack[top];
      const c = head[v];
      if (c === -1) {
        post[k++] = v;
        top--;
      } else {
        head[v] = next[c]; // detach the first child, then descend into it
        stack[++top] = c;
      }
    }
  }
  if (k !== n) throw new InternalError('postorderTree: parent array has a cycle');
  return post;
}

/**
 * Column counts of L (diagonal included) for the lower-triangle matrix C with
 * elimination tree parent and postorder post, by Gilbert, Ng & Peyton (1994):
 * cc(j) = number of row subtrees T_i containing j. Each T_i is a union of
 * tree paths; weights +1 at its leaves, -1 at least common ancestors of
 * consecutive leaves and -1 at parent(i), summed over subtrees, count it.
 * A node j is a leaf of T_i iff C(i, j) != 0 and no earlier (in postorder)
 * k with C(i, k) != 0 is a descendant of j, i.e. first(j) > prevnbr(i).
 */
export function columnCounts(c: Pick<SymmetricCsc, 'n' | 'colPtr' | 'rowIndex'>, parent: Int32Array, post: Int32Array): Int32Array {
  const { n, colPtr, rowIndex } = c;
  const first = new Int32Array(n).fill(-1);
  const weight = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    let j = post[k];
    weight[j] = first[j] === -1 ? 1 : 0; // an etree leaf: its row subtree is {j}
    while (j !== -1 && first[j] === -1) {
      first[j] = k;
      j = parent[j];
    }
  }
  const prevNbr = new Int32Array(n).fill(-1);
  const prevLeaf = new Int32Array(n).fill(-1);
  const ancestor = new Int32Array(n);
  for (let i = 0; i < n; i++) ancestor[i] = i;
  for (let k = 0; k < n; k++) {
    const j = post[k];
    if (parent[j] !== -1) weight[parent[j]]--;
    for (let p = colPtr[j]; p < colPtr[j + 1]; p++) {
      const i = rowIndex[p];
      if (i <= j) continue;
      if (first[j] > prevNbr[i]) {
        weight[j]++;
        const pl = prevLeaf[i];
        if (pl !== -1) {
          // least common ancestor of pl and j: root of pl's set
          let q = pl;
          while (q !== ancestor[q]) q = ancestor[q];
          let s = pl;
          while (s !== q) {
            const t = ancestor[s];
            ancestor[s] = q;
            s = t;
          }
          weight[q]--;
        }
        prevLeaf[i] = j;
      }
      prevNbr[i] = k;
    }
    if (parent[j] !== -1) ancestor[j] = parent[j];
  }
  // Sum weights over subtrees, children before parents.
  for (let k = 0; k < n; k++) {
    const j = post[k];
    if (parent[j] !== -1) weight[parent[j]] += weight[j];
  }
  return weight;
}
