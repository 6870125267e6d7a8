/**
 * Code verification by the method of manufactured solutions (P. J. Roache, "Code verification
 * by the method of manufactured solutions", J. Fluids Eng. 124 (2002) 4-10 [M]; ASME V&V 20-2009
 * [V: reader's guide]): a smooth displacement field is
 * chosen, the body force that makes it an exact solution is applied, the exact displacements
 * are prescribed on the whole boundary, and the errors of the finite element solution are
 * measured on a series of quasi-uniform meshes. Their slopes against h are the observed orders
 * of accuracy, to compare with the theory ([M: G. Strang & G. J. Fix, An Analysis of the Finite Element
 * Method (1973); P. G. Ciarlet, The Finite Element Method for Elliptic Problems (1978)]): energy norm and stress L2 norm O(h^p) for elements of degree p, displacement
 * L2 norm O(h^(p+1)).
 *
 * The manufactured solution (method of P. J. Roache, J. Fluids Eng. 124 (2002) 4-10) [D] on the unit square, plane stress:
 *   u = U0 sin(pi x) cos(pi y),  v = (U0/2) cos(pi x) sin(pi y),
 *   bx = pi^2 E U0 (7 - nu) / (4 (1 - nu^2)) sin(pi x) cos(pi y),
 *   by = pi^2 E U0 (5 + nu) / (4 (1 - nu^2)) cos(pi x) sin(pi y),
 * from b = -div sigma(u) in the Navier form given there, rederived for this module:
 * u,xx = u,yy = -pi^2 u and v,xy = -(U0/2) pi^2 sin(pi x) cos(pi y) give
 * bx = E pi^2 U0 / (1 - nu^2) [1 + (1 - nu)/2 + (1 + nu)/4] sin(pi x) cos(pi y), the bracket
 * being (7 - nu)/4; likewise by with [1/2 + (1 - nu)/4 + (1 + nu)/2] = (5 + nu)/4.
 * tests/verify-mms.test.ts checks div sigma + b = 0 numerically.
 *
 * Error norms, each integrated element by element with the 12-point degree-6 rule (Dunavant
 * 1985; src/fem/body-force.ts), whose quadrature error is of higher order in h than the errors
 * measured (it is exact for the polynomial part and O(h^7) for the smooth part):
 *   energy      ||u - u_h||_E = sqrt( t integral (e - e_h)^T D (e - e_h) dA ), e the strain;
 *   stress L2   ||s - s_h|| = sqrt( integral |s - s_h|^2 dA ), |s|^2 = sxx^2 + syy^2 + 2 sxy^2
 *               (the Frobenius norm of the in-plane tensor), s_h = D B u_h raw in each element;
 *   recovered   the same with the SPR nodal stresses (src/post/recover.ts, no boundary
 *               tractions imposed) interpolated by the element shape functions;
 *   displacement L2 ||u - u_h|| = sqrt( integral |u - u_h|^2 dA ).
 * Relative versions divide by the same norm of the exact field.
 */
import { addBodyForce, TRI12 } from '../fem/body-force.js';
import { assembleSystem } from '../fem/assemble.js';
import { P2Scratch, strainMatrixP1, strainMatrixP2 } from '../fem/elements.js';
import { constitutiveMatrix } from '../fem/material.js';
import { buildDomain } from '../geometry/domain.js';
import { generateMesh } from '../mesh/generate.js';
import type { Mesh } from '../mesh/types.js';
import { recoverNodalStress } from '../post/recover.js';
import { sampleElementStresses } from '../post/stress.js';
import { solveSpd } from '../solve/index.js';

export interface ManufacturedOptions {
  /** Young's modulus (default 1; the relative errors do not depend on it) */
  E?: number;
  /** Poisson's ratio (default 0.3) */
  nu?: number;
  /** displacement amplitude U0 (default 1e-3) */
  U0?: number;
  /** plate thickness (default 1) */
  thickness?: number;
}

export interface ManufacturedRow {
  order: 1 | 2;
  /** the mesh size asked of the mesher (size = raiserSize) */
  size: number;
  /** sqrt(area / elements), the mesh size measured */
  h: number;
  elements: number;
  nodes: number;
  /** 2 x nodes */
  dofs: number;
  /** unknowns left after the boundary values are prescribed */
  freeDofs: number;
  energyError: number;
  relativeEnergyError: number;
  stressL2Error: number;
  relativeStressL2Error: number;
  recoveredStressError: number;
  relativeRecoveredStressError: number;
  displacementL2Error: number;
  relativeDisplacementL2Error: number;
}

/** The manufactured displacement (u, v) at (x, y). */
function manufacturedDisplacement(U0: number, x: number, y: number, out: number[]): void {
  const sx = Math.sin(Math.PI * x);
  const cx = Math.cos(Math.PI * x);
  const sy = Math.sin(Math.PI * y);
  const cy = Math.cos(Math.PI * y);
  out[0] = U0 * sx * cy;
  out[1] = 0.5 * U0 * cx * sy;
}

/** The manufactured strain (exx, eyy, gxy) at (x, y), engineering shear strain. */
function manufacturedStrain(U0: number, x: number, y: number, out: number[]): void {
  const p = Math.PI;
  const sx = Math.sin(p * x);
  const cx = Math.cos(p * x);
  const sy = Math.sin(p * y);
  const cy = Math.cos(p * y);
  out[0] = U0 * p * cx * cy; // u,x
  out[1] = 0.5 * U0 * p * cx * cy; // v,y
  out[2] = -U0 * p * sx * sy - 0.5 * U0 * p * sx * sy; // u,y + v,x
}

/** The manufactured plane-stress stress (sxx, syy, sxy) at (x, y). */
export function manufacturedStress(E: number, nu: number, U0: number, x: number, y: number, out: number[]): void {
  const e = [0, 0, 0];
  manufacturedStrain(U0, x, y, e);
  const c = E / (1 - nu * nu);
  out[0] = c * (e[0] + nu * e[1]);
  out[1] = c * (nu * e[0] + e[1]);
  out[2] = ((c * (1 - nu)) / 2) * e[2];
}

/** The body force (bx, by) per unit volume that balances the manufactured field, derived from Navier's equations of plane stress [D]. */
export function manufacturedBodyForce(E: number, nu: number, U0: number, x: number, y: number, out: number[]): void {
  const k = (Math.PI * Math.PI * E * U0) / (4 * (1 - nu * nu));
  out[0] = k * (7 - nu) * Math.sin(Math.PI * x) * Math.cos(Math.PI * y);
  out[1] = k * (5 + nu) * Math.cos(Math.PI * x) * Math.sin(Math.PI * y);
}

/**
 * Runs the manufactured solution on the unit square for each mesh size in `sizes` (the
 * mesher's target edge length, used as both size and raiserSize) with 3-node (order 1) or
 * 6-node (order 2) triangles, and returns the error norms per mesh, coarse to fine as given.
 */
export function runManufactured(order: 1 | 2, sizes: number[], options: ManufacturedOptions = {}): ManufacturedRow[] {
  const E = options.E ?? 1;
  const nu = options.nu ?? 0.3;
  const U0 = options.U0 ?? 1e-3;
  const t = options.thickness ?? 1;
  if (order !== 1 && order !== 2) throw new RangeError(`runManufactured: the element order must be 1 or 2, got ${String(order)}`);
  if (sizes.length === 0) throw new RangeError('runManufactured: give at least one mesh size');
  for (const h of sizes) {
    if (!(h > 0 && h <= 1)) throw new RangeError(`runManufactured: mesh size ${h} must lie in (0, 1], the unit square's side`);
  }
  const D = constitutiveMatrix(E, nu, 'plane-stress');
  const domain = buildDomain({ outline: { shape: 'path', path: [[0, 0], [1, 0], [1, 1], [0, 1]] } });
  const rows: ManufacturedRow[] = [];
  const tmp = [0, 0];
  for (const size of sizes) {
    const { mesh } = generateMesh(domain, { order, size, raiserSize: size });
    const nDof = 2 * mesh.nNodes;
    const fixed = new Uint8Array(nDof);
    const value = new Float64Array(nDof);
    for (let s = 0; s < mesh.nBEdges; s++) {
      for (let k = 0; k < 3; k++) {
        const n = mesh.bEdges[3 * s + k];
        if (n < 0 || fixed[2 * n]) continue;
        manufacturedDisplacement(U0, mesh.nodes[2 * n], mesh.nodes[2 * n + 1], tmp);
        fixed[2 * n] = 1;
        fixed[2 * n + 1] = 1;
        value[2 * n] = tmp[0];
        value[2 * n + 1] = tmp[1];
      }
    }
    const f = new Float64Array(nDof);
    addBodyForce(mesh, (x, y, out) => manufacturedBodyForce(E, nu, U0, x, y, out), t, f);
    const sys = assembleSystem(mesh, D, t, f, { fixed, value });
    const u = Float64Array.from(value);
    if (sys.freeDof.length > 0) {
      const { x } = solveSpd(sys.K, sys.f);
      for (let i = 0; i < sys.freeDof.length; i++) u[sys.freeDof[i]] = x[i];
    }
    const recovered = recoverNodalStress(mesh, sampleElementStresses(mesh, D, u), null);
    const err = measureErrors(mesh, D, t, u, recovered, E, nu, U0);
    rows.push({
      order,
      size,
      h: Math.sqrt(err.area / mesh.nElements),
      elements: mesh.nElements,
      nodes: mesh.nNodes,
      dofs: nDof,
      freeDofs: sys.freeDof.length,
      energyError: err.energy,
      relativeEnergyError: err.energy / err.energyNorm,
      stressL2Error: err.stress,
      relativeStressL2Error: err.stress / err.stressNorm,
      recoveredStressError: err.recovered,
      relativeRecoveredStressError: err.recovered / err.stressNorm,
      displacementL2Error: err.displacement,
      relativeDisplacementL2Error: err.displacement / err.displacementNorm,
    });
  }
  return rows;
}

/** The error norms of one solution (see the module comment), and the norms of the exact field. */
function measureErrors(mesh: Mesh, D: Float64Array, t: number, u: Float64Array, recovered: Float64Array, E: number, nu: number, U0: number) {
  const per = mesh.order === 2 ? 6 : 3;
  const nd = 2 * per;
  const el = mesh.elements;
  const nodes = mesh.nodes;
  const B1 = new Float64Array(18);
  const s2 = new P2Scratch();
  const N = new Float64Array(6);
  const ue = new Float64Array(12);
  const ex = [0, 0, 0];
  const sx = [0, 0, 0];
  const ux = [0, 0];
  let energy = 0;
  let energyNorm = 0;
  let stress = 0;
  let stressNorm = 0;
  let rec = 0;
  let disp = 0;
  let dispNorm = 0;
  let area = 0;
  for (let e = 0; e < mesh.nElements; e++) {
    for (let i = 0; i < per; i++) {
      const n = el[per * e + i];
      ue[2 * i] = u[2 * n];
      ue[2 * i + 1] = u[2 * n + 1];
    }
    let det1 = 0;
    if (per === 3) det1 = 2 * strainMatrixP1(nodes, el, e, B1);
    for (let q = 0; q < TRI12.w.length; q++) {
      const xi = TRI12.xi[q];
      const eta = TRI12.eta[q];
      let B: Float64Array;
      let det: number;
      if (per === 3) {
        B = B1;
        det = det1;
        N[0] = 1 - xi - eta;
        N[1] = xi;
        N[2] = eta;
      } else {
        det = strainMatrixP2(nodes, el, e, xi, eta, s2);
        B = s2.B;
        for (let i = 0; i < 6; i++) N[i] = s2.N[i];
      }
      let x = 0;
      let y = 0;
      let uh = 0;
      let vh = 0;
      let r0 = 0;
      let r1 = 0;
      let r2 = 0;
      for (let i = 0; i < per; i++) {
        const n = el[per * e + i];
        x += N[i] * nodes[2 * n];
        y += N[i] * nodes[2 * n + 1];
        uh += N[i] * ue[2 * i];
        vh += N[i] * ue[2 * i + 1];
        r0 += N[i] * recovered[3 * n];
        r1 += N[i] * recovered[3 * n + 1];
        r2 += N[i] * recovered[3 * n + 2];
      }
      let e0 = 0;
      let e1 = 0;
      let e2 = 0;
      for (let j = 0; j < nd; j++) {
        e0 += B[j] * ue[j];
        e1 += B[nd + j] * ue[j];
        e2 += B[2 * nd + j] * ue[j];
      }
      manufacturedStrain(U0, x, y, ex);
      manufacturedStress(E, nu, U0, x, y, sx);
      manufacturedDisplacement(U0, x, y, ux);
      const w = TRI12.w[q] * det;
      area += w;
      // Strain error and its stress D (e - e_h).
      const d0 = ex[0] - e0;
      const d1 = ex[1] - e1;
      const d2 = ex[2] - e2;
      const t0 = D[0] * d0 + D[1] * d1 + D[2] * d2;
      const t1 = D[3] * d0 + D[4] * d1 + D[5] * d2;
      const t2 = D[6] * d0 + D[7] * d1 + D[8] * d2;
      energy += w * t * (d0 * t0 + d1 * t1 + d2 * t2);
      energyNorm += w * t * (ex[0] * sx[0] + ex[1] * sx[1] + ex[2] * sx[2]);
      stress += w * (t0 * t0 + t1 * t1 + 2 * t2 * t2);
      stressNorm += w * (sx[0] * sx[0] + sx[1] * sx[1] + 2 * sx[2] * sx[2]);
      const q0 = sx[0] - r0;
      const q1 = sx[1] - r1;
      const q2 = sx[2] - r2;
      rec += w * (q0 * q0 + q1 * q1 + 2 * q2 * q2);
      disp += w * ((ux[0] - uh) ** 2 + (ux[1] - vh) ** 2);
      dispNorm += w * (ux[0] * ux[0] + ux[1] * ux[1]);
    }
  }
  return {
    area,
    energy: Math.sqrt(energy),
    energyNorm: Math.sqrt(energyNorm),
    stress: Math.sqrt(stress),
    stressNorm: Math.sqrt(stressNorm),
    recovered: Math.sqrt(rec),
    displacement: Math.sqrt(disp),
    displacementNorm: Math.sqrt(dispNorm),
  };
}

/**
 * The observed order of accuracy: the least-squares slope of log(error) against log(h) over
 * the meshes given (a least-squares fit of log(error) against log(h) over 3-4 meshes, as in Roache (2002)).
 * Needs at least two meshes of different h and positive errors; a RangeError otherwise.
 */
export function fitObservedOrder(h: ArrayLike<number>, error: ArrayLike<number>): number {
  const n = h.length;
  if (n !== error.length) throw new RangeError(`fitObservedOrder: ${n} mesh sizes but ${error.length} errors`);
  if (n < 2) throw new RangeError('fitObservedOrder: needs at least two meshes');
  let mx = 0;
  let my = 0;
  for (let i = 0; i < n; i++) {
    if (!(h[i] > 0) || !(error[i] > 0)) throw new RangeError(`fitObservedOrder: mesh ${i + 1} has h = ${h[i]} and error = ${error[i]}; both must be positive`);
    mx += Math.log(h[i]);
    my += Math.log(error[i]);
  }
  mx /= n;
  my /= n;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < n; i++) {
    const dx = Math.log(h[i]) - mx;
    sxx += dx * dx;
    sxy += dx * (Math.log(error[i]) - my);
  }
  if (!(sxx > 0)) throw new RangeError('fitObservedOrder: all meshes have the same h; the slope is undefined');
  return sxy / sxx;
}
