/**
 * Test and benchmark matrices for the sparse solver, made here so the solver
 * can be checked and timed without the rest of the pipeline: a jittered
 * triangulated rectangle and the plane-stress stiffness of linear (3-node,
 * constant strain) triangles on it, and grid Laplacians.
 *
 * The constant strain triangle stiffness is K_e = t A B^T D B with the
 * plane-stress elasticity matrix D = E / (1 - nu^2) [1 nu 0; nu 1 0; 0 0 (1-nu)/2]
 * and B built from b_i = y_j - y_k, c_i = x_k - x_j over 2A (O. C. Zienkiewicz
 * and R. L. Taylor, "The Finite Element Method", vol. 1, chapter on plane
 * elasticity; one-point quadrature is exact since B is constant).
 */

import { type SymmetricCsc, assembleSymmetric, extractPrincipal } from './sparse.js';
import type { CsrGraph } from './ordering.js';

/** Deterministic pseudo-random numbers in [0, 1) (mulberry32 generator). */
export function seededRandom(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** A triangle mesh: coords [x0, y0, ...], triangles [i, j, k, ...] counter-clockwise (y up). */
export interface TriangleMesh {
  readonly coords: Float64Array;
  readonly triangles: Int32Array;
}

/**
 * A width x height rectangle cut into nx x ny cells, each split into two
 * counter-clockwise triangles (diagonal direction alternating in a
 * checkerboard), with interior nodes moved by up to `jitter` cell sizes in
 * each direction (jitter < 0.5 keeps every triangle positively oriented;
 * 0.25 is used by default).
 */
export function jitteredRectangleMesh(nx: number, ny: number, width: number, height: number, seed = 1, jitter = 0.25): TriangleMesh {
  if (!(jitter >= 0 && jitter < 0.5)) throw new RangeError('jitteredRectangleMesh: jitter must be in [0, 0.5)');
  const rnd = seededRandom(seed);
  const hx = width / nx;
  const hy = height / ny;
  const nn = (nx + 1) * (ny + 1);
  const coords = new Float64Array(2 * nn);
  for (let j = 0; j <= ny; j++) {
    for (let i = 0; i <= nx; i++) {
      const v = j * (nx + 1) + i;
      let x = i * hx;
      let y = j * hy;
      if (i > 0 && i < nx) x += (2 * rnd() - 1) * jitter * hx;
      if (j > 0 && j < ny) y += (2 * rnd() - 1) * jitter * hy;
      coords[2 * v] = x;
      coords[2 * v + 1] = y;
    }
  }
  const triangles = new Int32Array(6 * nx * ny);
  let w = 0;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const v00 = j * (nx + 1) + i;
      const v10 = v00 + 1;
      const v01 = v00 + nx + 1;
      const v11 = v01 + 1;
      if ((i + j) % 2 === 0) {
        triangles.set([v00, v10, v11, v00, v11, v01], w);
      } else {
        triangles.set([v00, v10, v01, v10, v11, v01], w);
      }
      w += 6;
    }
  }
  return { coords, triangles };
}

/** Node adjacency (CSR, no self loops, neighbours sorted) of a triangle mesh. */
export function meshNodeAdjacency(mesh: TriangleMesh): CsrGraph {
  const nn = mesh.coords.length >> 1;
  const tri = mesh.triangles;
  const ne = tri.length / 3;
  const deg = new Int32Array(nn + 1);
  for (let e = 0; e < ne; e++) for (let a = 0; a < 3; a++) deg[tri[3 * e + a]] += 2;
  const start = new Int32Array(nn + 1);
  for (let v = 0; v < nn; v++) start[v + 1] = start[v] + deg[v];
  const raw = new Int32Array(start[nn]);
  const fill = start.slice(0, nn);
  for (let e = 0; e < ne; e++) {
    for (let a = 0; a < 3; a++) {
      const v = tri[3 * e + a];
      raw[fill[v]++] = tri[3 * e + ((a + 1) % 3)];
      raw[fill[v]++] = tri[3 * e + ((a + 2) % 3)];
    }
  }
  const ptr = new Int32Array(nn + 1);
  const idx = new Int32Array(raw.length);
  let w = 0;
  for (let v = 0; v < nn; v++) {
    ptr[v] = w;
    const seg = raw.subarray(start[v], start[v + 1]).sort();
    let last = -1;
    for (let q = 0; q < seg.length; q++) {
      if (seg[q] !== last) {
        idx[w++] = seg[q];
        last = seg[q];
      }
    }
  }
  ptr[nn] = w;
  return { ptr, idx: idx.slice(0, w) };
}

/**
 * Plane-stress stiffness of constant strain triangles, full (free-floating)
 * matrix of order 2 * nodes, DOF 2*i + c. Young's modulus E, Poisson's ratio
 * nu, thickness t. Throws a RangeError on a triangle with non-positive area.
 */
export function planeStressStiffness(mesh: TriangleMesh, E = 1, nu = 0.3, t = 1): SymmetricCsc {
  const { coords, triangles } = mesh;
  const nn = coords.length >> 1;
  const ne = triangles.length / 3;
  const rows = new Int32Array(36 * ne);
  const cols = new Int32Array(36 * ne);
  const vals = new Float64Array(36 * ne);
  const f = E / (1 - nu * nu);
  const D00 = f;
  const D01 = f * nu;
  const D22 = (f * (1 - nu)) / 2;
  const b = new Float64Array(3);
  const c = new Float64Array(3);
  const dof = new Int32Array(6);
  const B = new Float64Array(18); // 3 x 6, row-major
  let w = 0;
  for (let e = 0; e < ne; e++) {
    const i0 = triangles[3 * e];
    const i1 = triangles[3 * e + 1];
    const i2 = triangles[3 * e + 2];
    const x0 = coords[2 * i0];
    const y0 = coords[2 * i0 + 1];
    const x1 = coords[2 * i1];
    const y1 = coords[2 * i1 + 1];
    const x2 = coords[2 * i2];
    const y2 = coords[2 * i2 + 1];
    const twoA = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
    if (!(twoA > 0)) throw new RangeError(`planeStressStiffness: triangle ${e} has det J = ${twoA} <= 0`);
    b[0] = y1 - y2;
    b[1] = y2 - y0;
    b[2] = y0 - y1;
    c[0] = x2 - x1;
    c[1] = x0 - x2;
    c[2] = x1 - x0;
    B.fill(0);
    for (let a = 0; a < 3; a++) {
      B[2 * a] = b[a] / twoA; // eps_xx row
      B[6 + 2 * a + 1] = c[a] / twoA; // eps_yy row
      B[12 + 2 * a] = c[a] / twoA; // gamma_xy row
      B[12 + 2 * a + 1] = b[a] / twoA;
    }
    dof[0] = 2 * i0;
    dof[1] = 2 * i0 + 1;
    dof[2] = 2 * i1;
    dof[3] = 2 * i1 + 1;
    dof[4] = 2 * i2;
    dof[5] = 2 * i2 + 1;
    const scale = (t * twoA) / 2;
    for (let p = 0; p < 6; p++) {
      const bp0 = B[p];
      const bp1 = B[6 + p];
      const bp2 = B[12 + p];
      const db0 = D00 * bp0 + D01 * bp1;
      const db1 = D01 * bp0 + D00 * bp1;
      const db2 = D22 * bp2;
      for (let q = 0; q < 6; q++) {
        rows[w] = dof[q];
        cols[w] = dof[p];
        vals[w] = scale * (B[q] * db0 + B[6 + q] * db1 + B[12 + q] * db2);
        w++;
      }
    }
  }
  return assembleSymmetric(2 * nn, rows, cols, vals, 'full');
}

/** A cantilever test problem: the stiffness with every DOF of the nodes at x = 0 removed. */
export interface CantileverProblem {
  readonly mesh: TriangleMesh;
  readonly adjacency: CsrGraph;
  /** the reduced stiffness matrix (left edge fixed) */
  readonly matrix: SymmetricCsc;
  /** full DOF index of each row of the reduced matrix */
  readonly fullDofOfRow: Int32Array;
  /** reduced row of each full DOF, -1 if fixed */
  readonly rowOfFullDof: Int32Array;
}

/**
 * Plane-stress cantilever: jittered nx x ny rectangle (width 2, height 1 by
 * default), E = 1, nu = 0.3, left edge (x = 0) fully fixed.
 */
export function cantileverProblem(nx: number, ny: number, seed = 1, width = 2, height = 1): CantileverProblem {
  const mesh = jitteredRectangleMesh(nx, ny, width, height, seed);
  const adjacency = meshNodeAdjacency(mesh);
  const k = planeStressStiffness(mesh);
  const nn = mesh.coords.length >> 1;
  const keep = new Uint8Array(2 * nn);
  for (let v = 0; v < nn; v++) {
    const free = mesh.coords[2 * v] !== 0 ? 1 : 0;
    keep[2 * v] = free;
    keep[2 * v + 1] = free;
  }
  const sub = extractPrincipal(k, keep);
  return { mesh, adjacency, matrix: sub.matrix, fullDofOfRow: sub.oldOfNew, rowOfFullDof: sub.newOfOld };
}

/**
 * 2D grid Laplacian (Dirichlet boundary eliminated) on an nx x ny grid of
 * unknowns, natural (row by row) numbering; stencil 5 (diagonal 4, four -1)
 * or 9 (diagonal 8, eight -1). Both are symmetric positive definite
 * (irreducibly diagonally dominant).
 */
export function gridLaplacian(nx: number, ny: number, stencil: 5 | 9 = 5): SymmetricCsc {
  const n = nx * ny;
  const maxEntries = n * (stencil === 5 ? 3 : 5);
  const rows = new Int32Array(maxEntries);
  const cols = new Int32Array(maxEntries);
  const vals = new Float64Array(maxEntries);
  let w = 0;
  const push = (i: number, j: number, v: number): void => {
    rows[w] = i;
    cols[w] = j;
    vals[w] = v;
    w++;
  };
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) {
      const v = y * nx + x;
      push(v, v, stencil === 5 ? 4 : 8);
      if (x + 1 < nx) push(v + 1, v, -1);
      if (y + 1 < ny) push(v + nx, v, -1);
      if (stencil === 9 && y + 1 < ny) {
        if (x + 1 < nx) push(v + nx + 1, v, -1);
        if (x > 0) push(v + nx - 1, v, -1);
      }
    }
  }
  return assembleSymmetric(n, rows.subarray(0, w), cols.subarray(0, w), vals.subarray(0, w), 'triangle');
}

/** Node coordinates and adjacency of the nx x ny grid used by gridLaplacian (spacing 1). */
export function gridGeometry(nx: number, ny: number, stencil: 5 | 9 = 5): { coords: Float64Array; adjacency: CsrGraph } {
  const a = gridLaplacian(nx, ny, stencil);
  const coords = new Float64Array(2 * nx * ny);
  for (let y = 0; y < ny; y++) {
    for (let x = 0; x < nx; x++) {
      coords[2 * (y * nx + x)] = x;
      coords[2 * (y * nx + x) + 1] = y;
    }
  }
  // adjacency = off-diagonal pattern of the Laplacian
  const n = a.n;
  const deg = new Int32Array(n);
  for (let j = 0; j < n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      const i = a.rowIndex[p];
      if (i !== j) {
        deg[i]++;
        deg[j]++;
      }
    }
  }
  const ptr = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) ptr[i + 1] = ptr[i] + deg[i];
  const fill = ptr.slice(0, n);
  const idx = new Int32Array(ptr[n]);
  for (let j = 0; j < n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      const i = a.rowIndex[p];
      if (i !== j) {
        idx[fill[i]++] = j;
        idx[fill[j]++] = i;
      }
    }
  }
  return { coords, adjacency: { ptr, idx } };
}

/** Random sparse symmetric matrix with density d off the diagonal, made strictly diagonally dominant (so SPD). */
export function randomSpd(n: number, density: number, seed: number): SymmetricCsc {
  const rnd = seededRandom(seed);
  const r: number[] = [];
  const c: number[] = [];
  const v: number[] = [];
  const rowSum = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    for (let i = j + 1; i < n; i++) {
      if (rnd() < density) {
        const x = 2 * rnd() - 1;
        r.push(i);
        c.push(j);
        v.push(x);
        rowSum[i] += Math.abs(x);
        rowSum[j] += Math.abs(x);
      }
    }
  }
  for (let i = 0; i < n; i++) {
    r.push(i);
    c.push(i);
    v.push(rowSum[i] + 0.1 + rnd());
  }
  return assembleSymmetric(n, Int32Array.from(r), Int32Array.from(c), Float64Array.from(v), 'triangle');
}

export function randomVector(n: number, seed: number): Float64Array {
  const rnd = seededRandom(seed);
  const b = new Float64Array(n);
  for (let i = 0; i < n; i++) b[i] = 2 * rnd() - 1;
  return b;
}

/** max_i |x_i - y_i| / max_i |y_i| */
export function relativeMaxDifference(x: ArrayLike<number>, y: ArrayLike<number>): number {
  let d = 0;
  let s = 0;
  for (let i = 0; i < y.length; i++) {
    d = Math.max(d, Math.abs(x[i] - y[i]));
    s = Math.max(s, Math.abs(y[i]));
  }
  return d / s;
}

/**
 * Structure of L by boolean Gaussian elimination on the dense pattern of
 * A(perm, perm) (Parter 1961 / Rose 1972 elimination graph): returns the
 * column counts (diagonal included) and the elimination tree.
 */
export function denseSymbolic(a: SymmetricCsc, perm: Int32Array): { colCount: Int32Array; parent: Int32Array } {
  const n = a.n;
  const inv = new Int32Array(n);
  perm.forEach((old, k) => (inv[old] = k));
  const s = new Uint8Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let p = a.colPtr[j]; p < a.colPtr[j + 1]; p++) {
      const i = inv[a.rowIndex[p]];
      const jj = inv[j];
      s[i * n + jj] = 1;
      s[jj * n + i] = 1;
    }
  }
  const colCount = new Int32Array(n);
  const parent = new Int32Array(n).fill(-1);
  for (let k = 0; k < n; k++) {
    const below: number[] = [];
    for (let i = k + 1; i < n; i++) if (s[i * n + k]) below.push(i);
    colCount[k] = below.length + 1;
    if (below.length > 0) parent[k] = below[0];
    for (const i of below) for (const j of below) s[i * n + j] = 1;
  }
  return { colCount, parent };
}
