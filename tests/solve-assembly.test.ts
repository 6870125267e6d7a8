import { describe, it, expect } from 'vitest';
import { buildDomain } from '../src/geometry/domain.js';
import { generateMesh } from '../src/mesh/generate.js';
import { assembleSystem, forEachElementStiffness } from '../src/fem/assemble.js';
import { constitutiveMatrix } from '../src/fem/material.js';
import { assembleSymmetric } from '../src/solve/index.js';
import { benchModel } from '../src/bench/model.js';

/** The reference: coordinate triplets of every free-free lower entry, compressed by assembleSymmetric. */
function tripletAssembly(mesh: ReturnType<typeof generateMesh>['mesh'], D: Float64Array, fixed: Uint8Array) {
  const dofFree = new Int32Array(2 * mesh.nNodes);
  let nFree = 0;
  for (let d = 0; d < dofFree.length; d++) dofFree[d] = fixed[d] ? -1 : nFree++;
  const r: number[] = [];
  const c: number[] = [];
  const v: number[] = [];
  forEachElementStiffness(mesh, D, 2, (_e, ke, dofs) => {
    const nd = dofs.length;
    for (let i = 0; i < nd; i++) {
      for (let j = 0; j < nd; j++) {
        const ri = dofFree[dofs[i]];
        const cj = dofFree[dofs[j]];
        if (ri < 0 || cj < 0 || ri < cj) continue;
        r.push(ri);
        c.push(cj);
        v.push(ke[i * nd + j]);
      }
    }
  });
  return assembleSymmetric(nFree, Int32Array.from(r), Int32Array.from(c), Float64Array.from(v), 'full');
}

describe('stiffness assembly in place on the node-graph pattern', () => {
  for (const order of [1, 2] as const) {
    it(`equals the triplet assembly bit for bit (${order === 1 ? '3' : '6'}-node), with prescribed values moved to f`, () => {
      const model = benchModel(2);
      const { mesh } = generateMesh(buildDomain(model.geometry), { order, size: model.mesh!.size, raiserSize: model.mesh!.raiserSize });
      const D = constitutiveMatrix(210000, 0.3, 'plane-stress');
      const fixed = new Uint8Array(2 * mesh.nNodes);
      const value = new Float64Array(2 * mesh.nNodes);
      for (let v = 0; v < mesh.nNodes; v++) {
        if (mesh.nodes[2 * v] === 0) {
          fixed[2 * v] = 1;
          fixed[2 * v + 1] = 1;
          value[2 * v] = 0.01;
        }
      }
      const sys = assembleSystem(mesh, D, 2, new Float64Array(2 * mesh.nNodes), { fixed, value });
      const ref = tripletAssembly(mesh, D, fixed);
      expect(Array.from(sys.K.colPtr)).toEqual(Array.from(ref.colPtr));
      expect(Array.from(sys.K.rowIndex)).toEqual(Array.from(ref.rowIndex));
      expect(Array.from(sys.K.values)).toEqual(Array.from(ref.values));
      // f = -K_fc u_c: nonzero only next to the support
      expect(sys.f.some((x) => x !== 0)).toBe(true);
    });
  }
});
