/**
 * Element properties and patch tests.
 *  - Stiffness matrices are symmetric with exactly three zero-energy modes (the plane rigid
 *    motions), for the 3-node and the 6-node triangle, straight and curved.
 *  - Patch tests A, B and C of O. C. Zienkiewicz & R. L. Taylor, The Finite Element Method,
 *    vol. 1 (5th ed., 2000), sec. 10.3, on the distorted patch of MacNeal & Harder (1985):
 *    a linear displacement field is reproduced to round-off, with the exact constant stress.
 *  - The 6-node triangle reproduces a quadratic field exactly: pure bending of a plane-stress
 *    beam, u = -k x y, v = k (x^2 + nu y^2) / 2, whose stress sxx = -E k y, syy = sxy = 0 is in
 *    equilibrium without body force (S. Timoshenko & J. N. Goodier, Theory of Elasticity, 3rd
 *    ed. 1970, sec. 22), from its boundary values alone.
 */
import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { constitutiveMatrix } from '../src/fem/material.js';
import { isStraightP2 } from '../src/element/triangle.js';
import { P2Scratch, TRI3, TRI6, internalForceP2, stiffnessP1, stiffnessP2, strainMatrixP2 } from '../src/fem/elements.js';
import { addEdgeTraction } from '../src/fem/traction.js';
import { sampleElementStresses } from '../src/post/stress.js';
import { boundaryFlags, distortedPatch, solveLinear } from './support/fe.js';

const E = 1e6;
const NU = 0.25;
const D = constitutiveMatrix(E, NU, 'plane-stress');

function eigenvalues(ke: Float64Array, n: number): number[] {
  const rows: number[][] = [];
  for (let i = 0; i < n; i++) rows.push(Array.from(ke.subarray(i * n, i * n + n)));
  return new EigenvalueDecomposition(new Matrix(rows)).realEigenvalues.sort((a, b) => a - b);
}

function expectSymmetric(ke: Float64Array, n: number) {
  let maxAbs = 0;
  for (const v of ke.subarray(0, n * n)) maxAbs = Math.max(maxAbs, Math.abs(v));
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) expect(Math.abs(ke[i * n + j] - ke[j * n + i])).toBeLessThanOrEqual(1e-13 * maxAbs);
}

describe('element stiffness', () => {
  it('stiffnessP1 is symmetric with exactly three zero-energy modes', () => {
    const nodes = Float64Array.of(0, 0, 2, 0.3, 0.4, 1.5);
    const ke = new Float64Array(36);
    stiffnessP1(nodes, Int32Array.of(0, 1, 2), 0, D, 1, ke, new Float64Array(18));
    expectSymmetric(ke, 6);
    const ev = eigenvalues(ke, 6);
    const max = ev[5];
    expect(ev.slice(0, 3).every((v) => Math.abs(v) < 1e-10 * max)).toBe(true);
    expect(ev.slice(3).every((v) => v > 1e-6 * max)).toBe(true);
  });

  for (const curved of [false, true]) {
    it(`stiffnessP2 (${curved ? 'curved' : 'straight'} sides) is symmetric with exactly three zero-energy modes`, () => {
      // Midside node 4 (between 1 and 2) pushed off the chord for the curved case.
      const nodes = Float64Array.of(0, 0, 2, 0.3, 0.4, 1.5, 1, 0.15, curved ? 1.35 : 1.2, curved ? 1.05 : 0.9, 0.2, 0.75);
      const ke = new Float64Array(144);
      stiffnessP2(nodes, Int32Array.of(0, 1, 2, 3, 4, 5), 0, D, 1, ke, new P2Scratch());
      expectSymmetric(ke, 12);
      const ev = eigenvalues(ke, 12);
      const max = ev[11];
      expect(ev.slice(0, 3).every((v) => Math.abs(v) < 1e-10 * max)).toBe(true);
      expect(ev.slice(3).every((v) => v > 1e-6 * max)).toBe(true);
    });
  }

  /** The textbook form, t sum_q w_q det J B_q^T D B_q with the full 3 x 12 B, as the reference. */
  function referenceP2(nodes: Float64Array, D: Float64Array, t: number): Float64Array {
    const el = Int32Array.of(0, 1, 2, 3, 4, 5);
    const rule = isStraightP2(nodes, el, 0) ? TRI3 : TRI6;
    const s = new P2Scratch();
    const ke = new Float64Array(144);
    for (let q = 0; q < rule.w.length; q++) {
      const det = strainMatrixP2(nodes, el, 0, rule.xi[q], rule.eta[q], s);
      for (let i = 0; i < 12; i++) {
        for (let j = 0; j < 12; j++) {
          let v = 0;
          for (let a = 0; a < 3; a++) for (let b = 0; b < 3; b++) v += s.B[12 * a + i] * D[3 * a + b] * s.B[12 * b + j];
          ke[12 * i + j] += t * det * rule.w[q] * v;
        }
      }
    }
    return ke;
  }

  it('stiffnessP2 built by node blocks equals t sum w det J B^T D B with the full B, straight and curved, and re = ke ue', () => {
    // Random triangles (a fixed linear congruential sequence), some with a midside node off its chord.
    let seed = 12345;
    const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
    const s = new P2Scratch();
    const el = Int32Array.of(0, 1, 2, 3, 4, 5);
    for (let trial = 0; trial < 40; trial++) {
      const c = [0, 0, 1 + rand(), rand() - 0.5, rand() - 0.5, 0.8 + rand()];
      const nodes = new Float64Array(12);
      nodes.set(c);
      const mids = [[0, 1], [1, 2], [2, 0]];
      mids.forEach(([a, b], k) => {
        const bow = trial % 2 === 1 && k === trial % 3 ? 0.08 * (rand() - 0.5) : 0;
        const dx = c[2 * b] - c[2 * a];
        const dy = c[2 * b + 1] - c[2 * a + 1];
        nodes[6 + 2 * k] = 0.5 * (c[2 * a] + c[2 * b]) - bow * dy;
        nodes[7 + 2 * k] = 0.5 * (c[2 * a + 1] + c[2 * b + 1]) + bow * dx;
      });
      const Dm = constitutiveMatrix(1e5 * (1 + rand()), 0.45 * rand(), trial % 4 === 0 ? 'plane-strain' : 'plane-stress');
      const ke = new Float64Array(144);
      stiffnessP2(nodes, el, 0, Dm, 1.5, ke, s);
      const ref = referenceP2(nodes, Dm, 1.5);
      let scale = 0;
      for (const v of ref) scale = Math.max(scale, Math.abs(v));
      for (let k = 0; k < 144; k++) expect(Math.abs(ke[k] - ref[k])).toBeLessThanOrEqual(1e-12 * scale);
      for (let i = 0; i < 12; i++) for (let j = 0; j < 12; j++) expect(ke[12 * i + j]).toBe(ke[12 * j + i]);
      const ue = Float64Array.from({ length: 12 }, () => rand() - 0.5);
      const re = new Float64Array(12);
      internalForceP2(nodes, el, 0, Dm, 1.5, ue, re, s);
      for (let i = 0; i < 12; i++) {
        let v = 0;
        for (let j = 0; j < 12; j++) v += ref[12 * i + j] * ue[j];
        expect(Math.abs(re[i] - v)).toBeLessThanOrEqual(1e-11 * scale);
      }
    }
  });

  it('stiffnessP1 refuses a clockwise element instead of taking |det J|', () => {
    const ke = new Float64Array(36);
    expect(() => stiffnessP1(Float64Array.of(0, 0, 0, 1, 1, 0), Int32Array.of(0, 1, 2), 0, D, 1, ke, new Float64Array(18))).toThrow(RangeError);
  });
});

// Linear field: u = a0 + a1 x + a2 y, v = b0 + b1 x + b2 y.
const LIN = { a0: 1e-3, a1: 2e-3, a2: -1e-3, b0: -2e-3, b1: 3e-4, b2: 1.5e-3 };
const linU = (x: number, y: number) => [LIN.a0 + LIN.a1 * x + LIN.a2 * y, LIN.b0 + LIN.b1 * x + LIN.b2 * y];
function exactLinearStress(): [number, number, number] {
  const ex = LIN.a1;
  const ey = LIN.b2;
  const g = LIN.a2 + LIN.b1;
  return [D[0] * ex + D[1] * ey, D[3] * ex + D[4] * ey, D[8] * g];
}

function maxStressError(mesh: ReturnType<typeof distortedPatch>['mesh'], u: Float64Array, exact: (x: number, y: number) => number[]) {
  const s = sampleElementStresses(mesh, D, u);
  let err = 0;
  let ref = 0;
  for (let i = 0; i < s.stress.length / 3; i++) {
    const ex = exact(s.xy[2 * i], s.xy[2 * i + 1]);
    for (let c = 0; c < 3; c++) {
      err = Math.max(err, Math.abs(s.stress[3 * i + c] - ex[c]));
      ref = Math.max(ref, Math.abs(ex[c]));
    }
  }
  return err / ref;
}

describe('patch tests on the distorted MacNeal-Harder patch', () => {
  for (const order of [1, 2] as const) {
    const name = order === 1 ? '3-node' : '6-node';
    it(`${name} test A: all nodes prescribed give the exact constant stress`, () => {
      const { mesh } = distortedPatch(order);
      const u = new Float64Array(2 * mesh.nNodes);
      for (let i = 0; i < mesh.nNodes; i++) [u[2 * i], u[2 * i + 1]] = linU(mesh.nodes[2 * i], mesh.nodes[2 * i + 1]);
      expect(maxStressError(mesh, u, exactLinearStress)).toBeLessThan(1e-11);
    });

    it(`${name} test B: boundary prescribed, interior nodes solved, exact to round-off`, () => {
      const { mesh } = distortedPatch(order);
      const on = boundaryFlags(mesh);
      const fixed = new Uint8Array(2 * mesh.nNodes);
      const value = new Float64Array(2 * mesh.nNodes);
      for (let i = 0; i < mesh.nNodes; i++) {
        if (!on[i]) continue;
        fixed[2 * i] = fixed[2 * i + 1] = 1;
        [value[2 * i], value[2 * i + 1]] = linU(mesh.nodes[2 * i], mesh.nodes[2 * i + 1]);
      }
      const u = solveLinear(mesh, D, 1, new Float64Array(2 * mesh.nNodes), fixed, value);
      for (let i = 0; i < mesh.nNodes; i++) {
        const [ux, uy] = linU(mesh.nodes[2 * i], mesh.nodes[2 * i + 1]);
        expect(Math.abs(u[2 * i] - ux) + Math.abs(u[2 * i + 1] - uy)).toBeLessThan(1e-13);
      }
      expect(maxStressError(mesh, u, exactLinearStress)).toBeLessThan(1e-10);
    });

    it(`${name} test C: minimal supports and the consistent edge tractions give the exact stress`, () => {
      const { mesh, domain } = distortedPatch(order);
      const [sxx, syy, sxy] = exactLinearStress();
      const f = new Float64Array(2 * mesh.nNodes);
      addEdgeTraction(mesh, new Uint8Array(domain.edges.length).fill(1), (_x, _y, nx, ny, out) => {
        out[0] = sxx * nx + sxy * ny;
        out[1] = sxy * nx + syy * ny;
      }, 1, f);
      // Node 0 pinned, node 1 held in y: no rigid motion left, nothing over-constrained.
      const fixed = new Uint8Array(2 * mesh.nNodes);
      fixed[0] = fixed[1] = fixed[3] = 1;
      const u = solveLinear(mesh, D, 1, f, fixed, new Float64Array(2 * mesh.nNodes));
      expect(maxStressError(mesh, u, exactLinearStress)).toBeLessThan(1e-10);
    });
  }

  it('6-node triangle reproduces the pure-bending quadratic field from its boundary values', () => {
    const { mesh } = distortedPatch(2);
    const k = 1e-2;
    const exactU = (x: number, y: number) => [-k * x * y, 0.5 * k * (x * x + NU * y * y)];
    const on = boundaryFlags(mesh);
    const fixed = new Uint8Array(2 * mesh.nNodes);
    const value = new Float64Array(2 * mesh.nNodes);
    for (let i = 0; i < mesh.nNodes; i++) {
      if (!on[i]) continue;
      fixed[2 * i] = fixed[2 * i + 1] = 1;
      [value[2 * i], value[2 * i + 1]] = exactU(mesh.nodes[2 * i], mesh.nodes[2 * i + 1]);
    }
    const u = solveLinear(mesh, D, 1, new Float64Array(2 * mesh.nNodes), fixed, value);
    for (let i = 0; i < mesh.nNodes; i++) {
      const [ux, uy] = exactU(mesh.nodes[2 * i], mesh.nodes[2 * i + 1]);
      expect(Math.abs(u[2 * i] - ux) + Math.abs(u[2 * i + 1] - uy)).toBeLessThan(1e-14);
    }
    const err = maxStressError(mesh, u, (_x, y) => [-E * k * y, 0, 0]);
    expect(err).toBeLessThan(1e-10);
  });
});

describe('stress sampling', () => {
  it('the element-by-element 6-node sampler equals the point-by-point stress routine, straight and curved elements', async () => {
    const { buildDomain } = await import('../src/geometry/domain.js');
    const { generateMesh } = await import('../src/mesh/generate.js');
    const { elementStressAt, samplePoints, StressWorkspace } = await import('../src/post/stress.js');
    const geometry = { outline: { shape: 'path', path: [[0, 0], [40, 0], [40, 20], [0, 20]] }, holes: [{ shape: 'circle', center: [20, 10], radius: 4 }] };
    const { mesh } = generateMesh(buildDomain(geometry as never), { order: 2, size: 3 });
    const u = Float64Array.from({ length: 2 * mesh.nNodes }, (_v, i) => Math.sin(0.37 * i) * 1e-3);
    const fast = sampleElementStresses(mesh, D, u);
    const { xi, eta } = samplePoints(2);
    const ws = new StressWorkspace();
    const out = new Float64Array(3);
    const pt = new Float64Array(2);
    let curved = 0;
    let scale = 0;
    for (const v of fast.stress) scale = Math.max(scale, Math.abs(v));
    for (let e = 0; e < mesh.nElements; e++) {
      if (!isStraightP2(mesh.nodes, mesh.elements, e)) curved++;
      for (let q = 0; q < 6; q++) {
        elementStressAt(mesh, D, u, e, xi[q], eta[q], out, pt, ws);
        const s = 6 * e + q;
        for (let c = 0; c < 3; c++) expect(Math.abs(fast.stress[3 * s + c] - out[c])).toBeLessThanOrEqual(1e-11 * scale);
        expect(Math.abs(fast.xy[2 * s] - pt[0]) + Math.abs(fast.xy[2 * s + 1] - pt[1])).toBeLessThanOrEqual(1e-12 * 40);
      }
    }
    expect(curved).toBeGreaterThan(0);
  });
});
