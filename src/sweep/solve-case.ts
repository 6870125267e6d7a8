/** One sweep case, solved: shared by the worker threads and the single-thread path. */
import { compareWithChart } from '../charts/library.js';
import type { Model, StressMeasure } from '../model/schema.js';
import { analyseModel, type Analysis } from '../pipeline/analyse.js';
import { certifyModel, governingKt, type Certified, type GoverningKt } from '../pipeline/certify.js';
import { caseModel, type SweepSource } from './cases.js';

export interface CaseOptions {
  target?: number;
  singleMesh?: boolean;
  element?: 'linear' | 'quadratic';
  measure?: StressMeasure;
  /** let geometry.from name a drawing outside the model file's folder */
  allowDrawingOutside?: boolean;
}

export interface CaseRow {
  key: string;
  values: Record<string, number>;
  status: string;
  ktNet: number | null;
  ktGross: number | null;
  /** relative error band (null for one mesh) */
  error: number | null;
  peak: number;
  peakX: number;
  peakY: number;
  feature: string;
  dofs: number;
  meshes: number;
  /** the published chart value for this case, when the model comes from a template */
  chartKt: number | null;
  chartId: string | null;
  timeMs: number;
}

export function solveCase(src: SweepSource, key: string, values: Record<string, number>, opts: CaseOptions): CaseRow {
  return solveCaseFull(src, key, values, opts).row;
}

/** A case solved, with its model, analysis and certification kept (for writing its files). */
export interface SolvedCase {
  row: CaseRow;
  model: Model;
  analysis: Analysis;
  certified: Certified | null;
}

export function solveCaseFull(src: SweepSource, key: string, values: Record<string, number>, opts: CaseOptions): SolvedCase {
  const t0 = performance.now();
  let certified: Certified | null = null;
  const { model, drawing } = caseModel(src, values);
  let status = 'single-mesh';
  let error: number | null = null;
  let meshes = 1;
  let a;
  let kt: GoverningKt;
  if (opts.singleMesh) {
    a = analyseModel(model, { ...opts, drawing });
    kt = governingKt(a);
  } else {
    const c = certifyModel(model, { ...opts, target: opts.target ?? 0.01, drawing });
    certified = c;
    a = c.analysis;
    kt = governingKt(c);
    status = c.status;
    error = c.gci && Number.isFinite(c.gci.gci) && kt.value !== null ? c.gci.gci : null;
    meshes = c.meshes.length;
  }
  const cmp = model.chart ? compareWithChart(model.chart.family, model.chart.dims, { net: kt.net, gross: kt.gross }) : null;
  const row: CaseRow = {
    key,
    values,
    status,
    ktNet: kt.net,
    ktGross: kt.gross,
    error,
    peak: a.peak.stress,
    peakX: a.peak.x,
    peakY: a.peak.y,
    feature: a.peak.feature,
    dofs: 2 * a.mesh.nNodes,
    meshes,
    chartKt: cmp && Number.isFinite(cmp.value) ? cmp.value : null,
    chartId: cmp ? cmp.id : null,
    timeMs: performance.now() - t0,
  };
  return { row, model, analysis: a, certified };
}
