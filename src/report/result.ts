/**
 * The result of an analysis as one plain JSON object: what `raiser solve --json` prints and
 * `-o DIR` writes as result.json. Every field is documented in the README ("Result fields");
 * keep the two in step.
 */
import type { Analysis } from '../pipeline/analyse.js';
import { InternalError } from '../model/errors.js';
import type { Certified } from '../pipeline/certify.js';
import type { Cut } from '../post/section.js';
import { compareWithChart } from '../charts/library.js';
import { estimateFatigue, neuberLocal, notchRadiusAt } from '../post/design.js';
import { pinsResult } from './pins.js';

export const TOOL_VERSION = '0.1.0';

/** The cautions every result carries, in plain words. */
export const CAUTIONS = [
  'Linear elastic, small-strain analysis: stresses are proportional to the loads; yielding, contact (but that of rigid frictionless pins in holes, when the model has them), buckling and large deflection are not modelled.',
  'A peak stress above the yield strength means local plastic flow: the real peak stress is lower and the local strain higher than this elastic result.',
  'Kt is the elastic (theoretical) stress concentration factor. For fatigue use the fatigue notch factor Kf = 1 + q (Kt - 1), with the notch sensitivity q of the material and notch radius.',
  'The result depends on the model (geometry, loads, supports, material) and on the mesh; it must be checked by a qualified engineer under the applicable codes and standards before it is used for design.',
];

/** Coordinates closer to zero than 1e-7 of the model size are shown as zero. */
function snap(v: number, scale: number): number {
  return Math.abs(v) < 1e-7 * scale ? 0 : v;
}

function cut(c: Cut, scale: number) {
  const p = (q: readonly number[]): [number, number] => [snap(q[0], scale), snap(q[1], scale)];
  return {
    from: p(c.from),
    to: p(c.to),
    length: c.length,
    area: c.area,
    force: c.force,
    moment: c.moment,
    intervals: c.intervals.map(([x0, y0, x1, y1]) => ({ from: p([x0, y0]), to: p([x1, y1]) })),
  };
}

/** The convergence record: the mesh series, the band and how it was found. */
function convergence(c: Certified | null, scale: number) {
  if (!c) {
    return {
      status: 'single-mesh' as const,
      target: null,
      estimatedError: null,
      observedOrder: null,
      theoreticalOrder: null,
      orderUsed: null,
      safetyFactor: null,
      behaviour: null,
      asymptoticRatio: null,
      extrapolatedPeak: null,
      meshes: [],
      adaptation: null,
      notes: ['one mesh only: the discretisation error is not estimated'],
      timeMs: null,
    };
  }
  const g = c.gci;
  const num = (v: number | undefined) => (v === undefined || !Number.isFinite(v) ? null : v);
  return {
    status: c.status,
    target: c.target,
    estimatedError: num(g?.gci),
    observedOrder: num(g?.observedOrder),
    theoreticalOrder: c.theoreticalOrder,
    orderUsed: num(g?.orderUsed),
    safetyFactor: num(g?.safetyFactor),
    behaviour: g?.behaviour ?? null,
    asymptoticRatio: num(g?.asymptoticRatio),
    extrapolatedPeak: num(g?.extrapolated) === null ? null : Math.sign(c.analysis.peak.stress) * g!.extrapolated,
    meshes: c.meshes.map((r) => ({
      elements: r.elements,
      nodes: r.nodes,
      dofs: r.dofs,
      relativeSize: r.relativeSize,
      peak: r.peak,
      peakX: snap(r.peakX, scale),
      peakY: snap(r.peakY, scale),
      ktNet: r.ktNet,
      ktGross: r.ktGross,
      timeMs: r.timeMs,
    })),
    adaptation: c.adapted,
    notes: [...(g?.notes ?? []), ...c.notes],
    timeMs: c.totalTimeMs,
  };
}

/** NaN never reaches a result: every number must be finite (null stands for "none"). */
export function assertFiniteResult(value: unknown, path = 'result'): void {
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) throw new InternalError(`the result field ${path} is ${value}: a computation failed; the result is not written`);
    return;
  }
  if (Array.isArray(value)) value.forEach((v, i) => assertFiniteResult(v, `${path}[${i}]`));
  else if (value && typeof value === 'object') for (const [k, v] of Object.entries(value)) assertFiniteResult(v, `${path}.${k}`);
}

export function buildResult(a: Analysis, file?: string, cert: Certified | null = null) {
  const r = buildResultUnchecked(a, file, cert);
  assertFiniteResult(r);
  return r;
}

function buildResultUnchecked(a: Analysis, file?: string, cert: Certified | null = null) {
  const m = a.model;
  const y = m.material.yield;
  const scale = a.domain.scale;
  const conv = convergence(cert, scale);
  const singular = cert?.status === 'singular';
  const err = conv.estimatedError;
  const band = (v: number) => (err === null || singular ? null : ([v * (1 - err), v * (1 + err)] as [number, number]));
  const extrapolated = (v: number) => (conv.extrapolatedPeak === null || singular ? null : (v * conv.extrapolatedPeak) / a.peak.stress);
  const chart = m.chart && !singular ? compareWithChart(m.chart.family, m.chart.dims, a.kt) : null;
  const radius = notchRadiusAt(a.domain, a.peak.x, a.peak.y);
  const fatigue = singular ? null : estimateFatigue(a.kt.net, radius, m.material, a.units);
  const ss = m.material.stressStrain;
  const local = ss && !singular ? neuberLocal(Math.abs(a.peak.stress), m.material.E, ss.K, ss.n) : null;
  return {
    tool: { name: 'raiser', version: TOOL_VERSION },
    model: { title: m.title ?? null, file: file ?? null, chart: m.chart ?? null },
    units: { length: a.units.length, force: a.units.force, stress: a.units.stress, moment: a.units.moment },
    analysis: { state: a.state, measure: a.peak.measure, thickness: m.thickness, E: m.material.E, nu: m.material.nu },
    kt: {
      net: singular ? null : a.kt.net,
      gross: singular ? null : a.kt.gross,
      error: singular ? null : err,
      netBand: band(a.kt.net),
      grossBand: band(a.kt.gross),
      netExtrapolated: extrapolated(a.kt.net),
      grossExtrapolated: extrapolated(a.kt.gross),
      netDefinition: `peak ${a.peak.measure} stress / net nominal stress (${a.net.definition})`,
      grossDefinition: `peak ${a.peak.measure} stress / gross nominal stress (${a.gross.definition})`,
    },
    peak: {
      stress: a.peak.stress,
      measure: a.peak.measure,
      x: snap(a.peak.x, scale),
      y: snap(a.peak.y, scale),
      feature: a.peak.feature,
      onBoundary: a.peak.onBoundary,
      atSharpCorner: a.peak.atSharpCorner,
      sxx: a.peak.components.sxx,
      syy: a.peak.components.syy,
      sxy: a.peak.components.sxy,
    },
    nominal: {
      stress: a.net.stress,
      kind: a.net.kind,
      definition: a.net.definition,
      section: cut(a.net.section, scale),
      gross: { stress: a.gross.stress, definition: a.gross.definition, section: cut(a.gross.section, scale) },
    },
    load: {
      resultant: { fx: a.load.fx, fy: a.load.fy, m: a.load.m },
      direction: a.direction,
      remote: a.load.remote ?? null,
      reaction: a.reaction,
      equilibriumError: a.equilibriumError,
    },
    mesh: {
      nodes: a.mesh.nNodes,
      elements: a.mesh.nElements,
      dofs: 2 * a.mesh.nNodes,
      elementType: a.mesh.order === 2 ? 'quadratic' : 'linear',
      nodesPerElement: a.mesh.order === 2 ? 6 : 3,
      minAngleDeg: a.meshStats.minAngleDeg,
      maxAngleDeg: a.meshStats.maxAngleDeg,
    },
    solver: {
      ordering: a.solveStats.ordering,
      equations: a.solveStats.n,
      factorNonzeros: a.solveStats.nnzL,
      relativeResidual: a.solveStats.relativeResidual,
      backwardError: a.solveStats.backwardError,
      method: a.solveStats.method,
      iterations: a.solveStats.iterations,
      preconditioner: a.solveStats.method === 'pcg' ? a.solveStats.preconditioner : null,
    },
    timeMs: a.timeMs,
    convergence: conv,
    chart: chart
      ? { ...chart, value: Number.isFinite(chart.value) ? chart.value : null, difference: Number.isFinite(chart.difference) ? chart.difference : null }
      : null,
    fatigue: fatigue ? { radius: fatigue.radius, kt: 'net', methods: fatigue.methods, notes: fatigue.notes } : null,
    plasticity: local
      ? { elasticPeak: Math.abs(a.peak.stress), localStress: local.stress, localStrain: local.strain, elasticStrain: local.elasticStrain, source: local.source }
      : null,
    safety: {
      yield: y ?? null,
      ultimate: m.material.ultimate ?? null,
      peakOverYield: y !== undefined ? Math.abs(a.peak.stress) / y : null,
      localPlasticity: y !== undefined ? Math.abs(a.peak.stress) > y : null,
    },
    pins: pinsResult(a),
    warnings: a.warnings,
    cautions: CAUTIONS,
  };
}

export type ResultJson = ReturnType<typeof buildResultUnchecked>;
