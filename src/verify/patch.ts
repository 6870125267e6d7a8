/**
 * The distorted patch and the plain solve the patch tests use, shared by the verification suite
 * (src/verify/suite.ts) and the tests.
 */
import { buildDomain, type Domain } from '../geometry/domain.js';
import { assembleSystem } from '../fem/assemble.js';
import { upgradeToQuadratic } from '../mesh/generate.js';
import type { Mesh } from '../mesh/types.js';
import { solveSpd } from '../solve/index.js';

/** A w x h rectangle with its corner at the origin. */
export function rectangleDomain(w: number, h: number): Domain {
  return buildDomain({ outline: { shape: 'path', path: [[0, 0], [w, 0], [w, h], [0, h]] } });
}

/**
 * The distorted patch of R. H. MacNeal & R. L. Harder, "A proposed standard set of problems to
 * test finite element accuracy", Finite Elem. Anal. Des. 1 (1985) 3-20: a 0.24 x 0.12
 * rectangle with four irregular interior nodes, here with each quadrilateral cut into two
 * triangles. Returns a linear or quadratic mesh with straight sides.
 */
export function distortedPatch(order: 1 | 2): { mesh: Mesh; domain: Domain } {
  const domain = rectangleDomain(0.24, 0.12);
  const xy = [0, 0, 0.24, 0, 0.24, 0.12, 0, 0.12, 0.04, 0.02, 0.18, 0.03, 0.16, 0.08, 0.08, 0.08];
  const quads = [
    [0, 1, 5, 4],
    [1, 2, 6, 5],
    [2, 3, 7, 6],
    [3, 0, 4, 7],
    [4, 5, 6, 7],
  ];
  const el: number[] = [];
  for (const [a, b, c, d] of quads) el.push(a, b, c, a, c, d);
  // Boundary edges on the domain's four sides (bottom, right, top, left), material on the left.
  const bEdges = [0, 1, -1, 1, 2, -1, 2, 3, -1, 3, 0, -1];
  const lin: Mesh = {
    order: 1,
    nNodes: 8,
    nVertices: 8,
    nodes: Float64Array.from(xy),
    nElements: 10,
    elements: Int32Array.from(el),
    bEdges: Int32Array.from(bEdges),
    nBEdges: 4,
    bEdgeDomain: Int32Array.of(0, 1, 2, 3),
    bEdgeT: Float64Array.of(0, 1, 0, 1, 0, 1, 0, 1),
    nodeEdge: Int32Array.of(0, 1, 2, 3, -1, -1, -1, -1),
    nodeCorner: Int32Array.of(3, 0, 1, 2, -1, -1, -1, -1),
  };
  return { mesh: order === 2 ? upgradeToQuadratic(lin, domain) : lin, domain };
}

/** Solves K u = f with the listed DOFs prescribed; returns the full displacement vector. */
export function solveLinear(mesh: Mesh, D: Float64Array, thickness: number, f: Float64Array, fixed: Uint8Array, value: Float64Array): Float64Array {
  const sys = assembleSystem(mesh, D, thickness, f, { fixed, value });
  const u = Float64Array.from(value);
  if (sys.freeDof.length > 0) {
    const { x } = solveSpd(sys.K, sys.f, { ordering: 'amd' });
    for (let i = 0; i < sys.freeDof.length; i++) u[sys.freeDof[i]] = x[i];
  }
  return u;
}

/** Boundary node flags. */
export function boundaryFlags(mesh: Mesh): Uint8Array {
  const on = new Uint8Array(mesh.nNodes);
  for (let s = 0; s < mesh.nBEdges; s++) for (let k = 0; k < 3; k++) if (mesh.bEdges[3 * s + k] >= 0) on[mesh.bEdges[3 * s + k]] = 1;
  return on;
}
