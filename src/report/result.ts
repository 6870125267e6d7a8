/**
 * The result of an analysis as one plain JSON object: what `raiser solve --json` prints and
 * `-o DIR` writes as result.json. Every field is documented in the README ("Result fields");
 * keep the two in step.
 */
import { TOOL_VERSION } from '../model/version.js';
import type { ResultCase, ResultJson } from './result-json.js';
import type { Analysis } from '../pipeline/analyse.js';
import { InternalError } from '../model/errors.js';
import { settleAnalyses, type Certified } from '../pipeline/certify.js';
import { pointOnCut, type Cut } from '../post/section.js';
import type { KtKind } from '../post/kt.js';
import type { SettledKt, Settlement } from '../post/settle.js';
import { compareRaiserWithChart } from '../post/chart-match.js';
import { estimateDesign } from '../post/design.js';
import { pinsResult } from './pins.js';
import { describeBasis } from '../model/materials.js';
import type { Model } from '../model/schema.js';
import { describeRaiserShape, type RaiserShape } from '../post/raisers.js';


/** The cautions every result carries, in plain words. */
const CAUTIONS = [
  'Linear elastic, small-strain analysis: stresses are proportional to the loads; yielding, contact (but that of rigid frictionless pins in holes, when the model has them), buckling and large deflection are not modelled.',
  'A peak stress above the yield strength means local plastic flow: the real peak stress is lower and the local strain higher than this elastic result.',
  'Kt is the elastic (theoretical) stress concentration factor. For fatigue use the fatigue notch factor Kf = 1 + q (Kt - 1), with the notch sensitivity q of the material and notch radius.',
  'The result depends on the model (geometry, loads, supports, material) and on the mesh; it must be checked by a qualified engineer under the applicable codes and standards before it is used for design.',
];

/** Coordinates closer to zero than 1e-7 of the model size are shown as zero. */
function snap(v: number, scale: number): number {
  return Math.abs(v) < 1e-7 * scale ? 0 : v;
}

/** A section as result data: the ends, the ligaments, the flow direction and what it carries. */
function section(c: Cut, scale: number) {
  const p = (q: readonly number[]): [number, number] => [snap(q[0], scale), snap(q[1], scale)];
  const lig = c.ligaments;
  return {
    from: p(pointOnCut(c, lig[0])),
    to: p(pointOnCut(c, lig[lig.length - 1])),
    normal: [c.dx, c.dy] as [number, number],
    length: c.length,
    area: c.area,
    centroid: p(pointOnCut(c, c.vBar)),
    inertia: c.inertia,
    mirror: c.mirror,
    ligaments: Array.from({ length: lig.length / 2 }, (_v, k) => ({ from: p(pointOnCut(c, lig[2 * k])), to: p(pointOnCut(c, lig[2 * k + 1])) })),
  };
}

const num = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? null : v);

/** A raiser's shape with its coordinates at round-off printed as zero. */
function snapShape(sh: RaiserShape, scale: number): RaiserShape {
  const p = (q: [number, number]): [number, number] => [snap(q[0], scale), snap(q[1], scale)];
  const extent = sh.extent.map((v) => snap(v, scale)) as [number, number, number, number];
  switch (sh.type) {
    case 'circle':
    case 'ellipse':
    case 'rounded-rectangle':
      return { ...sh, center: p(sh.center), extent };
    case 'slot':
      return { ...sh, ends: [p(sh.ends[0]), p(sh.ends[1])], extent };
    case 'arc':
      return { ...sh, center: p(sh.center), from: p(sh.from), to: p(sh.to), extent };
    default:
      return { ...sh, extent };
  }
}

/** One Kt of a raiser as result data. */
function ktEntry(k: SettledKt) {
  return {
    value: num(k.value),
    nominal: num(k.nominal),
    definition: k.definition,
    withheld: k.withheld,
    error: num(k.error),
    band: k.band,
    extrapolated: num(k.extrapolated),
  };
}

/** Every raiser of the last mesh with what the series settled about it, highest peak first. */
function raisers(a: Analysis, s: Settlement, scale: number, cert: Certified | null, reported: ReadonlySet<number> | null) {
  const chartFor = a.model.chart;
  const list = a.evaluation.raisers.map((ev, i) => {
    const st = s.raisers[i];
    const kt: Partial<Record<KtKind, ReturnType<typeof ktEntry> & { membrane?: number | null }>> = {};
    for (const k of st.kt) kt[k.kind] = ktEntry(k);
    const loads = ev.loads;
    // The net nominal stress split into its membrane part N / A and the bending part.
    if (kt.net && loads && ev.section) kt.net.membrane = loads.N / ev.section.area;
    // Resultants at round-off level print as zero (relative to what the section carries).
    const big = loads && ev.section ? Math.max(Math.abs(loads.N), Math.abs(loads.V), Math.abs(loads.M) / ev.section.length) : 0;
    const tidy = (v: number) => (Math.abs(v) <= 1e-9 * big ? 0 : v);
    const governing = i === s.governing;
    // The published chart of a template model belongs to the raiser it was built around; on any
    // model, a raiser that is a chart's shape gets that chart.
    const kts = { net: kt.net?.value ?? null, gross: kt.gross?.value ?? null };
    const chart = compareRaiserWithChart(a.domain, ev, st.status, governing, chartFor, kts);
    return {
      index: i,
      name: ev.raiser.name,
      kind: ev.raiser.kind,
      governing,
      status: st.status,
      reason: st.reason,
      radius: num(ev.raiser.radius),
      shape: snapShape(describeRaiserShape(a.domain, ev.raiser), scale),
      peak: { stress: ev.peak.stress, x: snap(ev.peak.x, scale), y: snap(ev.peak.y, scale), sxx: ev.peak.sxx, syy: ev.peak.syy, sxy: ev.peak.sxy },
      peakError: cert && st.peakGci && Number.isFinite(st.peakGci.gci) ? st.peakGci.gci : null,
      section: ev.section
        ? {
            ...section(ev.section, scale),
            given: ev.sectionGiven,
            raiserPoint: ((q) => [snap(q[0], scale), snap(q[1], scale)] as [number, number])(pointOnCut(ev.section, ev.vRaiser)),
            N: loads ? tidy(loads.N) : null,
            V: loads ? tidy(loads.V) : null,
            M: loads ? tidy(loads.M) : null,
          }
        : null,
      gross: ev.gross ? section(ev.gross.found, scale) : null,
      headline: st.primary,
      kt,
      chart: chart ? { ...chart, value: num(chart.value), computed: num(chart.computed), difference: num(chart.difference) } : null,
      warnings: ev.warnings,
    };
  });
  return list.filter((r) => !reported || reported.has(r.index) || r.governing).sort((x, y) => Math.abs(y.peak.stress) - Math.abs(x.peak.stress));
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
      quantity: null,
      meshes: [],
      adaptation: null,
      notes: ['one mesh only: the discretisation error is not estimated'],
      timeMs: null,
    };
  }
  const g = c.gci;
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
    quantity: c.quantity.raiser < 0 ? 'the highest stress in the part' : `${c.quantity.kind === 'peak' ? 'the peak' : `Kt ${c.quantity.kind}`} of ${c.analysis.raisers[c.quantity.raiser].name}`,
    meshes: c.meshes.map((r) => ({
      elements: r.elements,
      nodes: r.nodes,
      dofs: r.dofs,
      relativeSize: r.relativeSize,
      peak: r.peak,
      peakX: snap(r.peakX, scale),
      peakY: snap(r.peakY, scale),
      raiserPeak: c.quantity.raiser >= 0 ? r.raisers[c.quantity.raiser].peak : null,
      kt: c.quantity.raiser >= 0 && c.quantity.kind !== 'peak' ? (r.raisers[c.quantity.raiser].kt[c.quantity.kind] ?? null) : null,
      timeMs: r.timeMs,
    })),
    adaptation: c.adapted,
    notes: [...(g?.notes ?? []), ...c.notes],
    timeMs: c.totalTimeMs,
  };
}

/** NaN never reaches a result: every number must be finite (null stands for "none"). */
function assertFiniteResult(value: unknown, path = 'result'): void {
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

function buildResultUnchecked(a: Analysis, file?: string, cert: Certified | null = null): ResultJson {
  const m = a.model;
  const y = m.material.yield;
  const scale = a.domain.scale;
  const conv = convergence(cert, scale);
  const settlement = cert ? cert.settlement : settleAnalyses([a], [1], a.named);
  const list = raisers(a, settlement, scale, cert, a.reported);
  const gov = list.find((r) => r.governing) ?? null;
  const headKind = gov?.headline ?? null;
  const head = gov && headKind ? gov.kt[headKind]! : null;
  const { fatigue, local } = estimateDesign(a.domain, m.material, a.units, gov && { x: gov.peak.x, y: gov.peak.y, stress: gov.peak.stress, kt: head?.value ?? null, settled: gov.status === 'ok' });
  const withheldWhy = !gov
    ? a.raisers.length === 0
      ? 'the part has no stress raiser (no hole, notch, fillet or other concave curved edge), so it has no Kt; the peak stress is reported'
      : `no raiser has a Kt: ${list.map((r) => `${r.name}: ${r.reason ?? Object.values(r.kt).find((k) => k?.withheld)?.withheld ?? 'no section'}`).join('; ')}`
    : !head
      ? `no Kt of ${gov.name} has a meaning here: ${(gov.reason ?? Object.values(gov.kt).find((k) => k?.withheld)?.withheld) ?? 'every nominal stress is withheld'}`
      : null;
  const singularPoints = settlement.singular.map((sp) => {
    const c = a.candidates[sp.candidate];
    return { kind: c.kind, x: snap(c.x, scale), y: snap(c.y, scale), what: c.what, fix: c.fix, stresses: sp.stresses, grows: sp.grows };
  });
  const warnings = [...a.warnings];
  for (const r of list) for (const w of r.warnings) warnings.push(w);
  for (const sp of singularPoints) {
    if (sp.grows === true && Math.abs(sp.stresses[sp.stresses.length - 1]) >= Math.abs(gov?.peak.stress ?? 0)) {
      warnings.push(`the highest stress is at a singular point, ${sp.what}, and grows with the mesh; it is an artefact of the idealised model, not a peak to design to: ${sp.fix}`);
    }
  }
  return {
    tool: { name: 'raiser', version: TOOL_VERSION },
    model: { title: m.title ?? null, file: file ?? null, chart: m.chart ?? null },
    geometry: {
      extent: a.domain.bbox.map((v) => snap(v, scale)) as [number, number, number, number],
      area: a.domain.area,
      holes: a.domain.loops.length - 1,
      raisers: a.raisers.length,
    },
    units: { length: a.units.length, force: a.units.force, stress: a.units.stress, moment: a.units.moment },
    analysis: { state: a.state, measure: a.peak.measure, thickness: m.thickness, E: m.material.E, nu: m.material.nu },
    kt: {
      raiser: gov?.name ?? null,
      kind: head ? headKind : null,
      value: head?.value ?? null,
      error: head?.error ?? null,
      band: head?.band ?? null,
      extrapolated: head?.extrapolated ?? null,
      definition: head ? `peak ${a.peak.measure} stress at ${gov!.name} / ${head.definition}` : null,
      withheld: withheldWhy,
      net: gov?.kt.net?.value ?? null,
      gross: gov?.kt.gross?.value ?? null,
    },
    raisers: list,
    singularPoints,
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
    load: {
      resultant: { fx: a.load.fx, fy: a.load.fy, m: a.load.m },
      remote: a.load.remote ?? null,
      reaction: a.reaction,
      equilibriumError: a.equilibriumError,
    },
    // Where the finite element stage applied each load of the model and where each support
    // holds (domain edge ids, src/geometry/domain.ts): the pictures draw from these, never
    // choosing the edges again.
    boundaryConditions: {
      loads: a.load.items.filter((it) => it.index >= 0).map((it) => ({ index: it.index, type: it.type, edges: it.edges })),
      supports: a.supportEdges.map((edges, index) => ({ index, type: a.model.supports[index].type, edges })),
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
    chart: gov?.chart ?? null,
    material: materialResult(m.material),
    fatigue: fatigue ? { radius: fatigue.radius, kt: headKind, raiser: gov!.name, methods: fatigue.methods, notes: fatigue.notes, withheld: fatigue.withheld } : null,
    plasticity: local
      ? { elasticPeak: Math.abs(gov!.peak.stress), localStress: local.stress, localStrain: local.strain, elasticStrain: local.elasticStrain, source: local.source }
      : null,
    safety: {
      yield: y ?? null,
      ultimate: m.material.ultimate ?? null,
      peakOverYield: y !== undefined ? Math.abs(a.peak.stress) / y : null,
      localPlasticity: y !== undefined ? Math.abs(a.peak.stress) > y : null,
    },
    pins: pinsResult(a),
    mirrorPlanes: a.mirrorPlanes.map((p) => ({ axis: p.axis, at: p.at, edges: p.edges })),
    warnings,
    cautions: CAUTIONS,
  };
}


/**
 * The result of a model with load cases: the governing case's full result (the case with the
 * highest |peak stress|, the first such in the model's order on a tie) with `loadCase` naming
 * it and `cases` summing up every case, each built by buildResult so every Kt goes through the
 * same withholding rules. One case without a name is buildResult's result unchanged.
 */
export function buildCasesResult(runs: readonly { analysis: Analysis; cert: Certified | null }[], file?: string): ResultJson {
  if (runs.length === 1 && runs[0].analysis.loadCase === undefined) return buildResult(runs[0].analysis, file, runs[0].cert);
  const each = runs.map((r) => buildResult(r.analysis, file, r.cert));
  let gov = 0;
  each.forEach((r, i) => {
    if (Math.abs(r.peak.stress) > Math.abs(each[gov].peak.stress)) gov = i;
  });
  const cases = each.map((r, i): ResultCase => {
    const a = runs[i].analysis;
    const c = r.convergence;
    return {
      name: a.loadCase ?? refuseUnnamedCase(),
      governing: i === gov,
      kt: r.kt,
      raisers: r.raisers.map((x) => ({ name: x.name, governing: x.governing, status: x.status, reason: x.reason, peak: x.peak, headline: x.headline, kt: x.kt })),
      peak: r.peak,
      load: r.load,
      convergence: { status: c.status, target: c.target, estimatedError: c.estimatedError, quantity: c.quantity, meshes: c.status === 'single-mesh' ? 1 : c.meshes.length, dofs: r.mesh.dofs },
      solve: { casesOnMesh: a.sharedSolve?.cases ?? refuseUnnamedCase(), factorisations: a.sharedSolve?.factorisations ?? refuseUnnamedCase() },
      warnings: r.warnings,
    };
  });
  return { ...each[gov], loadCase: cases[gov].name, cases };
}

function refuseUnnamedCase(): never {
  throw new InternalError('buildCasesResult: a load case without its name or its shared-solve record');
}

/** The material as used, and for a bundled grade where its values came from (src/model/materials.ts). */
function materialResult(mat: Model['material']) {
  const b = mat.basis;
  return {
    name: mat.name ?? null,
    E: mat.E,
    nu: mat.nu,
    yield: mat.yield ?? null,
    ultimate: mat.ultimate ?? null,
    grade: b
      ? {
          grade: b.grade,
          family: b.family,
          form: b.form,
          formGiven: b.formGiven,
          thicknessMm: b.thicknessMm,
          band: b.band,
          standard: b.standard,
          provenance: b.provenance,
          checkedIn: b.checkedIn,
          elasticSource: b.elasticSource,
          tableYieldMPa: b.yield,
          tableUltimateMPa: b.ultimate,
          tableUltimateMaxMPa: b.ultimateMax,
          unsetWhy: b.unsetWhy,
          description: describeBasis(b),
        }
      : null,
  };
}
