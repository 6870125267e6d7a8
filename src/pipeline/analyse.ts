/**
 * One analysis, end to end: model -> domain -> mesh -> loads and supports -> stiffness ->
 * sparse Cholesky -> recovered stresses -> the stress raisers' peaks, sections and Kt. This file
 * only wires the stages together; each stage lives in its own module and knows nothing of the
 * ones after it.
 */
import { totalmem } from 'node:os';
import { evaluateCurve } from '../geometry/curve.js';
import { buildDomain, type Domain } from '../geometry/domain.js';
import type { ImportedDrawing } from '../geometry/import/index.js';
import { validateDomain } from '../geometry/validate.js';
import { assembleSystem, internalForces } from '../fem/assemble.js';
import { compileLoads, compileSupports, HOLD_FREE, HOLD_MIRROR, type CompiledLoads, type ExtraTraction } from '../fem/boundary-conditions.js';
import { constitutiveMatrix, type PlaneState } from '../fem/material.js';
import { checkRigidMotion } from '../fem/rigid.js';
import { addContactForces, pinSupportCentres, solveContact, type ContactHint, type ContactSolution, type PinsOfAnalysis } from '../fem/contact.js';
import { generateMesh, triangleMinAngle } from '../mesh/generate.js';
import type { SizeField } from '../mesh/sizefield.js';
import type { HardPoint } from '../mesh/boundary.js';
import type { SizeLimit } from '../mesh/background.js';
import { buildNodeAdjacency, buildNodeElements } from '../mesh/topology.js';
import type { Mesh, MeshStats } from '../mesh/types.js';
import { AnalysisError, ModelError } from '../model/errors.js';
import { nearestBoundaryPoint } from '../geometry/project.js';
import type { Model, StressMeasure } from '../model/schema.js';
import { resolveUnits, type ResolvedUnits } from '../model/units.js';
import { evaluateMesh, type MeshEvaluation } from '../post/evaluate.js';
import type { RaiserNominalInput } from '../post/kt.js';
import { findPeak, outOfPlaneFactor, type Peak } from '../post/peak.js';
import { RaiserCutFinder } from '../post/raiser-cut.js';
import { findRaisers, matchRaisers, type Raiser } from '../post/raisers.js';
import { recoverNodalStress, type KnownTraction } from '../post/recover.js';
import { cutBetween, pointOnCut } from '../post/section.js';
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

export interface MirrorPlane {
  axis: 'x' | 'y';
  at: number;
  edges: number[];
}

/** The planes held by symmetry supports, as the support compilation decided them: edges both shear-free and mirror-held. */
function mirrorPlanesOf(domain: Domain, symmetry: Uint8Array, hold: Uint8Array): MirrorPlane[] {
  const planes: MirrorPlane[] = [];
  const tol = 1e-9 * domain.scale;
  for (let e = 0; e < domain.edges.length; e++) {
    const c = domain.edges[e].curve;
    if (!symmetry[e] || hold[e] !== HOLD_MIRROR || c.kind !== 'line') continue;
    const axis = Math.abs(c.x1 - c.x0) <= tol ? 'x' : 'y';
    const at = axis === 'x' ? c.x0 : c.y0;
    const p = planes.find((q) => q.axis === axis && Math.abs(q.at - at) <= tol);
    if (p) p.edges.push(e);
    else planes.push({ axis, at, edges: [e] });
  }
  return planes;
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
  const raisers = findRaisers(domain);
  const { named, reported, given } = resolveRaiserSettings(model, domain, raisers);
  const finder = new RaiserCutFinder(domain, model.thickness);
  return { model, units, state, measure, domain, order, hardPoints, maxMemoryBytes, raisers, named, reported, given, finder };
}

/** One raiser by the name a model file uses for it, or a ModelError that lists the names there are. */
function raiserByName(raisers: readonly Raiser[], name: string, path: string): number {
  const found = matchRaisers(raisers, name);
  const names = raisers.map((r) => r.name);
  if (found.length === 0) {
    throw new ModelError(
      path,
      raisers.length === 0 ? `"${name}" names a stress raiser, but the part has none (no hole, notch, fillet or other concave curved edge)` : `no stress raiser is called "${name}"`,
      raisers.length === 0 ? 'remove it' : `the raisers are: ${names.map((n) => `'${n}'`).join(', ')} (a hole may also be named by its name or "hole N", an edge by its tag)`,
    );
  }
  if (found.length > 1) throw new ModelError(path, `"${name}" names ${found.length} stress raisers: ${found.map((r) => `'${r.name}'`).join(', ')}`, 'use a name that picks one of them (the printed name, a hole\'s name, or "hole N")');
  return found[0].index;
}

/** results.raiser, results.raisers, results.nominal and results.section turned into raiser indices. */
function resolveRaiserSettings(model: Model, domain: Domain, raisers: readonly Raiser[]) {
  const res = model.results ?? {};
  const named = res.raiser !== undefined ? raiserByName(raisers, res.raiser, 'results.raiser') : -1;
  const reported = res.raisers ? new Set(res.raisers.map((n, i) => raiserByName(raisers, n, `results.raisers[${i}]`))) : null;
  if (reported && named >= 0) reported.add(named);
  const given = new Map<number, RaiserNominalInput>();
  for (const [name, spec] of Object.entries(res.nominal ?? {})) {
    const i = raiserByName(raisers, name, `results.nominal.${name}`);
    if (spec.section === undefined && spec.stress === undefined) throw new ModelError(`results.nominal.${name}`, 'gives neither a section nor a stress', 'give "section": { "from": [x, y], "to": [x, y] } or "stress": value');
    if (spec.section) checkSectionCrossesMaterial(domain, spec.section, `results.nominal.${name}.section`, model.thickness);
    given.set(i, { section: spec.section, stress: spec.stress });
  }
  if (res.section && res.section !== 'auto') {
    checkSectionCrossesMaterial(domain, res.section, 'results.section', model.thickness);
    // The raiser the given cut passes nearest.
    if (raisers.length === 0) throw new ModelError('results.section', 'a section is given, but the part has no stress raiser to take it for', 'remove results.section');
    const [ax, ay] = res.section.from;
    const [bx, by] = res.section.to;
    let best = named;
    if (best < 0) {
      let bd = Infinity;
      for (const r of raisers) {
        for (const id of r.edges) {
          const b = nearestOnSegment(domain, id, ax, ay, bx, by);
          if (b < bd) {
            bd = b;
            best = r.index;
          }
        }
      }
    }
    given.set(best, { ...given.get(best), section: res.section });
  }
  return { named, reported, given };
}

/**
 * The nominal stresses the model gives per raiser, with the bearing stress F / (d t) of every
 * pin in a hole added to its raiser (a fixed pin's force is the resultant of its contact).
 */
function withBearing(prep: PreparedModel, pins: PinsOfAnalysis | null, contact: ContactSolution | null, thickness: number): Map<number, RaiserNominalInput> {
  if (!pins) return prep.given;
  const out = new Map(prep.given);
  for (const pin of pins.holes) {
    const r = prep.raisers.find((x) => x.kind === 'hole' && x.loop === pin.loop);
    if (!r) continue;
    const c = contact?.pins.find((x) => x.pin.path === pin.path);
    const f = c && pin.role === 'support' ? c.resultant : pin.force;
    const F = Math.hypot(f[0], f[1]);
    if (F > 0) out.set(r.index, { ...out.get(r.index), bearing: F / (2 * pin.radius * thickness) });
  }
  return out;
}

/** A given section must cross material. */
function checkSectionCrossesMaterial(domain: Domain, sec: { from: readonly [number, number]; to: readonly [number, number] }, path: string, thickness: number): void {
  if (!cutBetween(domain, sec.from[0], sec.from[1], sec.to[0], sec.to[1], thickness)) {
    throw new ModelError(path, `the section from (${sec.from.join(', ')}) to (${sec.to.join(', ')}) crosses no material`, 'give a cut from one edge of the part to the other, across the raiser');
  }
}

/** Distance from samples of a domain edge to the segment a-b. */
function nearestOnSegment(domain: Domain, edge: number, ax: number, ay: number, bx: number, by: number): number {
  const p = [0, 0];
  let best = Infinity;
  const lx = bx - ax;
  const ly = by - ay;
  const l2 = lx * lx + ly * ly || 1;
  for (let k = 0; k <= 32; k++) {
    evaluateCurve(domain.edges[edge].curve, k / 32, p);
    const t = Math.max(0, Math.min(1, ((p[0] - ax) * lx + (p[1] - ay) * ly) / l2));
    best = Math.min(best, Math.hypot(p[0] - ax - t * lx, p[1] - ay - t * ly));
  }
  return best;
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
  const candidates = findSingularCandidates(domain, supports, loads, model.supports.map((_s, i) => `supports[${i}]`));
  const mirrorEdge = new Uint8Array(domain.edges.length);
  const edgeRole = new Uint8Array(domain.edges.length);
  for (let e = 0; e < mirrorEdge.length; e++) {
    mirrorEdge[e] = supports.hold[e] === HOLD_MIRROR ? 1 : 0;
    edgeRole[e] = supports.hold[e] !== HOLD_FREE && supports.hold[e] !== HOLD_MIRROR ? 1 : loads.loaded[e] ? 2 : 0;
  }
  // A pin in its hole (a rigid pin in contact, or the bearing pressure with its own account in
  // the pins' results) is modelled as a pin: its hole is not an idealised held or loaded edge.
  for (const p of supports.pins) for (const e of p.edges) edgeRole[e] = 0;
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
    given: withBearing(prep, pins, contact, model.thickness),
    always: [...(prep.named >= 0 ? [prep.named] : []), ...(prep.reported ?? [])],
    units: { stress: units.stress },
  });
  const y = model.material.yield;
  if (y !== undefined && Math.abs(peak.stress) > y) {
    warnings.push(`the elastic peak stress ${peak.stress.toPrecision(4)} ${units.stress} exceeds the yield strength ${y} ${units.stress}: local plastic flow is expected there and the linear result overstates the real peak stress`);
  }
  warnings.push(...checkResolution(mesh, meshGen.size, evaluation, peak));
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
    raisers: prep.raisers,
    named: prep.named,
    reported: prep.reported,
    candidates,
    evaluation,
    load: { ...applied, items: loads.items, remote: loads.remote },
    supportEdges: supports.edges,
    reaction,
    equilibriumError,
    timeMs: { mesh: t1 - t0, assemble: t2 - t1, solve: t3 - t2, recover: t4 - t3, total: t4 - t0 },
    mirrorPlanes: mirrorPlanesOf(domain, supports.symmetry, supports.hold),
    warnings,
    pins,
  };
}

/**
 * Warnings about the mesh where it matters: a raiser's ligament under two elements wide (the
 * stress across it is then poorly resolved), and badly shaped elements at the peak.
 */
function checkResolution(mesh: Mesh, size: SizeField, evaluation: MeshEvaluation, peak: Peak): string[] {
  const out: string[] = [];
  for (const ev of evaluation.raisers) {
    const c = ev.section;
    if (!c) continue;
    for (let k = 0; k < c.ligaments.length; k += 2) {
      const [x0, y0] = pointOnCut(c, c.ligaments[k]);
      const [x1, y1] = pointOnCut(c, c.ligaments[k + 1]);
      const L = c.ligaments[k + 1] - c.ligaments[k];
      const h = size.at(0.5 * (x0 + x1), 0.5 * (y0 + y1));
      if (L > 0 && L / h < 2) {
        out.push(`the ligament from (${x0.toPrecision(4)}, ${y0.toPrecision(4)}) to (${x1.toPrecision(4)}, ${y1.toPrecision(4)}) at ${ev.raiser.name} is only about ${(L / h).toFixed(1)} elements wide; give mesh.size or mesh.raiserSize a smaller value`);
      }
    }
  }
  const per = mesh.order === 2 ? 6 : 3;
  let worst = 180;
  const around = buildNodeElements(mesh);
  for (let p = around.ptr[peak.node]; p < around.ptr[peak.node + 1]; p++) worst = Math.min(worst, triangleMinAngle(mesh, per, around.idx[p]));
  if (worst < 20 && !peak.atSharpCorner) out.push(`an element at the peak has an angle of only ${worst.toFixed(1)} degrees; the peak stress there is less reliable`);
  return out;
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
