/**
 * One analysis, end to end: model -> domain -> mesh -> loads and supports -> stiffness ->
 * sparse Cholesky -> recovered stresses -> peak, nominal section, Kt. This file only wires the
 * stages together; each stage lives in its own module and knows nothing of the ones after it.
 */
import { totalmem } from 'node:os';
import { buildDomain, type Domain } from '../geometry/domain.js';
import { traceLoops } from '../geometry/validate.js';
import { validateDomain } from '../geometry/validate.js';
import { assembleSystem, internalForces, meshNodeGraph } from '../fem/assemble.js';
import { compileLoads, compileSupports, type CompiledLoads, type ExtraTraction } from '../fem/boundary-conditions.js';
import { constitutiveMatrix, type PlaneState } from '../fem/material.js';
import { checkRigidMotion } from '../fem/rigid.js';
import { forceMoments, type PinHole } from '../fem/pins.js';
import { addContactForces, pinSupportCentres, solveContact, type ContactSolution, type PinsOfAnalysis } from '../fem/contact.js';
import { generateMesh, triangleMinAngle } from '../mesh/generate.js';
import type { SizeField } from '../mesh/sizefield.js';
import type { HardPoint } from '../mesh/boundary.js';
import type { SizeLimit } from '../mesh/background.js';
import type { Mesh, MeshStats } from '../mesh/types.js';
import { AnalysisError, ModelError } from '../model/errors.js';
import { nearestBoundaryPoint } from '../geometry/project.js';
import type { Model, StressMeasure } from '../model/schema.js';
import { resolveUnits, type ResolvedUnits } from '../model/units.js';
import { findPeak, outOfPlaneFactor, type Peak } from '../post/peak.js';
import { recoverNodalStress, type KnownTraction } from '../post/recover.js';
import { findSections, sectionAlong, type Cut } from '../post/section.js';
import { sampleElementStresses } from '../post/stress.js';
import { estimateAnalysisBytes } from '../mesh/estimate.js';
import { IncompleteCholeskyError, PcgError, SolverPivotError, solveSpd, type SolveStats } from '../solve/index.js';

export interface AnalyseOptions {
  /** overrides the model's mesh.element */
  element?: 'linear' | 'quadratic';
  /** overrides the model's results.measure */
  measure?: StressMeasure;
  /** multiplies every mesh size (global and at raisers); 1 = the model's own */
  sizeFactor?: number;
  /** refuse a model whose analysis is estimated to need more memory (bytes; default 60% of the machine's) */
  maxMemoryBytes?: number;
}

export interface NominalInfo {
  stress: number;
  kind: 'tension' | 'bending';
  definition: string;
  section: Cut;
}

export interface Analysis {
  model: Model;
  units: ResolvedUnits;
  state: PlaneState;
  domain: Domain;
  mesh: Mesh;
  meshStats: MeshStats;
  solveStats: SolveStats;
  /** displacements, 2 per node */
  u: Float64Array;
  /** recovered nodal stresses, sxx, syy, sxy per node */
  stress: Float64Array;
  /** nodal forces K u */
  nodalForce: Float64Array;
  szzFactor: number;
  /** the constitutive matrix used */
  D: Float64Array;
  peak: Peak;
  direction: [number, number];
  net: NominalInfo;
  gross: NominalInfo;
  kt: { net: number; gross: number };
  load: { fx: number; fy: number; m: number; items: CompiledLoads['items']; remote?: CompiledLoads['remote'] };
  reaction: { fx: number; fy: number; m: number };
  /** |applied + reactions| relative to the applied load */
  equilibriumError: number;
  timeMs: { mesh: number; assemble: number; solve: number; recover: number; total: number };
  warnings: string[];
  /** pins in holes (bearing loads, rigid pins) and the contact of the rigid ones; null without pins */
  pins: PinsOfAnalysis | null;
}

/** What every mesh of one model shares: the model checked, its domain, units and options. */
export interface PreparedModel {
  model: Model;
  units: ResolvedUnits;
  state: PlaneState;
  measure: StressMeasure;
  domain: Domain;
  order: 1 | 2;
  hardPoints: HardPoint[];
  /** traction fields given in code, beside the model's loads (closed-form verification cases) */
  extraTractions?: ExtraTraction[];
  maxMemoryBytes: number;
}

export function prepareModel(model: Model, opts: AnalyseOptions = {}): PreparedModel {
  const units = resolveUnits(model.units);
  const state: PlaneState = model.state ?? 'plane-stress';
  const measure: StressMeasure = opts.measure ?? model.results?.measure ?? 'max-principal';
  const domain = buildDomain(model.geometry);
  validateDomain(domain);
  const order = (opts.element ?? model.mesh?.element ?? 'quadratic') === 'linear' ? 1 : 2;
  // Pins must sit on a node: they become hard points of the boundary discretisation.
  const hardPoints = model.supports.flatMap((s, i) => {
    if (s.type !== 'pin') return [];
    const b = nearestBoundaryPoint(domain, s.at[0], s.at[1]);
    if (b.distance > 1e-3 * domain.scale) {
      throw new ModelError(`supports[${i}].at`, `the pin at (${s.at.join(', ')}) is ${b.distance.toPrecision(3)} from the boundary; pins must lie on it`, `the nearest boundary point is (${b.x.toPrecision(6)}, ${b.y.toPrecision(6)}) on ${domain.edges[b.edge].label}`);
    }
    return [{ edge: b.edge, t: b.t }];
  });
  // Sizes below the geometric tolerance cannot be meshed (points would merge).
  for (const key of ['size', 'raiserSize'] as const) {
    const v = model.mesh?.[key];
    if (v !== undefined && v < 1e-6 * domain.scale) {
      throw new ModelError(`mesh.${key}`, `mesh.${key} = ${v} is below a millionth of the part size (${domain.scale.toPrecision(4)}): it cannot be meshed`, `use a size of at least ${(1e-4 * domain.scale).toPrecision(2)}`);
    }
  }
  const maxMemoryBytes = opts.maxMemoryBytes ?? 0.6 * totalmem();
  return { model, units, state, measure, domain, order, hardPoints, maxMemoryBytes };
}

/** One analysis on the model's own mesh (scaled by opts.sizeFactor). */
export function analyseModel(model: Model, opts: AnalyseOptions = {}): Analysis {
  return analyseOnMesh(prepareModel(model, opts), { sizeFactor: opts.sizeFactor });
}

/** Meshes (with the given scaling and size limit), solves and evaluates. */
export function analyseOnMesh(prep: PreparedModel, meshing: { sizeFactor?: number; limit?: SizeLimit } = {}): Analysis {
  const t0 = performance.now();
  const warnings: string[] = [];
  const { model, units, state, measure, domain, order, hardPoints } = prep;
  const ms = model.mesh ?? {};
  const meshGen = generateMesh(domain, {
    order,
    size: ms.size,
    raiserSize: ms.raiserSize,
    grading: ms.grading,
    minAngleDeg: ms.minAngle,
    sizeFactor: meshing.sizeFactor ?? 1,
    limit: meshing.limit,
    hardPoints,
    maxBytes: prep.maxMemoryBytes,
  });
  const { mesh, stats: meshStats } = meshGen;
  const t1 = performance.now();

  const supports = compileSupports(model, domain, mesh, warnings);
  const loads = compileLoads(model, domain, mesh, supports, warnings, prep.extraTractions);
  // --- pins in holes: a fixed rigid pin holds the part at the hole's centre (src/fem/contact.ts) ---
  const contactPins = supports.pins.filter((p) => p.kind === 'rigid-pin');
  checkRigidMotion(mesh, supports.constraints.fixed, domain.scale, pinSupportCentres(contactPins));
  // --- end of pins ---
  const D = constitutiveMatrix(model.material.E, model.material.nu, state);
  const nodeGraph = meshNodeGraph(mesh);
  const system = assembleSystem(mesh, D, model.thickness, loads.f, supports.constraints, nodeGraph);
  const t2 = performance.now();

  let solved;
  let contact: ContactSolution | null = null;
  try {
    // The direct factor may use what the memory limit leaves beside the rest of the analysis;
    // beyond that the solver switches to conjugate gradients.
    const maxFactorBytes = Math.max(0, prep.maxMemoryBytes - estimateAnalysisBytes(meshStats.triangles, mesh.order as 1 | 2, 'iterative'));
    const solveOptions = { coords: mesh.nodes, nodeAdjacency: nodeGraph, dofsPerNode: 2, fullDofOfRow: system.freeDof, maxFactorBytes };
    // --- pins in holes: rigid pins in frictionless contact replace the linear solve ---
    const planeModulus = state === 'plane-strain' ? model.material.E / (1 - model.material.nu ** 2) : model.material.E;
    if (contactPins.length > 0) solved = contact = solveContact(mesh, system, contactPins, { thickness: model.thickness, planeModulus }, solveOptions);
    else solved = solveSpd(system.K, system.f, solveOptions);
    // --- end of pins ---
  } catch (err) {
    if (err instanceof SolverPivotError) {
      const dof = system.freeDof[err.originalIndex];
      const node = dof >> 1;
      throw new AnalysisError(
        `the stiffness matrix is singular near (${mesh.nodes[2 * node].toPrecision(5)}, ${mesh.nodes[2 * node + 1].toPrecision(5)}) (${dof & 1 ? 'y' : 'x'} direction): part of the model can move without straining`,
        'check the supports: every piece of the part must be held against moving in x, in y and rotating',
      );
    }
    if (err instanceof PcgError || err instanceof IncompleteCholeskyError) {
      throw new AnalysisError(
        `the model is too large for the direct solver's memory, and the iterative solver failed: ${err.message}`,
        err instanceof PcgError && err.reason === 'not-converged'
          ? 'coarsen the mesh (mesh.size, mesh.raiserSize) or run on a machine with more memory'
          : 'check the supports (the stiffness matrix may not be positive definite), or coarsen the mesh',
      );
    }
    throw err;
  }
  const nDof = 2 * mesh.nNodes;
  const u = new Float64Array(nDof);
  for (let d = 0; d < nDof; d++) u[d] = supports.constraints.value[d];
  for (let i = 0; i < system.freeDof.length; i++) u[system.freeDof[i]] = solved.x[i];
  for (let d = 0; d < nDof; d++) {
    if (!Number.isFinite(u[d])) throw new AnalysisError('the solution is not finite: the stiffness matrix is too badly conditioned to solve', 'check for parts joined by a very thin ligament or extreme dimensions');
  }
  // --- pins in holes: pushed pins' contact forces are applied loads, fixed pins' are reactions ---
  if (contact) addContactForces(contact, loads.f, supports.constraints.fixed);
  const pins: PinsOfAnalysis | null =
    supports.pins.length === 0 ? null : { holes: supports.pins, contact: contact && { pins: contact.pins, iterations: contact.iterations, activeHistory: contact.activeHistory, tolerance: contact.tolerance } };
  // --- end of pins ---
  const t3 = performance.now();

  const r = internalForces(mesh, D, model.thickness, u);
  const applied = resultant(mesh, loads.f);
  const reactionVec = new Float64Array(nDof);
  for (let d = 0; d < nDof; d++) if (supports.constraints.fixed[d]) reactionVec[d] = r[d] - loads.f[d];
  const reaction = resultant(mesh, reactionVec);
  let fAbs = 0;
  for (let d = 0; d < nDof; d++) fAbs += Math.abs(loads.f[d]);
  const equilibriumError = Math.hypot(applied.fx + reaction.fx, applied.fy + reaction.fy) / (fAbs || 1);

  const samples = sampleElementStresses(mesh, D, u);
  // Known tractions: the applied ones, zero on free edges, unknown where a support acts.
  const zero: KnownTraction = (_x, _y, _nx, _ny, out) => ((out[0] = 0), (out[1] = 0));
  const known = domain.edges.map((_e, i): KnownTraction => (supports.symmetry[i] ? 'symmetry' : supports.supported[i] ? null : (loads.edgeTraction[i] ?? zero)));
  const stress = recoverNodalStress(mesh, samples, known);
  for (let i = 0; i < stress.length; i++) {
    if (!Number.isFinite(stress[i])) throw new AnalysisError('the recovered stresses are not finite', 'check the model for extreme dimensions');
  }
  const szzFactor = outOfPlaneFactor(state, model.material.nu);
  const peak = findPeak(mesh, domain, stress, measure, szzFactor);

  // Load direction and kind of nominal stress.
  const bendingOnly = model.loads.length > 0 && !prep.extraTractions?.length && model.loads.every((l) => l.type === 'moment');
  let dir: [number, number];
  if (model.results?.direction) {
    const [a, b] = model.results.direction;
    const l = Math.hypot(a, b);
    dir = [a / l, b / l];
  } else {
    dir = loadDirection(loads, domain, bendingOnly, mesh, supports.pins);
  }
  const kind = bendingOnly ? 'bending' : 'tension';
  const trace = traceLoops(domain);
  const sectionInput = { trace, nodes: mesh.nodes, nodalForce: r, thickness: model.thickness, dx: dir[0], dy: dir[1], kind, peakX: peak.x, peakY: peak.y, scale: domain.scale } as const;
  let netCut: Cut;
  let grossCut: Cut;
  const userSection = model.results?.section;
  const auto = findSections(sectionInput);
  if (userSection && userSection !== 'auto') {
    netCut = sectionAlong(sectionInput, userSection.from[0], userSection.from[1], userSection.to[0], userSection.to[1]);
    if (!(netCut.length > 0)) throw new AnalysisError('the nominal section given in results.section crosses no material', 'give a cut from one edge of the part to the other');
  } else netCut = auto.net;
  grossCut = auto.gross;
  const bendingWord = 'M c / I over the cut (6 M / (t d^2) for a solid section)';
  const net: NominalInfo = {
    stress: netCut.stress,
    kind,
    section: netCut,
    definition:
      kind === 'tension'
        ? userSection && userSection !== 'auto'
          ? 'F / A on the given section: F the force through it, A = thickness x material length'
          : 'F / A_net: F the force through the net section, A_net = thickness x material length of the cut across the load with the least material'
        : `bending: ${bendingWord}, on the cut with the least material`,
  };
  let gross: NominalInfo;
  if (loads.remote && kind === 'tension') {
    const { sxx, syy, sxy } = loads.remote;
    const s1 = principalMax(sxx, syy, sxy);
    grossCut = { ...grossCut, stress: s1 };
    gross = { stress: s1, kind, section: grossCut, definition: 'the remote stress: the largest principal value of the applied remote stress state' };
  } else {
    gross = {
      stress: grossCut.stress,
      kind,
      section: grossCut,
      definition: kind === 'tension' ? 'F / A_gross on the widest cut across the load that carries it' : `bending: ${bendingWord}, on the widest cut`,
    };
  }
  const peakMag = measure === 'min-principal' ? -peak.stress : peak.stress;
  const kt = { net: peakMag / Math.abs(net.stress), gross: peakMag / Math.abs(gross.stress) };
  if (peak.atSharpCorner) {
    warnings.push(`the peak sits on a sharp re-entrant corner (${peak.feature}): the elastic stress there is infinite in theory and grows as the mesh is refined, so this Kt is not a converged value; model the real corner radius`);
  }
  const y = model.material.yield;
  if (y !== undefined && Math.abs(peak.stress) > y) {
    warnings.push(`the elastic peak stress ${peak.stress.toPrecision(4)} ${units.stress} exceeds the yield strength ${y} ${units.stress}: local plastic flow is expected there and the linear result overstates the real peak stress`);
  }
  warnings.push(...checkResolution(mesh, meshGen.size, netCut, peak));
  if (model.supports.length > 0 && model.supports.every((s) => s.type === 'pin')) {
    const carried = Math.hypot(reaction.fx, reaction.fy);
    if (carried > 1e-6 * fAbs) {
      warnings.push(`the loads do not balance: the pins, meant only to stop rigid motion, carry ${carried.toPrecision(3)} ${units.force}; check the loads or hold the part with real supports`);
    }
  }
  if (equilibriumError > 1e-6) warnings.push(`applied loads and reactions balance only to ${equilibriumError.toExponential(2)} of the load`);
  const t4 = performance.now();
  return {
    model,
    units,
    state,
    domain,
    mesh,
    meshStats,
    solveStats: solved.stats,
    u,
    stress,
    nodalForce: r,
    szzFactor,
    D,
    peak,
    direction: dir,
    net,
    gross,
    kt,
    load: { ...applied, items: loads.items, remote: loads.remote },
    reaction,
    equilibriumError,
    timeMs: { mesh: t1 - t0, assemble: t2 - t1, solve: t3 - t2, recover: t4 - t3, total: t4 - t0 },
    warnings,
    pins,
  };
}

/**
 * Warnings about the mesh where it matters: a net-section ligament under two elements wide (the
 * stress across it is then poorly resolved), and badly shaped elements at the peak.
 */
function checkResolution(mesh: Mesh, size: SizeField, net: Cut, peak: Peak): string[] {
  const out: string[] = [];
  for (const [x0, y0, x1, y1] of net.intervals) {
    const L = Math.hypot(x1 - x0, y1 - y0);
    const h = size.at(0.5 * (x0 + x1), 0.5 * (y0 + y1));
    if (L > 0 && L / h < 2) {
      out.push(`the ligament from (${x0.toPrecision(4)}, ${y0.toPrecision(4)}) to (${x1.toPrecision(4)}, ${y1.toPrecision(4)}) is only about ${(L / h).toFixed(1)} elements wide; give mesh.size or mesh.raiserSize a smaller value`);
    }
  }
  const per = mesh.order === 2 ? 6 : 3;
  let worst = 180;
  for (let e = 0; e < mesh.nElements; e++) {
    let has = false;
    for (let i = 0; i < per; i++) if (mesh.elements[per * e + i] === peak.node) has = true;
    if (has) worst = Math.min(worst, triangleMinAngle(mesh, per, e));
  }
  if (worst < 20 && !peak.atSharpCorner) out.push(`an element at the peak has an angle of only ${worst.toFixed(1)} degrees; the peak stress there is less reliable`);
  return out;
}

function principalMax(sxx: number, syy: number, sxy: number): number {
  const c = 0.5 * (sxx + syy);
  const r = Math.hypot(0.5 * (sxx - syy), sxy);
  return Math.abs(c + r) >= Math.abs(c - r) ? c + r : c - r;
}

function resultant(mesh: Mesh, f: Float64Array): { fx: number; fy: number; m: number } {
  let fx = 0;
  let fy = 0;
  let m = 0;
  for (let i = 0; i < mesh.nNodes; i++) {
    fx += f[2 * i];
    fy += f[2 * i + 1];
    m += mesh.nodes[2 * i] * f[2 * i + 1] - mesh.nodes[2 * i + 1] * f[2 * i];
  }
  return { fx, fy, m };
}

/**
 * The load axis: for a remote stress, its largest principal direction; for moments only, the
 * normal of the loaded edge (the beam axis); otherwise the dominant direction of the applied
 * nodal forces (the leading eigenvector of sum f f^T, so loads pulling both ends agree).
 */
function loadDirection(loads: CompiledLoads, domain: Domain, bendingOnly: boolean, mesh: Mesh, pins: readonly PinHole[]): [number, number] {
  if (loads.remote) {
    const { sxx, syy, sxy } = loads.remote;
    const s1 = principalMax(sxx, syy, sxy);
    // Eigenvector of [sxx sxy; sxy syy] for s1.
    let vx = sxy;
    let vy = s1 - sxx;
    if (Math.hypot(vx, vy) < 1e-12 * (Math.abs(s1) + 1e-300)) [vx, vy] = Math.abs(sxx) >= Math.abs(syy) ? [1, 0] : [0, 1];
    const l = Math.hypot(vx, vy);
    return [vx / l, vy / l];
  }
  if (bendingOnly) {
    const item = loads.items.find((i) => i.edges.length > 0);
    if (item) {
      const c = domain.edges[item.edges[0]].curve;
      if (c.kind === 'line') {
        const l = Math.hypot(c.x1 - c.x0, c.y1 - c.y0);
        return [(c.y1 - c.y0) / l, -(c.x1 - c.x0) / l];
      }
    }
  }
  // Every applied nodal force counts, so loads that pull both ends (and cancel as a
  // resultant) still give their axis.
  // (a pin's forces fanned out over its hole count as their resultant: src/fem/pins.ts)
  const [a, b, c] = forceMoments(loads.f, mesh, pins);
  const tr = 0.5 * (a + c);
  const rr = Math.hypot(0.5 * (a - c), b);
  const lam = tr + rr;
  let vx = b;
  let vy = lam - a;
  if (Math.hypot(vx, vy) < 1e-12 * (lam + 1e-300)) [vx, vy] = a >= c ? [1, 0] : [0, 1];
  const l = Math.hypot(vx, vy);
  return [vx / l, vy / l];
}
