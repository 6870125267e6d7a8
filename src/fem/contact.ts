/**
 * Frictionless contact between circular holes and rigid round pins, solved exactly (no penalty)
 * by a primal-dual active set method, the semismooth Newton method for the contact conditions
 * (S. Hueber, G. Stadler, B.I. Wohlmuth, "A primal-dual active set algorithm for
 * three-dimensional contact problems with Coulomb friction", SIAM J. Sci. Comput. 30 (2008)
 * 572-596; for frictionless contact it is their algorithm without the tangential part).
 *
 * The conditions, at every node i on the hole of a pin (corner and midside nodes alike):
 *
 *     gap      g_i = (rho_i - R_p) + (u_i - delta) . n_i  >= 0
 *     force    lambda_i >= 0                  (the pin pushes, never pulls)
 *     contact  lambda_i g_i = 0               (a force only where the gap is closed)
 *
 * with n_i the unit radial direction at the node (from the hole's centre into the material),
 * rho_i the node's distance from the centre, R_p the pin's radius (the hole's less half the
 * diametral clearance), delta the pin's rigid displacement (unknown for a pin pushed by a force,
 * zero for a fixed pin) and lambda_i the normal force the pin puts on node i, which is the
 * node's reaction (K u - f) . n_i. The gap is linearised in the displacements, as the small-strain
 * analysis is: it is exact for displacements small beside the radius. Without friction the
 * tangential force is zero everywhere, and a pin pushed by F is in equilibrium:
 * sum_i lambda_i n_i = F.
 *
 * Method. Every hole node is turned to normal and tangential axes (u_n, u_t) = R_i^T (u_x, u_y)
 * once, in the assembled matrix (R^T K R, in place: same pattern). Given an active set A:
 *   - on A the gap is closed: u_n,i = n_i . delta - (rho_i - R_p), a prescribed row (its row and
 *     column set to the diagonal alone, the known values moved to the right-hand side);
 *   - off A the node is free (lambda_i = 0).
 * The prescribed values are linear in delta, so one factorisation solves for the load and, for
 * each pin pushed by a force, for unit displacements in x and y (superposition); the pins'
 * equilibrium then fixes delta (a small symmetric system, N^T S N delta = F - N^T lambda_0, S the
 * stiffness seen at the contact nodes). The next active set is
 *     A' = { i in A : lambda_i > -tol_f }  U  { i not in A : g_i < -tol_g },
 * the semismooth Newton step for max(0, lambda - c g) = lambda with any c > 0 (on A the gap is
 * zero and off A the force is zero, so c does not matter). The iteration stops when A' = A: the
 * solution then meets every condition, to the tolerances (1e-9 of the total contact force and of
 * the hole's displacement scale), which are round-off.
 *
 * Cost. The matrix pattern never changes (prescribed rows keep their zeroed entries), so the
 * ordering and symbolic analysis are done once (src/solve/repeated.ts) and each iteration costs a
 * numeric factorisation and 1 + 2 P triangular solves (P pins pushed by a force).
 *
 * Starting sets. A pushed pin starts on the arc centred on its force whose half-angle is the
 * Hertz estimate for conforming cylinders, a = sqrt(4 P R / (pi E')) with P = F / t the force per
 * unit thickness, R = R_p R_h / (R_h - R_p) and E' the plate's plane modulus (E in plane stress,
 * E / (1 - nu^2) in plane strain; the pin is rigid) (K.L. Johnson, Contact Mechanics, 1985, the
 * chapter on line contact of cylinders, with the conforming radius [M]); the half of the hole,
 * 90 degrees, with no clearance, and never more. A fixed pin starts on its whole hole (the first
 * iterate is the hole bonded to the pin), and after the first iteration again on the same
 * estimate about the direction of the force it then carries. Any start gives the same
 * solution; a near one saves iterations (with clearance, starting on the half of the hole took
 * 6 to 11 iterations on a lug, the arc shrinking a few nodes at a time).
 */
import type { Mesh } from '../mesh/types.js';
import { AnalysisError, InternalError } from '../model/errors.js';
import type { SolveOptions, SolveStats, SymmetricCsc } from '../solve/index.js';
import { RepeatedSolver, solveSymmetricSmall } from '../solve/index.js';
import type { FeSystem } from './assemble.js';
import { holeNodes, type HoleNodes, type PinHole } from './pins.js';

/** The contact of one pin, at the solution. Arrays run over the hole's nodes, sorted by angle. */
export interface PinContact {
  pin: PinHole;
  hole: HoleNodes;
  /** 1 where the node is in contact */
  active: Uint8Array;
  /** the normal force the pin puts on the node (>= 0, pushing the material), force units */
  force: Float64Array;
  /** contact pressure, force / (weight * thickness), stress units (see HoleNodes.weight) */
  pressure: Float64Array;
  /** gap after deformation (0 in contact), length units */
  gap: Float64Array;
  /** the pin's rigid displacement; [0, 0] for a fixed pin */
  displacement: [number, number];
  /** the resultant of the contact forces on the part */
  resultant: [number, number];
}

/**
 * Where a pin's contact was on an earlier mesh of the same model: the direction of the force
 * the pin put on the part and the half-angle of its arc about it (radians). A series of meshes
 * starts each solve there, which saves the iterations of finding the arc again.
 */
export interface ContactHint {
  fx: number;
  fy: number;
  halfAngle: number;
}

/** The hints of a solved contact, by pin path. */
export function hintsFromContact(pins: readonly PinContact[]): Map<string, ContactHint> {
  const out = new Map<string, ContactHint>();
  for (const p of pins) {
    const [fx, fy] = p.resultant;
    const F = Math.hypot(fx, fy);
    if (!(F > 0)) continue;
    // The widest angle from the force's line among the nodes in contact.
    let half = 0;
    for (let i = 0; i < p.active.length; i++) {
      if (!p.active[i]) continue;
      const c = (p.hole.normal[2 * i] * fx + p.hole.normal[2 * i + 1] * fy) / F;
      half = Math.max(half, Math.acos(Math.max(-1, Math.min(1, c))));
    }
    out.set(p.pin.path, { fx, fy, halfAngle: half });
  }
  return out;
}

export interface ContactSolution {
  /** displacements of the free DOFs, x-y axes, as solveSpd returns them */
  x: Float64Array;
  stats: SolveStats;
  factor: null;
  pins: PinContact[];
  /** active-set iterations: one factorisation each */
  iterations: number;
  /** nodes in contact (all pins) in each iteration's active set */
  activeHistory: number[];
  /** the tolerances the conditions were met to: force units, length units */
  tolerance: { force: number; gap: number };
}

interface Rotated {
  /** per pair (hole node of any pin): its normal row (the y row is the next one) */
  row: Int32Array;
  c: Float64Array;
  s: Float64Array;
  /** per pair: positions of its normal row left of the diagonal (entries (row, col < row)), CSR */
  leftPtr: Int32Array;
  leftPos: Int32Array;
  leftCol: Int32Array;
}

/**
 * Turns the node pairs to normal and tangential axes in place: values <- R^T K R for the block
 * of each pair, R = [[c, -s], [s, c]]. Needs both DOFs of a turned node free and the lower
 * pattern of assembleSystem (a node's x and y columns hold the same rows below its 2x2 block).
 */
function rotateMatrix(K: SymmetricCsc, values: Float64Array, rot: Rotated, pairOfRow: Int32Array): void {
  const { colPtr, rowIndex, n } = K;
  for (let k = 0; k < rot.row.length; k++) {
    const j = rot.row[k];
    const c = rot.c[k];
    const s = rot.s[k];
    const p0 = colPtr[j];
    const q0 = colPtr[j + 1];
    const len = colPtr[j + 1] - p0 - 2;
    if (rowIndex[p0] !== j || rowIndex[p0 + 1] !== j + 1 || rowIndex[q0] !== j + 1 || colPtr[j + 2] - q0 - 1 !== len) {
      throw new InternalError('contact: the stiffness pattern of a hole node is not the one assembleSystem makes');
    }
    const a = values[p0];
    const b = values[p0 + 1];
    const d = values[q0];
    values[p0] = c * c * a + 2 * c * s * b + s * s * d;
    values[p0 + 1] = -s * c * a + (c * c - s * s) * b + s * c * d;
    values[q0] = s * s * a - 2 * s * c * b + c * c * d;
    for (let r = 0; r < len; r++) {
      const px = p0 + 2 + r;
      const py = q0 + 1 + r;
      if (rowIndex[px] !== rowIndex[py]) throw new InternalError('contact: the x and y columns of a hole node hold different rows');
      const u = values[px];
      const w = values[py];
      values[px] = c * u + s * w;
      values[py] = -s * u + c * w;
    }
  }
  for (let col = 0; col < n; col++) {
    for (let p = colPtr[col]; p < colPtr[col + 1]; p++) {
      const r = rowIndex[p];
      const k = pairOfRow[r];
      if (k < 0 || r === col) continue;
      if (rowIndex[p + 1] !== r + 1) throw new InternalError('contact: the x and y rows of a hole node are not adjacent');
      const c = rot.c[k];
      const s = rot.s[k];
      const u = values[p];
      const w = values[p + 1];
      values[p] = c * u + s * w;
      values[p + 1] = -s * u + c * w;
      p++;
    }
  }
}

/** Positions of each pair's normal row to the left of the diagonal, with their columns. */
function leftEntries(K: SymmetricCsc, rot: Rotated, pairOfRow: Int32Array): void {
  const { colPtr, rowIndex, n } = K;
  const count = new Int32Array(rot.row.length + 1);
  for (let col = 0; col < n; col++) {
    for (let p = colPtr[col]; p < colPtr[col + 1]; p++) {
      const k = pairOfRow[rowIndex[p]];
      if (k >= 0 && rowIndex[p] !== col) count[k + 1]++;
    }
  }
  for (let k = 0; k < rot.row.length; k++) count[k + 1] += count[k];
  const fill = count.slice(0, rot.row.length);
  const pos = new Int32Array(count[rot.row.length]);
  const cols = new Int32Array(pos.length);
  for (let col = 0; col < n; col++) {
    for (let p = colPtr[col]; p < colPtr[col + 1]; p++) {
      const k = pairOfRow[rowIndex[p]];
      if (k < 0 || rowIndex[p] === col) continue;
      pos[fill[k]] = p;
      cols[fill[k]++] = col;
    }
  }
  rot.leftPtr = count;
  rot.leftPos = pos;
  rot.leftCol = cols;
}

/**
 * Solves the system of assembleSystem with rigid pins in frictionless contact (`pins`: the
 * rigid-pin loads and supports). Returns the displacements of the free DOFs in x-y axes and each
 * pin's contact. Throws AnalysisError when the active set does not settle, or a pin's force
 * cannot be carried; SolverPivotError when the stiffness with the contact found is singular.
 */
export function solveContact(
  mesh: Mesh,
  system: FeSystem,
  pins: readonly PinHole[],
  material: { thickness: number; planeModulus: number },
  options: SolveOptions = {},
  maxIterations = 50,
  hints: ReadonlyMap<string, ContactHint> = new Map(),
): ContactSolution {
  const thickness = material.thickness;
  const K = system.K;
  const n = K.n;
  const holes = pins.map((p) => holeNodes(mesh, p));
  // Pairs: every hole node of every pin, in pin order.
  const nPairs = holes.reduce((s, h) => s + h.nodes.length, 0);
  const rot: Rotated = { row: new Int32Array(nPairs), c: new Float64Array(nPairs), s: new Float64Array(nPairs), leftPtr: new Int32Array(0), leftPos: new Int32Array(0), leftCol: new Int32Array(0) };
  const pairOfRow = new Int32Array(n).fill(-1);
  const first = new Int32Array(pins.length + 1);
  holes.forEach((h, pi) => {
    first[pi + 1] = first[pi] + h.nodes.length;
    for (let i = 0; i < h.nodes.length; i++) {
      const k = first[pi] + i;
      const node = h.nodes[i];
      const rx = system.dofFree[2 * node];
      const ry = system.dofFree[2 * node + 1];
      if (rx < 0 || ry !== rx + 1) throw new InternalError(`contact: a node on ${pins[pi].label} is held by another support`);
      rot.row[k] = rx;
      rot.c[k] = h.normal[2 * i];
      rot.s[k] = h.normal[2 * i + 1];
      pairOfRow[rx] = k;
    }
  });
  const rotValues = K.values.slice();
  rotateMatrix(K, rotValues, rot, pairOfRow);
  leftEntries(K, rot, pairOfRow);
  const fRot = system.f.slice();
  for (let k = 0; k < nPairs; k++) {
    const j = rot.row[k];
    const u = fRot[j];
    const w = fRot[j + 1];
    fRot[j] = rot.c[k] * u + rot.s[k] * w;
    fRot[j + 1] = -rot.s[k] * u + rot.c[k] * w;
  }

  // Pins pushed by a force: their displacement is unknown, two right-hand sides each.
  const loadPins = pins.map((p, i) => (p.role === 'load' ? i : -1)).filter((i) => i >= 0);
  const nrhs = 1 + 2 * loadPins.length;
  const rhsOfPin = new Int32Array(pins.length).fill(-1);
  loadPins.forEach((pi, q) => (rhsOfPin[pi] = 1 + 2 * q));
  // Gap with the pin centred and no displacement: rho_i - R_p.
  const gap0 = new Float64Array(nPairs);
  holes.forEach((h, pi) => {
    const Rp = pins[pi].radius - pins[pi].clearance / 2;
    for (let i = 0; i < h.nodes.length; i++) gap0[first[pi] + i] = h.rho[i] - Rp;
  });

  // Starting set: a pushed pin's estimated arc about its force; a fixed pin's whole hole.
  const active = new Uint8Array(nPairs);
  const seed = (pi: number, fx: number, fy: number, halfGiven?: number) => {
    const h = holes[pi];
    const half = halfGiven ?? estimatedHalfAngle(pins[pi], Math.hypot(fx, fy), material);
    const cosHalf = Math.cos(half);
    const F = Math.hypot(fx, fy);
    for (let i = 0; i < h.nodes.length; i++) {
      const c = (h.normal[2 * i] * fx + h.normal[2 * i + 1] * fy) / F;
      // the ends of the half hole (c = 0) count in, whatever the sign of their round-off
      active[first[pi] + i] = c > -1e-9 && c >= cosHalf - 1e-9 ? 1 : 0;
    }
    // at least the node nearest the force, so the arc is never empty
    let best = first[pi];
    for (let i = 0; i < h.nodes.length; i++) if (h.normal[2 * i] * fx + h.normal[2 * i + 1] * fy > h.normal[2 * (best - first[pi])] * fx + h.normal[2 * (best - first[pi]) + 1] * fy) best = first[pi] + i;
    active[best] = 1;
  };
  // With a hint from an earlier mesh of the same model, each pin starts on that solution's arc.
  const bonded = new Uint8Array(pins.length);
  /** the Hertz half-angle a pushed pin started on (0: it started from a hint or bonded) */
  const estimated = new Float64Array(pins.length);
  holes.forEach((h, pi) => {
    const hint = hints.get(pins[pi].path);
    if (hint && Math.hypot(hint.fx, hint.fy) > 0) seed(pi, hint.fx, hint.fy, hint.halfAngle);
    else if (pins[pi].role === 'load') {
      estimated[pi] = estimatedHalfAngle(pins[pi], Math.hypot(pins[pi].force[0], pins[pi].force[1]), material);
      seed(pi, pins[pi].force[0], pins[pi].force[1], estimated[pi]);
    }
    else {
      active.fill(1, first[pi], first[pi] + h.nodes.length);
      bonded[pi] = 1;
    }
  });

  const solver = new RepeatedSolver(K, options);
  const diag = new Float64Array(nPairs);
  for (let k = 0; k < nPairs; k++) diag[k] = rotValues[K.colPtr[rot.row[k]]];
  const history: number[] = [];
  const lambda = new Float64Array(nPairs);
  const gap = new Float64Array(nPairs);
  let delta: Float64Array = new Float64Array(2 * loadPins.length);
  let u: Float64Array = new Float64Array(n);
  let modValues = rotValues;
  let B = new Float64Array(0);
  let tolF = 0;
  let tolG = 0;
  let iterations = 0;
  for (;;) {
    iterations++;
    let nActive = 0;
    for (let k = 0; k < nPairs; k++) nActive += active[k];
    history.push(nActive);
    // The matrix with the active normal rows prescribed, and the right-hand sides.
    modValues = rotValues.slice();
    B = new Float64Array(n * nrhs);
    B.set(fRot, 0);
    const v = new Float64Array(nrhs);
    for (let pi = 0; pi < pins.length; pi++) {
      const h = holes[pi];
      const q = rhsOfPin[pi];
      for (let i = 0; i < h.nodes.length; i++) {
        const k = first[pi] + i;
        if (!active[k]) continue;
        v.fill(0);
        v[0] = -gap0[k];
        if (q >= 0) {
          v[q] = h.normal[2 * i];
          v[q + 1] = h.normal[2 * i + 1];
        }
        const j = rot.row[k];
        for (let p = K.colPtr[j] + 1; p < K.colPtr[j + 1]; p++) {
          const r = K.rowIndex[p];
          const kv = rotValues[p];
          for (let m = 0; m < nrhs; m++) if (v[m] !== 0) B[m * n + r] -= kv * v[m];
          modValues[p] = 0;
        }
        for (let e = rot.leftPtr[k]; e < rot.leftPtr[k + 1]; e++) {
          const p = rot.leftPos[e];
          const col = rot.leftCol[e];
          const kv = rotValues[p];
          for (let m = 0; m < nrhs; m++) if (v[m] !== 0) B[m * n + col] -= kv * v[m];
          modValues[p] = 0;
        }
      }
    }
    // prescribed rows last: the subtractions above may have touched them
    for (let pi = 0; pi < pins.length; pi++) {
      const h = holes[pi];
      const q = rhsOfPin[pi];
      for (let i = 0; i < h.nodes.length; i++) {
        const k = first[pi] + i;
        if (!active[k]) continue;
        const j = rot.row[k];
        for (let m = 0; m < nrhs; m++) B[m * n + j] = 0;
        B[j] = -diag[k] * gap0[k];
        if (q >= 0) {
          B[q * n + j] = diag[k] * h.normal[2 * i];
          B[(q + 1) * n + j] = diag[k] * h.normal[2 * i + 1];
        }
      }
    }
    const X = solver.solve(modValues, B, nrhs);

    // Contact forces of each solution at the active nodes: (K_rot x - f_rot) on the normal rows,
    // row by row (the column below the diagonal and the entries left of it).
    const lam = new Float64Array(nrhs * nPairs);
    for (let k = 0; k < nPairs; k++) {
      if (!active[k]) continue;
      const j = rot.row[k];
      for (let m = 0; m < nrhs; m++) {
        const o = m * n;
        let sum = m === 0 ? -fRot[j] : 0;
        for (let p = K.colPtr[j]; p < K.colPtr[j + 1]; p++) sum += rotValues[p] * X[o + K.rowIndex[p]];
        for (let e = rot.leftPtr[k]; e < rot.leftPtr[k + 1]; e++) sum += rotValues[rot.leftPos[e]] * X[o + rot.leftCol[e]];
        lam[m * nPairs + k] = sum;
      }
    }
    // Equilibrium of the pushed pins fixes their displacements.
    const P = loadPins.length;
    delta = new Float64Array(2 * P);
    if (P > 0) {
      const M = new Float64Array(4 * P * P);
      const rhs = new Float64Array(2 * P);
      loadPins.forEach((pi, a) => {
        const h = holes[pi];
        rhs[2 * a] = pins[pi].force[0];
        rhs[2 * a + 1] = pins[pi].force[1];
        for (let i = 0; i < h.nodes.length; i++) {
          const k = first[pi] + i;
          if (!active[k]) continue;
          const nx = h.normal[2 * i];
          const ny = h.normal[2 * i + 1];
          rhs[2 * a] -= nx * lam[k];
          rhs[2 * a + 1] -= ny * lam[k];
          for (let b = 0; b < 2 * P; b++) {
            const l = lam[(1 + b) * nPairs + k];
            M[2 * a * 2 * P + b] += nx * l;
            M[(2 * a + 1) * 2 * P + b] += ny * l;
          }
        }
      });
      delta = solveSymmetricSmall(M, 2 * P, rhs).x;
    }
    u = X.slice(0, n);
    for (let b = 0; b < 2 * P; b++) {
      const xb = X.subarray((1 + b) * n, (2 + b) * n);
      for (let i = 0; i < n; i++) u[i] += delta[b] * xb[i];
    }
    // Forces, gaps and the tolerances of this iterate.
    let total = 0;
    let moveScale = 0;
    for (let pi = 0; pi < pins.length; pi++) {
      const h = holes[pi];
      const q = rhsOfPin[pi];
      const dx = q >= 0 ? delta[q - 1] : 0;
      const dy = q >= 0 ? delta[q] : 0;
      for (let i = 0; i < h.nodes.length; i++) {
        const k = first[pi] + i;
        let l = 0;
        if (active[k]) {
          l = lam[k];
          for (let b = 0; b < 2 * P; b++) l += delta[b] * lam[(1 + b) * nPairs + k];
        }
        lambda[k] = l;
        total += Math.abs(l);
        const un = u[rot.row[k]] - (dx * h.normal[2 * i] + dy * h.normal[2 * i + 1]);
        gap[k] = active[k] ? 0 : gap0[k] + un;
        moveScale = Math.max(moveScale, Math.abs(un), Math.abs(gap0[k]));
      }
    }
    tolF = 1e-9 * total;
    tolG = 1e-9 * moveScale;
    let changed = 0;
    for (let k = 0; k < nPairs; k++) {
      const next = active[k] ? (lambda[k] > -tolF ? 1 : 0) : gap[k] < -tolG ? 1 : 0;
      if (next !== active[k]) changed++;
      active[k] = next;
    }
    if (changed === 0) break;
    if (iterations === 1) {
      // A pushed pin started on the Hertz arc, which falls short as the arc widens (the
      // half-space estimate ignores the hole's curvature): the first update overshoots by about
      // as much, so it starts again half way between the two (measured on a lug with 1%
      // clearance: 21, 33, 31, 29 contact nodes became 21, 27, 29). The active-set iteration
      // converges from any start, so this only saves solves.
      holes.forEach((h, pi) => {
        if (bonded[pi] || !estimated[pi]) return;
        const [fx, fy] = pins[pi].force;
        const F = Math.hypot(fx, fy);
        let widest = 0;
        for (let i = 0; i < h.nodes.length; i++) {
          if (!active[first[pi] + i]) continue;
          const c = (h.normal[2 * i] * fx + h.normal[2 * i + 1] * fy) / F;
          widest = Math.max(widest, Math.acos(Math.max(-1, Math.min(1, c))));
        }
        if (widest > estimated[pi]) seed(pi, fx, fy, 0.5 * (widest + estimated[pi]));
      });
      // A fixed pin started bonded to its hole: start again on the estimated arc about the force it carries.
      holes.forEach((h, pi) => {
        if (!bonded[pi]) return;
        let rx = 0;
        let ry = 0;
        for (let i = 0; i < h.nodes.length; i++) {
          rx += lambda[first[pi] + i] * h.normal[2 * i];
          ry += lambda[first[pi] + i] * h.normal[2 * i + 1];
        }
        if (Math.hypot(rx, ry) > 0) seed(pi, rx, ry);
      });
    }
    if (iterations >= maxIterations) {
      throw new AnalysisError(
        `the contact of the pins did not settle in ${maxIterations} active-set iterations (${changed} hole nodes still changing between contact and no contact)`,
        'check the pins and supports: a part that can slide or turn on its pin without resistance has no single contact state',
      );
    }
  }

  // Back to x-y axes.
  const x = u.slice();
  for (let k = 0; k < nPairs; k++) {
    const j = rot.row[k];
    const un = u[j];
    const ut = u[j + 1];
    x[j] = rot.c[k] * un - rot.s[k] * ut;
    x[j + 1] = rot.s[k] * un + rot.c[k] * ut;
  }
  let bAll = B.slice(0, n);
  if (delta.length > 0) {
    bAll = bAll.slice();
    for (let b = 0; b < delta.length; b++) for (let i = 0; i < n; i++) bAll[i] += delta[b] * B[(1 + b) * n + i];
  }
  const stats = solver.stats(modValues, u, bAll);

  const out = pins.map((pin, pi): PinContact => {
    const h = holes[pi];
    const m = h.nodes.length;
    const q = rhsOfPin[pi];
    const res: PinContact = {
      pin,
      hole: h,
      active: active.slice(first[pi], first[pi] + m),
      force: lambda.slice(first[pi], first[pi] + m),
      pressure: new Float64Array(m),
      gap: gap.slice(first[pi], first[pi] + m),
      displacement: q >= 0 ? [delta[q - 1], delta[q]] : [0, 0],
      resultant: [0, 0],
    };
    for (let i = 0; i < m; i++) {
      res.pressure[i] = res.force[i] / (h.weight[i] * thickness);
      res.resultant[0] += res.force[i] * h.normal[2 * i];
      res.resultant[1] += res.force[i] * h.normal[2 * i + 1];
    }
    if (pin.role === 'load') {
      const F = Math.hypot(pin.force[0], pin.force[1]);
      const miss = Math.hypot(res.resultant[0] - pin.force[0], res.resultant[1] - pin.force[1]);
      if (!(miss <= 1e-8 * F)) {
        throw new AnalysisError(
          `the force of the pin in ${pin.label} (${pin.path}) cannot be carried by contact with its hole: the contact forces leave ${miss.toPrecision(3)} of it unbalanced`,
          'check the direction of the pin force against the hole',
        );
      }
    }
    return res;
  });
  return { x, stats, factor: null, pins: out, iterations, activeHistory: history, tolerance: { force: tolF, gap: tolG } };
}

/** What an analysis keeps of the pins: every pin of the model, and the contact when there was one. */
export interface PinsOfAnalysis {
  /** the bearing loads, rigid-pin loads and supports, checked */
  holes: PinHole[];
  /** the contact of the rigid pins, or null when the model has none */
  contact: { pins: PinContact[]; iterations: number; activeHistory: number[]; tolerance: { force: number; gap: number } } | null;
}

/** The centres of the fixed rigid pins: points held in x and y for the rigid-motion check. */
export function pinSupportCentres(pins: readonly PinHole[]): { x: number; y: number }[] {
  return pins.filter((p) => p.kind === 'rigid-pin' && p.role === 'support').map((p) => ({ x: p.cx, y: p.cy }));
}

/**
 * After a contact solve: the contact forces of pushed pins join the applied nodal forces `f` (they
 * are the load the pin delivers), and the hole nodes of fixed pins are marked held in `fixed` so
 * that the reaction sums count what those pins carry (at nodes out of contact it is zero).
 */
export function addContactForces(solution: ContactSolution, f: Float64Array, fixed: Uint8Array): void {
  for (const c of solution.pins) {
    const { nodes, normal } = c.hole;
    for (let i = 0; i < nodes.length; i++) {
      const nd = nodes[i];
      if (c.pin.role === 'support') {
        fixed[2 * nd] = 1;
        fixed[2 * nd + 1] = 1;
      } else {
        f[2 * nd] += c.force[i] * normal[2 * i];
        f[2 * nd + 1] += c.force[i] * normal[2 * i + 1];
      }
    }
  }
}

/**
 * The half-angle of the contact arc a pin pushed with force F would have by the Hertz estimate
 * for conforming cylinders (see solveContact's comment), at most 90 degrees; 90 degrees for a
 * close fit.
 */
function estimatedHalfAngle(pin: PinHole, F: number, material: { thickness: number; planeModulus: number }): number {
  const Rh = pin.radius;
  const Rp = Rh - pin.clearance / 2;
  if (!(Rh > Rp)) return Math.PI / 2;
  const R = (Rp * Rh) / (Rh - Rp);
  const a = Math.sqrt((4 * (F / material.thickness) * R) / (Math.PI * material.planeModulus));
  return Math.min(Math.PI / 2, a / Rh);
}
