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
import { assembleSystem, internalForces } from '../fem/assemble.js';
import { compileLoads, compileSupports, type CompiledLoads, type ExtraTraction } from '../fem/boundary-conditions.js';
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
import { AnalysisError } from '../model/errors.js';
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

/** One analysis on the model's own mesh (scaled by opts.sizeFactor). */
export function analyseModel(model: Model, opts: AnalyseOptions = {}): Analysis {
  return analyseOnMesh(prepareModel(model, opts), { sizeFactor: opts.sizeFactor });
}

/** Meshes (with the given scaling and size limit), solves and evaluates. */
export function analyseOnMesh(prep: PreparedModel, meshing: { sizeFactor?: number; limit?: SizeLimit; contactHints?: ReadonlyMap<string, ContactHint> } = {}): Analysis {
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
  const nodeGraph = buildNodeAdjacency(mesh);
  const system = assembleSystem(mesh, D, model.thickness, loads.f, supports.constraints, nodeGraph);
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
    const planeModulus = state === 'plane-strain' ? model.material.E / (1 - model.material.nu ** 2) : model.material.E;
    if (contactPins.length > 0) solved = contact = solveContact(mesh, system, contactPins, { thickness: model.thickness, planeModulus }, solveOptions, undefined, meshing.contactHints);
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
  } finally {
    workers.close();
  }
  const u = expandSolution(supports.constraints.value, system.freeDof, solved.x);
  // --- pins in holes: pushed pins' contact forces are applied loads, fixed pins' are reactions ---
  if (contact) addContactForces(contact, loads.f, supports.constraints.fixed);
  const pins: PinsOfAnalysis | null =
    supports.pins.length === 0 ? null : { holes: supports.pins, contact: contact && { pins: contact.pins, iterations: contact.iterations, activeHistory: contact.activeHistory, tolerance: contact.tolerance } };
  // --- end of pins ---
  const t3 = performance.now();

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
    solveStats: solved.stats,
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
  };
}
