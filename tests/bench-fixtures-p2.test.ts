import { describe, it, expect } from 'vitest';
import { multiplySymmetric, solveSpd } from '../src/solve/index.js';
import { cantileverProblemP2, jitteredRectangleMeshP2, planeStressStiffnessP2 } from '../src/bench/fixtures/cantilever-p2.js';
import { randomVector } from '../src/bench/fixtures/random.js';
import { P2Scratch, stiffnessP2 } from '../src/fem/elements.js';
import { constitutiveMatrix } from '../src/fem/material.js';

describe('6-node plane-stress benchmark matrices', () => {
  const mesh = jitteredRectangleMeshP2(6, 3, 2, 1, 5);
  const k = planeStressStiffnessP2(mesh, 1, 0.3, 1);
  const nn = mesh.coords.length >> 1;

  it('every element is counter-clockwise and each midside node is the midpoint of its edge', () => {
    const el = mesh.elements;
    for (let e = 0; e < el.length / 6; e++) {
      const c = (a: number, d: number) => mesh.coords[2 * el[6 * e + a] + d];
      expect((c(1, 0) - c(0, 0)) * (c(2, 1) - c(0, 1)) - (c(2, 0) - c(0, 0)) * (c(1, 1) - c(0, 1))).toBeGreaterThan(0);
      for (const [m, a, b] of [[3, 0, 1], [4, 1, 2], [5, 2, 0]]) {
        for (const d of [0, 1]) expect(c(m, d)).toBeCloseTo(0.5 * (c(a, d) + c(b, d)), 14);
      }
    }
  });

  it('rigid motions (two translations, one rotation) give zero nodal forces', () => {
    const y = new Float64Array(2 * nn);
    let scale = 0;
    for (let j = 0; j < k.n; j++) scale = Math.max(scale, Math.abs(k.values[k.colPtr[j]]));
    for (const mode of [0, 1, 2]) {
      const u = new Float64Array(2 * nn);
      for (let v = 0; v < nn; v++) {
        const x = mesh.coords[2 * v];
        const yy = mesh.coords[2 * v + 1];
        u[2 * v] = mode === 0 ? 1 : mode === 2 ? -yy : 0;
        u[2 * v + 1] = mode === 1 ? 1 : mode === 2 ? x : 0;
      }
      multiplySymmetric(k, u, y);
      for (let i = 0; i < y.length; i++) expect(Math.abs(y[i])).toBeLessThan(1e-13 * scale);
    }
  });

  it('equals the assembly of the pipeline element stiffnessP2 (energy of random displacements)', () => {
    const D = constitutiveMatrix(1, 0.3, 'plane-stress');
    const ke = new Float64Array(144);
    const s = new P2Scratch();
    for (const seed of [1, 2, 3]) {
      const u = randomVector(2 * nn, seed);
      const y = new Float64Array(2 * nn);
      multiplySymmetric(k, u, y);
      let mine = 0;
      for (let i = 0; i < u.length; i++) mine += u[i] * y[i];
      let theirs = 0;
      for (let e = 0; e < mesh.elements.length / 6; e++) {
        stiffnessP2(mesh.coords, mesh.elements, e, D, 1, ke, s);
        for (let a = 0; a < 12; a++) {
          const da = 2 * mesh.elements[6 * e + (a >> 1)] + (a & 1);
          for (let b = 0; b < 12; b++) theirs += u[da] * ke[12 * a + b] * u[2 * mesh.elements[6 * e + (b >> 1)] + (b & 1)];
        }
      }
      expect(Math.abs(mine - theirs)).toBeLessThan(1e-12 * Math.abs(theirs));
    }
  });

  it('the clamped cantilever is positive definite: it factors and solves to round-off', () => {
    const p = cantileverProblemP2(10, 5, 3);
    expect(p.matrix.n).toBe(2 * (21 * 11 - 11));
    const { stats } = solveSpd(p.matrix, randomVector(p.matrix.n, 1), {
      coords: p.mesh.coords,
      nodeAdjacency: p.adjacency,
      dofsPerNode: 2,
      fullDofOfRow: p.fullDofOfRow,
    });
    expect(stats.relativeResidual).toBeLessThan(1e-12);
  });
});
