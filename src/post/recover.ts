/**
 * Recovered (smoothed) nodal stresses by superconvergent patch recovery: O. C. Zienkiewicz &
 * J. Z. Zhu, "The superconvergent patch recovery and a posteriori error estimates", Parts 1-2,
 * IJNME 33 (1992) 1331-1364 and 1365-1382.
 *
 * For every vertex a polynomial of the element's degree (linear for 3-node, quadratic for
 * 6-node elements) is fitted by least squares to the element stresses at the sampling points
 * (centroids, or the 6 points of the degree-4 rule) of the elements around it, then evaluated at
 * the vertex. A vertex on the boundary takes the mean of its interior neighbours' polynomials
 * evaluated at it (Zienkiewicz & Zhu, Part 1, sec. 4); patches with too few points are grown by
 * one ring. Midside nodes take the mean of the two end vertices' polynomials at the midside
 * point. On the Kirsch plate with the default quadratic mesh this keeps the hoop stress along the
 * hole within about 1% and the ligament stress within 0.3% (tests/kirsch.test.ts).
 *
 * Where the traction on the boundary is known (zero on a free edge, the applied traction on a
 * loaded one), sigma . n must equal it, so at those nodes the normal and shear components of the
 * recovered tensor are set from it and only the tangential component s_tt comes from the fit; on
 * a free edge the stress becomes uniaxial along the edge. This follows the boundary-condition
 * enhancement of SPR described by T. Blacker & T. Belytschko,
 * "Superconvergent patch recovery with equilibrium and conjoint interpolant enhancements",
 * IJNME 37 (1994) 517-536.
 */
import type { CompiledLoads, CompiledSupports } from '../fem/boundary-conditions.js';
import type { Mesh } from '../mesh/types.js';
import type { ElementSamples } from './stress.js';

export interface NodalStress {
  /** sxx, syy, sxy per node */
  stress: Float64Array;
}

/** Vertex -> elements incidence (CSR). */
export function vertexElements(mesh: Mesh): { ptr: Int32Array; idx: Int32Array } {
  const per = mesh.order === 2 ? 6 : 3;
  const nv = mesh.nVertices;
  const ptr = new Int32Array(nv + 1);
  for (let e = 0; e < mesh.nElements; e++) for (let i = 0; i < 3; i++) ptr[mesh.elements[per * e + i] + 1]++;
  for (let v = 0; v < nv; v++) ptr[v + 1] += ptr[v];
  const fill = ptr.slice(0, nv);
  const idx = new Int32Array(ptr[nv]);
  for (let e = 0; e < mesh.nElements; e++) for (let i = 0; i < 3; i++) idx[fill[mesh.elements[per * e + i]]++] = e;
  return { ptr, idx };
}

/** Boundary flag per node. */
function boundaryNodes(mesh: Mesh): Uint8Array {
  const on = new Uint8Array(mesh.nNodes);
  for (let s = 0; s < mesh.nBEdges; s++) for (let k = 0; k < 3; k++) if (mesh.bEdges[3 * s + k] >= 0) on[mesh.bEdges[3 * s + k]] = 1;
  return on;
}

/**
 * What is known of sigma . n on a domain edge: a traction field q(x, y, nx, ny, out) writing
 * sigma . n (zero on a free edge); 'symmetry' for a mirror plane, where only the shear traction
 * is known (zero); null where nothing is known (a held edge, whose reaction is unknown).
 */
/**
 * The known traction of each domain edge for the recovery: the applied one, zero on a free edge,
 * 'symmetry' on a mirror, unknown (null) where a support acts.
 */
export function describeKnownTractions(supports: Pick<CompiledSupports, 'symmetry' | 'supported'>, loads: Pick<CompiledLoads, 'edgeTraction'>): KnownTraction[] {
  const zero: KnownTraction = (_x, _y, _nx, _ny, out) => ((out[0] = 0), (out[1] = 0));
  return Array.from(supports.symmetry, (_s, i): KnownTraction => (supports.symmetry[i] ? 'symmetry' : supports.supported[i] ? null : (loads.edgeTraction[i] ?? zero)));
}

export type KnownTraction = ((x: number, y: number, nx: number, ny: number, out: number[]) => void) | 'symmetry' | null;

/**
 * SPR nodal stresses. `tractions` gives, per domain edge, the traction known there; at nodes
 * whose boundary edges all have one, the normal and shear components of the recovered stress
 * are set to it and only the tangential component is kept from the fit. Pass null to skip it.
 */
export function recoverNodalStress(mesh: Mesh, samples: ElementSamples, tractions: readonly KnownTraction[] | null): Float64Array {
  const per = mesh.order === 2 ? 6 : 3;
  const terms = mesh.order === 2 ? 6 : 3;
  const nv = mesh.nVertices;
  const { ptr, idx } = vertexElements(mesh);
  const onBoundary = boundaryNodes(mesh);
  const coef = new Float64Array(nv * 3 * terms);
  const centre = new Float64Array(3 * nv); // x, y, scale of each vertex's fit
  const stamp = new Int32Array(mesh.nElements).fill(-1);
  const patch: number[] = [];
  const ata = new Float64Array(terms * terms);
  const atb = new Float64Array(3 * terms);
  const phi = new Float64Array(terms);
  const k = samples.perElement;
  const minPoints = 2 * terms;
  const L = new Float64Array(terms * terms);
  const ys = new Float64Array(terms);
  /** Adds to the patch of vertex v every element touching a corner of one already in it. */
  const grow = (v: number) => {
    const n0 = patch.length;
    for (let q = 0; q < n0; q++) {
      const e = patch[q];
      for (let i = 0; i < 3; i++) {
        const w = mesh.elements[per * e + i];
        for (let p = ptr[w]; p < ptr[w + 1]; p++) {
          const f = idx[p];
          if (stamp[f] === v) continue;
          stamp[f] = v;
          patch.push(f);
        }
      }
    }
  };

  for (let v = 0; v < nv; v++) {
    patch.length = 0;
    for (let p = ptr[v]; p < ptr[v + 1]; p++) {
      const e = idx[p];
      stamp[e] = v;
      patch.push(e);
    }
    // Growing the patches of boundary vertices helps 3-node meshes (one sample per element);
    // for 6-node meshes, sampled at 6 points each, it only blurs the fit (measured on Kirsch).
    if ((onBoundary[v] && mesh.order === 1) || patch.length * k < minPoints) grow(v);
    if (patch.length * k < minPoints) grow(v);
    const x0 = mesh.nodes[2 * v];
    const y0 = mesh.nodes[2 * v + 1];
    let h = 0;
    for (let pi = 0; pi < patch.length; pi++) {
      const e = patch[pi];
      for (let q = 0; q < k; q++) {
        const s = e * k + q;
        const ax = Math.abs(samples.xy[2 * s] - x0);
        const ay = Math.abs(samples.xy[2 * s + 1] - y0);
        if (ax > h) h = ax;
        if (ay > h) h = ay;
      }
    }
    centre[3 * v] = x0;
    centre[3 * v + 1] = y0;
    centre[3 * v + 2] = h;
    // Normal equations in scaled coordinates, solved by Cholesky; the patch grows once more if singular.
    for (let attempt = 0; attempt < 3; attempt++) {
      if (terms === 6) accumulateQuadratic(patch, k, samples.xy, samples.stress, x0, y0, h, ata, atb);
      else {
        ata.fill(0);
        atb.fill(0);
        for (let pi = 0; pi < patch.length; pi++) {
          const e = patch[pi];
          for (let q = 0; q < k; q++) {
            const s = e * k + q;
            basis((samples.xy[2 * s] - x0) / h, (samples.xy[2 * s + 1] - y0) / h, terms, phi);
            for (let a = 0; a < terms; a++) {
              for (let b = 0; b <= a; b++) ata[a * terms + b] += phi[a] * phi[b];
              for (let c = 0; c < 3; c++) atb[c * terms + a] += phi[a] * samples.stress[3 * s + c];
            }
          }
        }
      }
      if (solveNormal(ata, atb, terms, coef, v * 3 * terms, L, ys)) break;
      if (attempt === 2) {
        // Fall back to the plain mean of the patch (a degree-0 fit), never to nothing.
        const o = v * 3 * terms;
        coef.fill(0, o, o + 3 * terms);
        let cnt = 0;
        for (const e of patch) for (let q = 0; q < k; q++) for (let c = 0; c < 3; c++) coef[o + c * terms] += samples.stress[3 * (e * k + q) + c];
        for (const e of patch) for (let q = 0; q < k; q++) cnt++;
        for (let c = 0; c < 3; c++) coef[o + c * terms] /= cnt;
        break;
      }
      grow(v);
    }
  }

  const out = new Float64Array(3 * mesh.nNodes);
  /** Adds f times vertex v's fitted polynomials at (x, y) to out[o .. o+2]. */
  const addFit = (v: number, x: number, y: number, f: number, out: Float64Array, o: number) => {
    const h = centre[3 * v + 2];
    basis((x - centre[3 * v]) / h, (y - centre[3 * v + 1]) / h, terms, phi);
    for (let c = 0; c < 3; c++) {
      let s = 0;
      const oc = v * 3 * terms + c * terms;
      for (let a = 0; a < terms; a++) s += coef[oc + a] * phi[a];
      out[o + c] += f * s;
    }
  };
  for (let v = 0; v < nv; v++) {
    for (let c = 0; c < 3; c++) out[3 * v + c] = coef[v * 3 * terms + c * terms]; // phi = 1 at the centre
  }
  {
    // Boundary vertices: the mean of the neighbouring interior vertices' polynomials there, as
    // Zienkiewicz & Zhu recommend (Part 1, sec. 4), rather than a one-sided fit of their own.
    const acc = new Float64Array(3);
    const seen = new Int32Array(nv).fill(-1);
    for (let v = 0; v < nv; v++) {
      if (!onBoundary[v]) continue;
      acc.fill(0);
      let cnt = 0;
      for (let p = ptr[v]; p < ptr[v + 1]; p++) {
        const e = idx[p];
        for (let i = 0; i < 3; i++) {
          const w = mesh.elements[per * e + i];
          if (onBoundary[w] || seen[w] === v) continue;
          seen[w] = v;
          addFit(w, mesh.nodes[2 * v], mesh.nodes[2 * v + 1], 1, acc, 0);
          cnt++;
        }
      }
      if (cnt > 0) for (let c = 0; c < 3; c++) out[3 * v + c] = acc[c] / cnt;
    }
  }
  if (mesh.order === 2) {
    const done = new Uint8Array(mesh.nNodes);
    const two = new Float64Array(6);
    for (let e = 0; e < mesh.nElements; e++) {
      for (let m = 0; m < 3; m++) {
        const node = mesh.elements[6 * e + 3 + m];
        if (done[node]) continue;
        done[node] = 1;
        // midside 3 + m lies between corners m and (m + 1) mod 3
        const a = mesh.elements[6 * e + m];
        const b = mesh.elements[6 * e + (m === 2 ? 0 : m + 1)];
        const x = mesh.nodes[2 * node];
        const y = mesh.nodes[2 * node + 1];
        two.fill(0);
        addFit(a, x, y, 1, two, 0);
        addFit(b, x, y, 1, two, 3);
        for (let c = 0; c < 3; c++) out[3 * node + c] = 0.5 * (two[c] + two[3 + c]);
      }
    }
  }
  if (tractions) projectKnownTractions(mesh, out, tractions);
  return out;
}

/**
 * The normal equations of the quadratic fit over a patch, written out: ata (lower triangle,
 * 6 x 6 row-major) = sum phi phi^T and atb[c * 6 + a] = sum phi_a sigma_c over the samples, phi
 * the monomials 1, x, y, x^2, x y, y^2 in the scaled coordinates. Kept in locals, the 39 sums
 * cost a fraction of the general loops (same terms, same order, same result).
 */
function accumulateQuadratic(patch: readonly number[], k: number, xy: Float64Array, stress: Float64Array, x0: number, y0: number, h: number, ata: Float64Array, atb: Float64Array): void {
  let a10 = 0, a11 = 0, a20 = 0, a21 = 0, a22 = 0, a30 = 0, a31 = 0, a32 = 0, a33 = 0;
  let a40 = 0, a41 = 0, a42 = 0, a43 = 0, a44 = 0, a50 = 0, a51 = 0, a52 = 0, a53 = 0, a54 = 0, a55 = 0;
  let a00 = 0;
  let b00 = 0, b01 = 0, b02 = 0, b03 = 0, b04 = 0, b05 = 0;
  let b10 = 0, b11 = 0, b12 = 0, b13 = 0, b14 = 0, b15 = 0;
  let b20 = 0, b21 = 0, b22 = 0, b23 = 0, b24 = 0, b25 = 0;
  for (let pi = 0; pi < patch.length; pi++) {
    const e = patch[pi];
    for (let q = 0; q < k; q++) {
      const s = e * k + q;
      const x = (xy[2 * s] - x0) / h;
      const y = (xy[2 * s + 1] - y0) / h;
      const p0 = 1;
      const p1 = x;
      const p2 = y;
      const p3 = x * x;
      const p4 = x * y;
      const p5 = y * y;
      const s0 = stress[3 * s];
      const s1 = stress[3 * s + 1];
      const s2 = stress[3 * s + 2];
      a00 += p0 * p0;
      b00 += p0 * s0;
      b10 += p0 * s1;
      b20 += p0 * s2;
      a10 += p1 * p0;
      a11 += p1 * p1;
      b01 += p1 * s0;
      b11 += p1 * s1;
      b21 += p1 * s2;
      a20 += p2 * p0;
      a21 += p2 * p1;
      a22 += p2 * p2;
      b02 += p2 * s0;
      b12 += p2 * s1;
      b22 += p2 * s2;
      a30 += p3 * p0;
      a31 += p3 * p1;
      a32 += p3 * p2;
      a33 += p3 * p3;
      b03 += p3 * s0;
      b13 += p3 * s1;
      b23 += p3 * s2;
      a40 += p4 * p0;
      a41 += p4 * p1;
      a42 += p4 * p2;
      a43 += p4 * p3;
      a44 += p4 * p4;
      b04 += p4 * s0;
      b14 += p4 * s1;
      b24 += p4 * s2;
      a50 += p5 * p0;
      a51 += p5 * p1;
      a52 += p5 * p2;
      a53 += p5 * p3;
      a54 += p5 * p4;
      a55 += p5 * p5;
      b05 += p5 * s0;
      b15 += p5 * s1;
      b25 += p5 * s2;
    }
  }
  ata.fill(0);
  ata[0] = a00;
  ata[6] = a10;
  ata[7] = a11;
  ata[12] = a20;
  ata[13] = a21;
  ata[14] = a22;
  ata[18] = a30;
  ata[19] = a31;
  ata[20] = a32;
  ata[21] = a33;
  ata[24] = a40;
  ata[25] = a41;
  ata[26] = a42;
  ata[27] = a43;
  ata[28] = a44;
  ata[30] = a50;
  ata[31] = a51;
  ata[32] = a52;
  ata[33] = a53;
  ata[34] = a54;
  ata[35] = a55;
  atb[0] = b00;
  atb[1] = b01;
  atb[2] = b02;
  atb[3] = b03;
  atb[4] = b04;
  atb[5] = b05;
  atb[6] = b10;
  atb[7] = b11;
  atb[8] = b12;
  atb[9] = b13;
  atb[10] = b14;
  atb[11] = b15;
  atb[12] = b20;
  atb[13] = b21;
  atb[14] = b22;
  atb[15] = b23;
  atb[16] = b24;
  atb[17] = b25;
}

/** Monomials 1, x, y (, x^2, x y, y^2). */
function basis(x: number, y: number, terms: number, phi: Float64Array): void {
  phi[0] = 1;
  phi[1] = x;
  phi[2] = y;
  if (terms === 6) {
    phi[3] = x * x;
    phi[4] = x * y;
    phi[5] = y * y;
  }
}

/** Solves the symmetric normal equations (lower triangle of ata) for 3 right-hand sides; false if not positive definite. */
function solveNormal(ata: Float64Array, atb: Float64Array, n: number, out: Float64Array, o: number, L: Float64Array, y: Float64Array): boolean {
  L.fill(0);
  let dmax = 0;
  for (let i = 0; i < n; i++) dmax = Math.max(dmax, ata[i * n + i]);
  for (let j = 0; j < n; j++) {
    let d = ata[j * n + j];
    for (let k = 0; k < j; k++) d -= L[j * n + k] * L[j * n + k];
    if (!(d > 1e-10 * dmax)) return false;
    const ljj = Math.sqrt(d);
    L[j * n + j] = ljj;
    for (let i = j + 1; i < n; i++) {
      let s = ata[i * n + j];
      for (let k = 0; k < j; k++) s -= L[i * n + k] * L[j * n + k];
      L[i * n + j] = s / ljj;
    }
  }
  for (let c = 0; c < 3; c++) {
    for (let i = 0; i < n; i++) {
      let s = atb[c * n + i];
      for (let k = 0; k < i; k++) s -= L[i * n + k] * y[k];
      y[i] = s / L[i * n + i];
    }
    for (let i = n - 1; i >= 0; i--) {
      let s = y[i];
      for (let k = i + 1; k < n; k++) s -= L[k * n + i] * out[o + c * n + k];
      out[o + c * n + i] = s / L[i * n + i];
    }
  }
  return true;
}

/**
 * Boundary conditions on the recovered stress. Each boundary edge at a node adds linear
 * constraints on (sxx, syy, sxy) there: a known traction t gives sigma . n = t (two), a mirror
 * plane n . sigma . tau = 0 (one). The recovered tensor is moved to the nearest tensor (in the
 * Frobenius norm) that meets them: on a free edge it becomes uniaxial along the edge, at a free
 * convex corner zero. Nodes at re-entrant corners are left alone: the exact stress is singular
 * there and no finite value meets the conditions.
 */
function projectKnownTractions(mesh: Mesh, out: Float64Array, tractions: readonly KnownTraction[]): void {
  const n = mesh.nodes;
  // Up to 8 constraint rows per node: [a, b, c, d] meaning a sxx + b syy + c sxy = d.
  const rows = new Float64Array(mesh.nNodes * 8 * 4);
  const count = new Uint8Array(mesh.nNodes);
  const skip = new Uint8Array(mesh.nNodes);
  const inTan = new Float64Array(2 * mesh.nNodes).fill(NaN);
  const outTan = new Float64Array(2 * mesh.nNodes).fill(NaN);
  const q = [0, 0];
  const add = (node: number, a: number, b: number, c: number, d: number) => {
    if (count[node] >= 8) return;
    const o = (node * 8 + count[node]++) * 4;
    rows[o] = a;
    rows[o + 1] = b;
    rows[o + 2] = c;
    rows[o + 3] = d;
  };
  for (let e = 0; e < mesh.nBEdges; e++) {
    const kind = tractions[mesh.bEdgeDomain[e]];
    const a = mesh.bEdges[3 * e];
    const b = mesh.bEdges[3 * e + 1];
    const m = mesh.bEdges[3 * e + 2];
    const at: [number, number, number][] = [];
    if (m >= 0) {
      at.push([a, -3 * n[2 * a] + 4 * n[2 * m] - n[2 * b], -3 * n[2 * a + 1] + 4 * n[2 * m + 1] - n[2 * b + 1]]);
      at.push([m, n[2 * b] - n[2 * a], n[2 * b + 1] - n[2 * a + 1]]);
      at.push([b, n[2 * a] - 4 * n[2 * m] + 3 * n[2 * b], n[2 * a + 1] - 4 * n[2 * m + 1] + 3 * n[2 * b + 1]]);
    } else {
      at.push([a, n[2 * b] - n[2 * a], n[2 * b + 1] - n[2 * a + 1]]);
      at.push([b, n[2 * b] - n[2 * a], n[2 * b + 1] - n[2 * a + 1]]);
    }
    for (let k = 0; k < at.length; k++) {
      const [node, dx, dy] = at[k];
      const l = Math.hypot(dx, dy);
      const tx = dx / l;
      const ty = dy / l;
      if (k === 0) {
        outTan[2 * node] = tx;
        outTan[2 * node + 1] = ty;
      } else if (k === at.length - 1) {
        inTan[2 * node] = tx;
        inTan[2 * node + 1] = ty;
      }
      if (kind === null) continue;
      const nx = ty;
      const ny = -tx;
      if (kind === 'symmetry') {
        add(node, nx * tx, ny * ty, nx * ty + ny * tx, 0);
        continue;
      }
      kind(n[2 * node], n[2 * node + 1], nx, ny, q);
      add(node, nx, 0, ny, q[0]);
      add(node, 0, ny, nx, q[1]);
    }
  }
  // Re-entrant corners: the boundary turns right (material on the left) by more than 5 degrees.
  for (let i = 0; i < mesh.nNodes; i++) {
    if (Number.isNaN(inTan[2 * i]) || Number.isNaN(outTan[2 * i])) continue;
    const cross = inTan[2 * i] * outTan[2 * i + 1] - inTan[2 * i + 1] * outTan[2 * i];
    if (cross < -Math.sin((5 * Math.PI) / 180)) skip[i] = 1;
  }
  // Project in the scaled variables (sxx, syy, sqrt(2) sxy), where the Frobenius norm is Euclidean.
  const R2 = Math.SQRT2;
  const basis = new Float64Array(12);
  for (let i = 0; i < mesh.nNodes; i++) {
    if (count[i] === 0 || skip[i]) continue;
    const v = [out[3 * i], out[3 * i + 1], R2 * out[3 * i + 2]];
    let nb = 0;
    for (let r = 0; r < count[i]; r++) {
      const o = (i * 8 + r) * 4;
      // Row in scaled variables: c sxy = (c / sqrt 2) (sqrt 2 sxy).
      let w0 = rows[o];
      let w1 = rows[o + 1];
      let w2 = rows[o + 2] / R2;
      let d = rows[o + 3];
      const norm0 = Math.hypot(w0, w1, w2);
      if (norm0 === 0) continue;
      // Gram-Schmidt against the rows kept so far (modified, with the right-hand side carried).
      for (let k = 0; k < nb; k++) {
        const dot = w0 * basis[4 * k] + w1 * basis[4 * k + 1] + w2 * basis[4 * k + 2];
        w0 -= dot * basis[4 * k];
        w1 -= dot * basis[4 * k + 1];
        w2 -= dot * basis[4 * k + 2];
        d -= dot * basis[4 * k + 3];
      }
      const norm = Math.hypot(w0, w1, w2);
      // Rows from edges whose normals differ by less than about 3 degrees count as the same
      // condition: the isoparametric tangents at a smooth junction differ by round-off and by
      // the chord approximation, and a nearly dependent row would impose a spurious condition.
      if (norm <= 0.05 * norm0 || nb === 3) continue;
      basis[4 * nb] = w0 / norm;
      basis[4 * nb + 1] = w1 / norm;
      basis[4 * nb + 2] = w2 / norm;
      basis[4 * nb + 3] = d / norm;
      nb++;
    }
    for (let k = 0; k < nb; k++) {
      const r = v[0] * basis[4 * k] + v[1] * basis[4 * k + 1] + v[2] * basis[4 * k + 2] - basis[4 * k + 3];
      v[0] -= r * basis[4 * k];
      v[1] -= r * basis[4 * k + 1];
      v[2] -= r * basis[4 * k + 2];
    }
    out[3 * i] = v[0];
    out[3 * i + 1] = v[1];
    out[3 * i + 2] = v[2] / R2;
  }
}

/**
 * The plain alternative, for comparison: at each node the mean of the stresses that the
 * elements around it give at that node (extrapolated within each element).
 */
export function averageNodalStress(mesh: Mesh, stressAtNode: (e: number, local: number, out: Float64Array) => void): Float64Array {
  const per = mesh.order === 2 ? 6 : 3;
  const out = new Float64Array(3 * mesh.nNodes);
  const cnt = new Float64Array(mesh.nNodes);
  const s = new Float64Array(3);
  for (let e = 0; e < mesh.nElements; e++) {
    for (let i = 0; i < per; i++) {
      const node = mesh.elements[per * e + i];
      stressAtNode(e, i, s);
      out[3 * node] += s[0];
      out[3 * node + 1] += s[1];
      out[3 * node + 2] += s[2];
      cnt[node]++;
    }
  }
  for (let i = 0; i < mesh.nNodes; i++) for (let c = 0; c < 3; c++) out[3 * i + c] /= cnt[i];
  return out;
}
