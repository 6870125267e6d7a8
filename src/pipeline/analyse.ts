/**
 * One analysis, end to end: model -> domain -> mesh -> loads and supports -> stiffness ->
 * sparse Cholesky -> recovered stresses -> the stress raisers' peaks, sections and Kt. This file
 * only wires the stages together; each stage lives in its own module and knows nothing of the
 * ones after it.
 */
import { totalmem } from 'node:os';
import { buildDomain, type Domain } from '../geometry/domain.js';
import type { ImportedDrawing } from '../geometry/import/index.js';
import { validateDomain } from '../geometry/validate.js';
import { assembleSystem, internalForces, type FeSystem } from '../fem/assemble.js';
import { compileLoads, compileSupports, type CompiledLoads, type CompiledSupports, type ExtraTraction } from '../fem/boundary-conditions.js';
import { classifyEdges } from '../fem/edge-roles.js';
import { findMirrorPlanes, type MirrorPlane } from '../fem/mirror-planes.js';

export type { MirrorPlane };
import { constitutiveMatrix, type PlaneState } from '../fem/material.js';
import { checkRigidMotion } from '../fem/rigid.js';
import { expandSolution } from '../fem/expand.js';
import { addContactForces, pinSupportCentres, solveContact, type ContactHint, type ContactSolution, type PinsOfAnalysis } from '../fem/contact.js';
import { generateMesh } from '../mesh/generate.js';
import { checkMeshSizes, placePinHardPoints } from '../mesh/model-points.js';
import type { HardPoint } from '../mesh/boundary.js';
import type { SizeLimit } from '../mesh/background.js';
import { buildNodeAdjacency } from '../mesh/topology.js';
import type { Mesh, MeshStats } from '../mesh/types.js';
import { AnalysisError, InternalError } from '../model/errors.js';
import { refuseLoadCases, splitLoadCases } from '../model/load-cases.js';
import type { Model, StressMeasure } from '../model/schema.js';
import { resolveUnits, type ResolvedUnits } from '../model/units.js';
import { evaluateMesh, type MeshEvaluation } from '../post/evaluate.js';
import type { RaiserNominalInput } from '../post/kt.js';
import { findPeak, outOfPlaneFactor, type Peak } from '../post/peak.js';
import { RaiserCutFinder } from '../post/raiser-cut.js';
import { findRaisers, type Raiser } from '../post/raisers.js';
import { resolveRaiserSettings } from '../post/raiser-settings.js';
import { addBearingStresses } from '../post/bearing-nominal.js';
import { describeKnownTractions, recoverNodalStress } from '../post/recover.js';
import { computeBalance, checkBalance } from '../post/balance.js';
import { checkResolution } from '../post/resolution.js';
import { checkYield } from '../post/yield.js';
import { findSingularCandidates, type SingularCandidate } from '../post/singular.js';
import { sampleElementStresses } from '../post/stress.js';
import { estimateAnalysisBytes } from '../mesh/estimate.js';
import { IncompleteCholeskyError, PcgError, SolverPivotError, SolverThreads, solveSpd, type SolveStats } from '../solve/index.js';

export interface AnalyseOptions {
  /** overrides the model's mesh.element */
  element?: 'linear' | 'quadratic';
  /** overrides the model's results.measure */
  measure?: StressMeasure;
  /** multiplies every mesh size (global and at raisers); 1 = the model's own */
  sizeFactor?: number;
  /** refuse a model whose analysis is estimated to need more memory (bytes; default 60% of the machine's) */
  maxMemoryBytes?: number;
  /** the drawing the geometry comes from (`"geometry": { "from": ... }`), as loaded beside the model (src/pipeline/load.ts) */
  drawing?: ImportedDrawing;
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
  /** the highest value of the measure anywhere in the part */
  peak: Peak;
  /** the stress raisers of the part (the same on every mesh of a model) */
  raisers: readonly Raiser[];
  /** the raiser the model names as the headline (results.raiser), or -1 */
  named: number;
  /** the raisers the model asks to report (results.raisers), or null for all */
  reported: ReadonlySet<number> | null;
  /** where the stress may be singular */
  candidates: SingularCandidate[];
  /** each raiser's peak, section, nominal stresses and Kt on this mesh */
  evaluation: MeshEvaluation;
  load: { fx: number; fy: number; m: number; items: CompiledLoads['items']; remote?: CompiledLoads['remote'] };
  /** per support of the model: the domain edges the finite element stage holds (none for a point support) */
  supportEdges: number[][];
  reaction: { fx: number; fy: number; m: number };
  /** |applied + reactions| relative to the applied load */
  equilibriumError: number;
  timeMs: { mesh: number; assemble: number; solve: number; recover: number; total: number };
  warnings: string[];
  /** pins in holes (bearing loads, rigid pins) and the contact of the rigid ones; null without pins */
  pins: PinsOfAnalysis | null;
  /**
   * the mirror planes of a half or quarter model: the lines x = at (axis 'x') or y = at (axis
   * 'y') that its symmetry supports hold, with the domain edges on each (rollers acting as
   * mirrors are not among them: they stand for real supports, not for a part cut in half)
   */
  mirrorPlanes: MirrorPlane[];
  /** the name of the load case this analysis is of (model.loadCases); absent for a model's plain loads */
  loadCase?: string;
  /** with several load cases on this mesh: how many, and the numeric factorisations of the stiffness they shared (1 direct, 0 iterative) */
  sharedSolve?: { cases: number; factorisations: number };
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
  /** the remote stress state those fields tend to far away, for Kt against it */
  extraRemote?: { sxx: number; syy: number; sxy: number };
  maxMemoryBytes: number;
  /** the stress raisers found in the geometry */
  raisers: Raiser[];
  /** the raiser the model names as the headline (results.raiser), or -1 */
  named: number;
  /** the raisers to report (results.raisers), or null for all */
  reported: Set<number> | null;
  /** per raiser index, a nominal section or stress the model gives for it */
  given: Map<number, RaiserNominalInput>;
  /** finds the raisers' net sections; keeps what it found across the meshes of a series */
  finder: RaiserCutFinder;
  /** the name of the load case this is prepared for (prepareLoadCases); absent for a model's plain loads */
  loadCase?: string;
}

export function prepareModel(model: Model, opts: AnalyseOptions = {}): PreparedModel {
  const units = resolveUnits(model.units);
  const state: PlaneState = model.state ?? 'plane-stress';
  const measure: StressMeasure = opts.measure ?? model.results?.measure ?? 'max-principal';
  const domain = buildDomain(model.geometry, opts.drawing);
  validateDomain(domain);
  const order = (opts.element ?? model.mesh?.element ?? 'quadratic') === 'linear' ? 1 : 2;
  const hardPoints = placePinHardPoints(domain, model.supports);
  checkMeshSizes(domain, model.mesh);
  const maxMemoryBytes = opts.maxMemoryBytes ?? 0.6 * totalmem();
  const raisers = findRaisers(domain);
  const { named, reported, given } = resolveRaiserSettings(model, domain, raisers);
  const finder = new RaiserCutFinder(domain, model.thickness);
  return { model, units, state, measure, domain, order, hardPoints, maxMemoryBytes, raisers, named, reported, given, finder };
}

/**
 * One prepared model per load case (src/model/load-cases.ts): the domain, raisers and settings
 * are the shared ones; each case has its own loads and its own net-section finder (a cut found
 * across one case's flow of stress is no answer for another's). A model of plain loads gives
 * back the prepared model itself.
 */
export function prepareLoadCases(prep: PreparedModel): PreparedModel[] {
  const split = splitLoadCases(prep.model);
  if (split.length === 1 && split[0].name === null) return [prep];
  return split.map((c) => ({ ...prep, model: c.model, loadCase: c.name ?? undefined, finder: new RaiserCutFinder(prep.domain, prep.model.thickness) }));
}

/** One analysis on the model's own mesh (scaled by opts.sizeFactor). */
export function analyseModel(model: Model, opts: AnalyseOptions = {}): Analysis {
  refuseLoadCases(model, 'an analysis of one case');
  return analyseOnMesh(prepareModel(model, opts), { sizeFactor: opts.sizeFactor });
}

/** Every load case of the model (one for plain loads) on the model's own mesh, factorised once. */
export function analyseModelCases(model: Model, opts: AnalyseOptions = {}): Analysis[] {
  return analyseCasesOnMesh(prepareLoadCases(prepareModel(model, opts)), { sizeFactor: opts.sizeFactor });
}

/** Meshes (with the given scaling and size limit), solves and evaluates. */
export function analyseOnMesh(prep: PreparedModel, meshing: MeshingOptions = {}): Analysis {
  return analyseCasesOnMesh([prep], meshing)[0];
}

/** How analyseOnMesh meshes: the scaling of the model's sizes, a size limit, where pins in contact start. */
export interface MeshingOptions {
  sizeFactor?: number;
  limit?: SizeLimit;
  contactHints?: ReadonlyMap<string, ContactHint>;
}

/**
 * The load cases of one model (prepareLoadCases) on one mesh: the mesh, the supports and the
 * stiffness are built once from the first case, the stiffness is factorised once, and every
 * case's right-hand side is solved with that factor (the stiffness does not depend on the
 * loads); then each case is evaluated on its own. One case is exactly analyseOnMesh. Pins in
 * contact change the matrix per load, so they are refused with several cases (the model
 * checks refuse them first: src/model/load-cases.ts).
 */
export function analyseCasesOnMesh(cases: readonly PreparedModel[], meshing: MeshingOptions = {}): Analysis[] {
  const t0 = performance.now();
  const warnings: string[] = [];
  const prep = cases[0];
  const { model, domain, order, hardPoints } = prep;
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
  const caseWarnings = cases.map(() => [] as string[]);
  const loads = cases.map((c, k) => compileLoads(c.model, domain, mesh, supports, caseWarnings[k], c.extraTractions));
  // --- pins in holes: a fixed rigid pin holds the part at the hole's centre (src/fem/contact.ts) ---
  const contactPins = supports.pins.filter((p) => p.kind === 'rigid-pin');
  checkRigidMotion(mesh, supports.constraints.fixed, domain.scale, pinSupportCentres(contactPins));
  if (cases.length > 1 && supports.pins.length > 0) throw new InternalError('analyseCasesOnMesh: pins in holes reached several load cases (the model checks refuse them)');
  // --- end of pins ---
  const D = constitutiveMatrix(model.material.E, model.material.nu, prep.state);
  const nodeGraph = buildNodeAdjacency(mesh);
  const system = assembleSystem(mesh, D, model.thickness, loads[0].f, supports.constraints, nodeGraph);
  const rhs = stackRightHandSides(system, loads.map((l) => l.f));
  const t2 = performance.now();

  let solved;
  let contact: ContactSolution | null = null;
  // the solver's second thread, kept for every solve of this mesh (the contact iterations) and stopped after them
  const workers = new SolverThreads();
  try {
    // The direct factor may use what the memory limit leaves beside the rest of the analysis;
    // beyond that the solver switches to conjugate gradients.
    const maxFactorBytes = Math.max(0, prep.maxMemoryBytes - estimateAnalysisBytes(meshStats.triangles, mesh.order as 1 | 2, 'iterative'));
    const solveOptions = { coords: mesh.nodes, nodeAdjacency: nodeGraph, dofsPerNode: 2, fullDofOfRow: system.freeDof, maxFactorBytes, workers };
    // --- pins in holes: rigid pins in frictionless contact replace the linear solve ---
    const planeModulus = prep.state === 'plane-strain' ? model.material.E / (1 - model.material.nu ** 2) : model.material.E;
    if (contactPins.length > 0) solved = contact = solveContact(mesh, system, contactPins, { thickness: model.thickness, planeModulus }, solveOptions, undefined, meshing.contactHints);
    else solved = solveSpd(system.K, rhs, solveOptions);
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
  } finally {
    workers.close();
  }
  const nFree = system.freeDof.length;
  const shared = cases.length > 1 || prep.loadCase !== undefined ? { cases: cases.length, factorisations: 'factor' in solved && solved.factor ? 1 : 0 } : undefined;
  const t3 = performance.now();
  return cases.map((c, k) => {
    const x = cases.length === 1 ? solved.x : solved.x.subarray(k * nFree, (k + 1) * nFree);
    const u = expandSolution(supports.constraints.value, system.freeDof, x);
    return evaluateCase(c, { mesh, meshGen, supports, loads: loads[k], contact, D, u, warnings: [...warnings, ...caseWarnings[k]], solveStats: solved.stats, shared, times: [t0, t1, t2, t3] });
  });
}

/**
 * The right-hand sides of the load cases on the free DOFs, one after another: the first is the
 * assembled system's own; each other case's loads restricted to the free DOFs plus what the
 * prescribed displacements add (the same for every case: the system's minus the first case's
 * loads, exactly zero without prescribed displacements).
 */
function stackRightHandSides(system: FeSystem, full: readonly Float64Array[]): Float64Array {
  if (full.length === 1) return system.f;
  const n = system.freeDof.length;
  const out = new Float64Array(n * full.length);
  out.set(system.f);
  for (let k = 1; k < full.length; k++) {
    for (let i = 0; i < n; i++) {
      const d = system.freeDof[i];
      out[k * n + i] = full[k][d] + (system.f[i] - full[0][d]);
    }
  }
  return out;
}

/** What one load case's evaluation takes from the shared mesh and solve. */
interface SolvedCase {
  mesh: Mesh;
  meshGen: ReturnType<typeof generateMesh>;
  supports: CompiledSupports;
  loads: CompiledLoads;
  contact: ContactSolution | null;
  D: Float64Array;
  u: Float64Array;
  warnings: string[];
  solveStats: SolveStats;
  shared: Analysis['sharedSolve'];
  /** performance.now() at the start, after meshing, after assembly, after the solve */
  times: [number, number, number, number];
}

/** Recovered stresses, peak, raisers' Kt and balance of one load case on a solved mesh. */
function evaluateCase(prep: PreparedModel, solvedCase: SolvedCase): Analysis {
  const { model, units, state, measure, domain } = prep;
  const { mesh, meshGen, supports, loads, contact, D, u, warnings } = solvedCase;
  const { stats: meshStats } = meshGen;
  const [t0, t1, t2, t3] = solvedCase.times;
  // --- pins in holes: pushed pins' contact forces are applied loads, fixed pins' are reactions ---
  if (contact) addContactForces(contact, loads.f, supports.constraints.fixed);
  const pins: PinsOfAnalysis | null =
    supports.pins.length === 0 ? null : { holes: supports.pins, contact: contact && { pins: contact.pins, iterations: contact.iterations, activeHistory: contact.activeHistory, tolerance: contact.tolerance } };
  // --- end of pins ---

  const r = internalForces(mesh, D, model.thickness, u);
  const balance = computeBalance(mesh, loads.f, r, supports.constraints.fixed);

  const samples = sampleElementStresses(mesh, D, u);
  const known = describeKnownTractions(supports, loads);
  const stress = recoverNodalStress(mesh, samples, known);
  for (let i = 0; i < stress.length; i++) {
    if (!Number.isFinite(stress[i])) throw new AnalysisError('the recovered stresses are not finite', 'check the model for extreme dimensions');
  }
  const szzFactor = outOfPlaneFactor(state, model.material.nu);
  const peak = findPeak(mesh, domain, stress, measure, szzFactor);
  const candidates = findSingularCandidates(domain, supports, loads, model.supports.map((_s, i) => `supports[${i}]`));
  const { mirrorEdge, edgeRole } = classifyEdges(supports, loads);
  const evaluation = evaluateMesh({
    domain,
    mesh,
    stress,
    nodalForce: r,
    measure,
    szzFactor,
    thickness: model.thickness,
    raisers: prep.raisers,
    candidates,
    finder: prep.finder,
    mirrorEdge,
    edgeRole,
    remote: loads.remote ?? prep.extraRemote,
    direction: model.results?.direction,
    given: addBearingStresses(prep.given, prep.raisers, pins, contact, model.thickness),
    always: [...(prep.named >= 0 ? [prep.named] : []), ...(prep.reported ?? [])],
    units: { stress: units.stress },
  });
  warnings.push(...checkYield(peak, model.material.yield, units.stress));
  warnings.push(...checkResolution(mesh, meshGen.size, evaluation, peak));
  warnings.push(...checkBalance(balance, model.supports.length > 0 && model.supports.every((s) => s.type === 'pin'), units.force));
  const t4 = performance.now();
  return {
    model,
    units,
    state,
    domain,
    mesh,
    meshStats,
    solveStats: solvedCase.solveStats,
    u,
    stress,
    nodalForce: r,
    szzFactor,
    D,
    peak,
    raisers: prep.raisers,
    named: prep.named,
    reported: prep.reported,
    candidates,
    evaluation,
    load: { ...balance.applied, items: loads.items, remote: loads.remote },
    supportEdges: supports.edges,
    reaction: balance.reaction,
    equilibriumError: balance.equilibriumError,
    timeMs: { mesh: t1 - t0, assemble: t2 - t1, solve: t3 - t2, recover: t4 - t3, total: t4 - t0 },
    mirrorPlanes: findMirrorPlanes(domain, supports.symmetry, supports.hold),
    warnings,
    pins,
    ...(prep.loadCase !== undefined ? { loadCase: prep.loadCase } : {}),
    ...(solvedCase.shared ? { sharedSolve: solvedCase.shared } : {}),
  };
}
