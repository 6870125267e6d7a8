/**
 * Certified Kt: a series of meshes refined until the estimated discretisation error of the
 * governing raiser's Kt is below a target, with the error band from Richardson extrapolation and
 * the Grid Convergence Index (src/post/convergence.ts) computed on the Kt series itself; every
 * raiser's Kt gets its own band the same way (src/post/settle.ts).
 *
 * The series is adaptive and systematic at once:
 *  1. a first mesh from the geometric size field is solved, and the Zienkiewicz-Zhu indicator
 *     (src/post/estimate.ts) marks every element whose relative stress error exceeds that of the
 *     elements at the peak: those regions (a second raiser, a load introduction, a thin
 *     ligament) would otherwise pollute the peak; far-field elements with small errors are left
 *     alone. The marked elements get the size that brings their error down to the peak's level
 *     (h (e_peak / e)^(1/p)), graded smoothly into the rest;
 *  2. this adapted size field is then scaled by 1/sqrt(2) per mesh, so the meshes form a family
 *     with a known refinement ratio at the peak, as Richardson extrapolation assumes.
 * Refinement stops when the GCI of the last three meshes is below the target, when no raiser is
 * left whose peak converges (every one at a singular point), or when the mesh or DOF budget is
 * spent. A raiser whose peak sits at a singular point is kept out of the stopping rule, so a
 * clamp's end that never converges does not drive the series to its budget.
 */
import { hintsFromContact } from '../fem/contact.js';
import { SERIES_RATIO, firstSeriesSizeFactor, scaleSizeLimit } from '../mesh/series-size.js';
import { adaptSizeLimit, findReferencePeak } from '../post/adapt.js';
import { findGoverningKt, type GoverningKt } from '../post/governing.js';
import { recordMesh, trackSeries, type MeshRecord, type TrackedQuantity } from '../post/series.js';
import { gridConvergence, type GciResult } from '../post/convergence.js';
import type { MeshEvaluation } from '../post/evaluate.js';
import { settleSeries, type Settlement } from '../post/settle.js';
import { analyseCasesOnMesh, prepareLoadCases, prepareModel, type AnalyseOptions, type Analysis, type PreparedModel } from './analyse.js';
import type { SizeLimit } from '../mesh/background.js';
import type { Model } from '../model/schema.js';
import { ModelTooLargeError } from '../model/errors.js';
import { refuseLoadCases } from '../model/load-cases.js';

export interface CertifyOptions extends AnalyseOptions {
  /** relative error target for the peak stress and Kt (default 0.01) */
  target?: number;
  /** the most meshes in the refined family (default 8) */
  maxMeshes?: number;
  /** stop before a mesh with more degrees of freedom than this (default 1.5e6) */
  maxDofs?: number;
}

export type CertifyStatus = 'converged' | 'not-converged' | 'singular';

export interface Certified {
  analysis: Analysis;
  status: CertifyStatus;
  target: number;
  /** the band of the quantity the series was stopped on: the governing raiser's headline Kt, else a peak */
  gci: GciResult | null;
  /** what the band is of */
  quantity: TrackedQuantity;
  theoreticalOrder: number;
  meshes: MeshRecord[];
  /** what the series says about each raiser and each singular point */
  settlement: Settlement;
  /** elements the error indicator marked on the first mesh, of how many */
  adapted: { marked: number; of: number };
  notes: string[];
  totalTimeMs: number;
}

/** The settlement of a series of analyses (coarse to fine, with their relative sizes). */
export function settleAnalyses(runs: readonly Analysis[], sizes: readonly number[], named: number): Settlement {
  const last = runs[runs.length - 1];
  const evals: MeshEvaluation[] = runs.map((r) => r.evaluation);
  return settleSeries(evals, sizes, last.mesh.order, last.candidates, named, last.units.stress);
}

export function certifyModel(model: Model, opts: CertifyOptions = {}): Certified {
  refuseLoadCases(model, 'a certified analysis of one case');
  return certifyPrepared(prepareModel(model, opts), opts);
}

export function certifyPrepared(prep: PreparedModel, opts: CertifyOptions = {}): Certified {
  return certifyCasesPrepared([prep], opts)[0];
}

/**
 * Certified Kt of every load case of a model (model.loadCases; a model of plain loads gives one
 * Certified, exactly certifyModel's).
 */
export function certifyModelCases(model: Model, opts: CertifyOptions = {}): Certified[] {
  return certifyCasesPrepared(prepareLoadCases(prepareModel(model, opts)), opts);
}

/** One series of the load cases: what it has so far, and whether it has stopped. */
interface CaseSeries {
  prep: PreparedModel;
  runs: Analysis[];
  meshes: MeshRecord[];
  gci: GciResult | null;
  quantity: TrackedQuantity;
  settlement: Settlement | null;
  status: CertifyStatus;
  stopped: boolean;
  notes: string[];
}

/**
 * The series of several load cases on shared meshes (analyseCasesOnMesh: one factorisation per
 * mesh for all cases). The first mesh's error indicator is read for every case, and the meshes
 * after it take the smallest size any case asks for at each point, so the family serves all
 * cases. Each case stops on its own rule (the one above) and keeps the meshes up to there; the
 * meshes after it are solved only for the cases still running. The budget is shared.
 */
function certifyCasesPrepared(cases: readonly PreparedModel[], opts: CertifyOptions = {}): Certified[] {
  const t0 = performance.now();
  const prep = cases[0];
  const target = opts.target ?? 0.01;
  const maxMeshes = opts.maxMeshes ?? 8;
  const maxDofs = opts.maxDofs ?? 1.5e6;
  const pTh = prep.order; // peak stress converges as h^p for elements of degree p (Strang & Fix, An Analysis of the Finite Element Method, 1973 [M])
  const s0 = firstSeriesSizeFactor(prep.order, target);
  const firsts = analyseCasesOnMesh(cases, { sizeFactor: s0 });
  const adapted = firsts.map((first) => {
    const reference = findReferencePeak(first.evaluation, first.peak, settleAnalyses([first], [1], first.named));
    return adaptSizeLimit({ mesh: first.mesh, D: first.D, thickness: first.model.thickness, u: first.u, stress: first.stress }, reference, first.model.mesh?.grading);
  });
  const limit = combineSizeLimits(adapted.map((x) => x.limit));
  const series: CaseSeries[] = cases.map((c) => ({ prep: c, runs: [], meshes: [], gci: null, quantity: { raiser: -1, kind: 'peak' }, settlement: null, status: 'not-converged', stopped: false, notes: [] }));
  for (let k = 0; k < maxMeshes; k++) {
    const f = Math.pow(SERIES_RATIO, -k);
    const active = series.filter((c) => !c.stopped);
    if (active.length === 0) break;
    let solved: Analysis[];
    try {
      // Pins in contact start where the previous mesh found their arcs (one case only: pins are refused with several).
      const prev = series[0].runs.length > 0 ? series[0].runs[series[0].runs.length - 1] : firsts[0];
      const contactHints = prev.pins?.contact ? hintsFromContact(prev.pins.contact.pins) : undefined;
      solved = k === 0 && !limit ? firsts : analyseCasesOnMesh(active.map((c) => c.prep), { sizeFactor: s0 * f, limit: scaleSizeLimit(limit, f), contactHints });
    } catch (err) {
      // The next mesh would not fit in memory: stop with what the series has.
      if (err instanceof ModelTooLargeError && series[0].runs.length > 0) {
        for (const c of active) c.notes.push(`stopped: ${err.message}`);
        break;
      }
      throw err;
    }
    active.forEach((c, i) => extendSeries(c, solved[i], f, target, pTh));
    // Budget: the next mesh has about twice the degrees of freedom.
    const dofs = active[0].meshes[active[0].meshes.length - 1].dofs;
    if (2 * dofs > maxDofs) {
      for (const c of active) if (!c.stopped) c.notes.push(`stopped before a mesh of about ${(2 * dofs).toExponential(1)} degrees of freedom (the limit is ${maxDofs.toExponential(1)})`);
      break;
    }
  }
  return series.map((c, i) => {
    const { runs, meshes, gci, notes, status } = c;
    const first = firsts[i];
    const marked = adapted[i].marked;
    if (status === 'not-converged' && meshes.length >= maxMeshes) notes.push(`stopped after ${maxMeshes} meshes`);
    // The ends of a contact arc are kinks in the pressure, which lower the order of convergence
    // near them: the band then rests on the order observed, as the grid convergence index does.
    const last = runs[runs.length - 1];
    if (last?.pins?.contact && gci && Number.isFinite(gci.observedOrder) && gci.observedOrder < pTh) {
      notes.push(`pins in contact: the ends of the contact arcs lower the order of convergence (observed ${gci.observedOrder.toFixed(2)} against ${pTh}); the band uses ${gci.orderUsed === pTh ? 'the theoretical order with the safety factor 3, the observed one being out of range' : 'the observed order'}`);
    }
    if (marked > 0) notes.push(`the error indicator on the first mesh marked ${marked} of ${first.mesh.nElements} elements for refinement beyond the geometric grading${cases.length > 1 ? ' for this load case (the meshes take the finest size any case asks for)' : ''}`);
    return {
      analysis: last,
      status,
      target,
      gci,
      quantity: c.quantity,
      theoreticalOrder: pTh,
      meshes,
      settlement: c.settlement!,
      adapted: { marked, of: first.mesh.nElements },
      notes,
      totalTimeMs: performance.now() - t0,
    };
  });
}

/** Adds one mesh's analysis to a case's series and applies the stopping rules of certifyPrepared. */
function extendSeries(c: CaseSeries, a: Analysis, f: number, target: number, pTh: number): void {
  const { runs, meshes } = c;
  runs.push(a);
  meshes.push(recordMesh(a, f));
  const sizes = meshes.map((m) => m.relativeSize);
  const settlement = (c.settlement = settleAnalyses(runs, sizes, c.prep.named));
  const tracked = trackSeries(meshes, settlement);
  c.quantity = tracked.quantity;
  if (tracked.values.length >= 2) c.gci = gridConvergence(tracked.sizes, tracked.values, pTh);
  const gci = c.gci;
  if (runs.length >= 3 && gci) {
    // Nothing to certify: no raiser governs and the highest stress sits at a singular point
    // (a sharp corner, or a place where the stress keeps growing).
    const top = Math.abs(meshes[meshes.length - 1].peak);
    const lastCand = runs[runs.length - 1].evaluation.candidateStress;
    const atSingular =
      meshes[meshes.length - 1].atSharpCorner ||
      settlement.singular.some((sp) => sp.grows === true && Math.abs(lastCand[sp.candidate]) >= 0.9 * top);
    const peakDiverges = settlement.governing < 0 && atSingular && (gci.behaviour === 'diverging' || (gci.observedOrder < 0.5 * pTh && top > Math.abs(meshes[meshes.length - 2].peak)));
    const noneLeft = settlement.governing < 0 && settlement.raisers.length > 0 && settlement.raisers.every((r) => r.status === 'singular');
    if (noneLeft || peakDiverges) {
      c.status = 'singular';
      c.stopped = true;
    } else if (gci.gci <= target) {
      c.status = 'converged';
      c.stopped = true;
    }
  }
}

/**
 * The smallest of several size limits at each point (null when none asks for any): the meshes
 * of several load cases get the size the most demanding case wants everywhere. One limit is
 * passed through as it is.
 */
function combineSizeLimits(limits: readonly (SizeLimit | null)[]): SizeLimit | null {
  const given = limits.filter((l): l is SizeLimit => l !== null);
  if (given.length <= 1) return given[0] ?? null;
  return { at: (x, y) => given.reduce((m, l) => Math.min(m, l.at(x, y)), Infinity) };
}

/** The governing raiser's Kt values, from a certified series or from one analysis alone. */
export function governingKt(x: Certified | Analysis): GoverningKt {
  const s = 'settlement' in x ? x.settlement : settleAnalyses([x], [1], x.named);
  const a = 'settlement' in x ? x.analysis : x;
  return findGoverningKt(s, a.raisers);
}

export type { GoverningKt };
export type { MeshRecord };
