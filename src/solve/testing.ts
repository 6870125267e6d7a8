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

/**
 * The quadratic (6-node) version of jitteredRectangleMesh and its plane-stress cantilever:
 * corners as in jitteredRectangleMesh (same seed, same jitter), midside nodes at the midpoints
 * of the straight edges. Nodes are numbered on the (2 nx + 1) x (2 ny + 1) lattice of corners and
 * midpoints row by row, node (I, J) = J (2 nx + 1) + I; corner (i, j) is lattice node (2i, 2j).
 * Elements list corners 0, 1, 2 counter-clockwise, then midsides 3 = 0-1, 4 = 1-2, 5 = 2-0.
 */
export interface QuadraticMesh {
  readonly coords: Float64Array;
  /** 6 nodes per element */
  readonly elements: Int32Array;
}

export function jitteredRectangleMeshP2(nx: number, ny: number, width: number, height: number, seed = 1, jitter = 0.25): QuadraticMesh {
  const lin = jitteredRectangleMesh(nx, ny, width, height, seed, jitter);
  const mx = 2 * nx + 1;
  const my = 2 * ny + 1;
  const coords = new Float64Array(2 * mx * my);
  const node = (I: number, J: number): number => J * mx + I;
  for (let j = 0; j <= ny; j++) {
    for (let i = 0; i <= nx; i++) {
      const v = j * (nx + 1) + i;
      const w = node(2 * i, 2 * j);
      coords[2 * w] = lin.coords[2 * v];
      coords[2 * w + 1] = lin.coords[2 * v + 1];
    }
  }
  // midpoints: lattice nodes with an odd index lie between two corners
  for (let J = 0; J < my; J++) {
    for (let I = 0; I < mx; I++) {
      if (I % 2 === 0 && J % 2 === 0) continue;
      let a: number;
      let b: number;
      if (J % 2 === 0) {
        a = node(I - 1, J);
        b = node(I + 1, J);
      } else if (I % 2 === 0) {
        a = node(I, J - 1);
        b = node(I, J + 1);
      } else {
        // the cell's diagonal: 00-11 when (i + j) is even, 10-01 otherwise
        const i = (I - 1) / 2;
        const j = (J - 1) / 2;
        if ((i + j) % 2 === 0) {
          a = node(I - 1, J - 1);
          b = node(I + 1, J + 1);
        } else {
          a = node(I + 1, J - 1);
          b = node(I - 1, J + 1);
        }
      }
      const w = node(I, J);
      coords[2 * w] = 0.5 * (coords[2 * a] + coords[2 * b]);
      coords[2 * w + 1] = 0.5 * (coords[2 * a + 1] + coords[2 * b + 1]);
    }
  }
  const elements = new Int32Array(12 * nx * ny);
  let e = 0;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const I = 2 * i;
      const J = 2 * j;
      const c00 = node(I, J);
      const c10 = node(I + 2, J);
      const c01 = node(I, J + 2);
      const c11 = node(I + 2, J + 2);
      const mb = node(I + 1, J); // bottom edge
      const mr = node(I + 2, J + 1); // right
      const mt = node(I + 1, J + 2); // top
      const ml = node(I, J + 1); // left
      const md = node(I + 1, J + 1); // diagonal
      if ((i + j) % 2 === 0) {
        elements.set([c00, c10, c11, mb, mr, md, c00, c11, c01, md, mt, ml], e);
      } else {
        elements.set([c00, c10, c01, mb, md, ml, c10, c11, c01, mr, mt, md], e);
      }
      e += 12;
    }
  }
  return { coords, elements };
}

/** Node adjacency (CSR, no self loops, sorted) of a 6-node triangle mesh: nodes sharing an element. */
export function meshNodeAdjacencyP2(mesh: QuadraticMesh): CsrGraph {
  const nn = mesh.coords.length >> 1;
  const el = mesh.elements;
  const ne = el.length / 6;
  const deg = new Int32Array(nn + 1);
  for (let e = 0; e < ne; e++) for (let a = 0; a < 6; a++) deg[el[6 * e + a]] += 5;
  const start = new Int32Array(nn + 1);
  for (let v = 0; v < nn; v++) start[v + 1] = start[v] + deg[v];
  const raw = new Int32Array(start[nn]);
  const fill = start.slice(0, nn);
  for (let e = 0; e < ne; e++) {
    for (let a = 0; a < 6; a++) {
      const v = el[6 * e + a];
      for (let b = 0; b < 6; b++) if (b !== a) raw[fill[v]++] = el[6 * e + b];
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
 * Plane-stress stiffness of 6-node (linear strain) triangles with straight sides, full matrix
 * of order 2 * nodes. Shape functions in area coordinates: N_a = L_a (2 L_a - 1) at the corners,
 * N = 4 L_a L_b at the midsides; B is linear in the L_a, so B^T D B is quadratic and the
 * three-point rule at the edge midpoints (weights A / 3) integrates it exactly (G. Strang and
 * G. J. Fix, "An Analysis of the Finite Element Method", 1973, section 4.3; Zienkiewicz and
 * Taylor, vol. 1, on triangle quadrature). Throws a RangeError on an element with area <= 0.
 */
export function planeStressStiffnessP2(mesh: QuadraticMesh, E = 1, nu = 0.3, t = 1): SymmetricCsc {
  const { coords, elements } = mesh;
  const nn = coords.length >> 1;
  const ne = elements.length / 6;
  const per = 78; // lower triangle of 12 x 12, diagonal included
  const rows = new Int32Array(per * ne);
  const cols = new Int32Array(per * ne);
  const vals = new Float64Array(per * ne);
  const f = E / (1 - nu * nu);
  const D00 = f;
  const D01 = f * nu;
  const D22 = (f * (1 - nu)) / 2;
  const gx = new Float64Array(6); // dN/dx at one point
  const gy = new Float64Array(6);
  const ke = new Float64Array(144);
  const dof = new Int32Array(12);
  const bl = new Float64Array(3);
  const cl = new Float64Array(3);
  // quadrature points (L0, L1, L2): the edge midpoints
  const QP = [0.5, 0.5, 0, 0, 0.5, 0.5, 0.5, 0, 0.5];
  let w = 0;
  for (let e = 0; e < ne; e++) {
    const n0 = elements[6 * e];
    const n1 = elements[6 * e + 1];
    const n2 = elements[6 * e + 2];
    const x0 = coords[2 * n0];
    const y0 = coords[2 * n0 + 1];
    const x1 = coords[2 * n1];
    const y1 = coords[2 * n1 + 1];
    const x2 = coords[2 * n2];
    const y2 = coords[2 * n2 + 1];
    const twoA = (x1 - x0) * (y2 - y0) - (x2 - x0) * (y1 - y0);
    if (!(twoA > 0)) throw new RangeError(`planeStressStiffnessP2: element ${e} has det J = ${twoA} <= 0`);
    // grad L_a = (b_a, c_a) / 2A
    bl[0] = (y1 - y2) / twoA;
    bl[1] = (y2 - y0) / twoA;
    bl[2] = (y0 - y1) / twoA;
    cl[0] = (x2 - x1) / twoA;
    cl[1] = (x0 - x2) / twoA;
    cl[2] = (x1 - x0) / twoA;
    ke.fill(0);
    const wq = (t * twoA) / 6; // A / 3 per point, times thickness
    for (let q = 0; q < 3; q++) {
      const L0 = QP[3 * q];
      const L1 = QP[3 * q + 1];
      const L2 = QP[3 * q + 2];
      const L = [L0, L1, L2];
      for (let a = 0; a < 3; a++) {
        gx[a] = (4 * L[a] - 1) * bl[a];
        gy[a] = (4 * L[a] - 1) * cl[a];
      }
      gx[3] = 4 * (L1 * bl[0] + L0 * bl[1]);
      gy[3] = 4 * (L1 * cl[0] + L0 * cl[1]);
      gx[4] = 4 * (L2 * bl[1] + L1 * bl[2]);
      gy[4] = 4 * (L2 * cl[1] + L1 * cl[2]);
      gx[5] = 4 * (L0 * bl[2] + L2 * bl[0]);
      gy[5] = 4 * (L0 * cl[2] + L2 * cl[0]);
      // B columns: ux_a -> (gx, 0, gy), uy_a -> (0, gy, gx)
      for (let a = 0; a < 6; a++) {
        const ax = gx[a];
        const ay = gy[a];
        for (let b = 0; b < 6; b++) {
          const bx = gx[b];
          const by = gy[b];
          ke[(2 * a) * 12 + 2 * b] += wq * (ax * D00 * bx + ay * D22 * by);
          ke[(2 * a) * 12 + 2 * b + 1] += wq * (ax * D01 * by + ay * D22 * bx);
          ke[(2 * a + 1) * 12 + 2 * b] += wq * (ay * D01 * bx + ax * D22 * by);
          ke[(2 * a + 1) * 12 + 2 * b + 1] += wq * (ay * D00 * by + ax * D22 * bx);
        }
      }
    }
    for (let a = 0; a < 6; a++) {
      const v = elements[6 * e + a];
      dof[2 * a] = 2 * v;
      dof[2 * a + 1] = 2 * v + 1;
    }
    for (let p = 0; p < 12; p++) {
      for (let r = 0; r < 12; r++) {
        if (dof[r] < dof[p]) continue;
        rows[w] = dof[r];
        cols[w] = dof[p];
        vals[w] = ke[r * 12 + p];
        w++;
      }
    }
  }
  return assembleSymmetric(2 * nn, rows.subarray(0, w), cols.subarray(0, w), vals.subarray(0, w), 'full');
}

/**
 * The cantilever of cantileverProblem with 6-node triangles: jittered nx x ny rectangle (width
 * 2, height 1 by default), E = 1, nu = 0.3, every node at x = 0 fixed.
 */
export function cantileverProblemP2(nx: number, ny: number, seed = 1, width = 2, height = 1): CantileverProblem & { readonly meshP2: QuadraticMesh } {
  const meshP2 = jitteredRectangleMeshP2(nx, ny, width, height, seed);
  const adjacency = meshNodeAdjacencyP2(meshP2);
  const k = planeStressStiffnessP2(meshP2);
  const nn = meshP2.coords.length >> 1;
  const keep = new Uint8Array(2 * nn);
  for (let v = 0; v < nn; v++) {
    const free = meshP2.coords[2 * v] !== 0 ? 1 : 0;
    keep[2 * v] = free;
    keep[2 * v + 1] = free;
  }
  const sub = extractPrincipal(k, keep);
  const triangles = new Int32Array(3 * (meshP2.elements.length / 6));
  for (let e = 0; e < triangles.length / 3; e++) for (let a = 0; a < 3; a++) triangles[3 * e + a] = meshP2.elements[6 * e + a];
  return { mesh: { coords: meshP2.coords, triangles }, meshP2, adjacency, matrix: sub.matrix, fullDofOfRow: sub.oldOfNew, rowOfFullDof: sub.newOfOld };
}
