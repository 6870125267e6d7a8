/**
 * A sweep: every case of the --vary specification solved (certified by default), in parallel
 * on worker threads, each finished case kept at once in DIR/cases/ so an interrupted sweep
 * resumes where it stopped, then the Kt chart written: DIR/sweep.csv, DIR/sweep.json and a
 * plot of Kt against the dimensionless parameter with the published curve where one exists.
 */
import { existsSync, mkdirSync, readdirSync, readFileSync } from 'node:fs';
import { cpus } from 'node:os';
import { join } from 'node:path';
import { evaluateExpression } from '../model/params.js';
import { ModelError } from '../model/errors.js';
import { writeAtomic } from '../report/files.js';
import { allCases, caseKey, readSweepSource, type SweepSource, type Vary } from './cases.js';
import { solveCase, type CaseOptions, type CaseRow } from './solve-case.js';
import { decodeCaseFile, encodeCaseFile } from './case-file.js';
import { renderPng, renderSvg } from '../render/scene.js';
import { loadFonts } from '../render/font.js';
import { sweepScene, type SweepTitle } from './plot.js';
import { chartForFamily } from '../charts/library.js';
import { CasePool } from './pool.js';

export interface SweepOptions extends CaseOptions {
  vary: Vary[];
  outDir: string;
  jobs?: number;
  /** expression of the varied names (and model parameters) for the plot's x axis */
  x?: string;
  onProgress?: (row: CaseRow | { key: string; failed: string }, done: number, total: number) => void;
}

export interface SweepResult {
  rows: CaseRow[];
  failed: { key: string; message: string }[];
  reused: number;
  /** case files found but not reused (damaged, edited, or of no known form), with why */
  redone: string[];
  files: string[];
  xLabel: string;
}

/** The dimensionless parameter of a template family, when the sweep does not name one. */
const FAMILY_X: Record<string, string> = {
  'plate-with-hole-tension': 'd/W',
  'plate-with-elliptical-hole-tension': 'a/b',
  'stepped-bar-tension': 'r/d',
  'stepped-bar-bending': 'r/d',
  'u-notched-bar-tension': 'r/t',
  'edge-notched-bar-tension': 'r/t',
};

function fileName(key: string): string {
  return key.replace(/[^A-Za-z0-9=.,_-]/g, '_') + '.json';
}

function optionsSignature(src: SweepSource, opts: CaseOptions): string {
  return JSON.stringify({ model: src.signature, target: opts.target ?? 0.01, single: !!opts.singleMesh, element: opts.element ?? null, measure: opts.measure ?? null });
}

export async function runSweep(file: string, opts: SweepOptions): Promise<SweepResult> {
  const cases = allCases(opts.vary).map((values) => ({ key: caseKey(values), values }));
  const caseOpts: CaseOptions = { target: opts.target, singleMesh: opts.singleMesh, element: opts.element, measure: opts.measure };
  const jobs = Math.max(1, Math.min(opts.jobs ?? Math.min(2, cpus().length), cases.length));
  // The workers start first: they load their modules and read the model while this thread
  // reads it too and looks for the finished cases of an earlier run.
  const pool = jobs > 1 && CasePool.available() ? new CasePool(file, opts.vary, { ...caseOpts, allowDrawingOutside: opts.allowDrawingOutside }, jobs) : null;
  try {
    const src = readSweepSource(file, opts.vary, { allowDrawingOutside: opts.allowDrawingOutside });
    const dir = join(opts.outDir, 'cases');
    mkdirSync(dir, { recursive: true });
    const sig = optionsSignature(src, opts);
    const rows = new Map<string, CaseRow>();
    // Resume: a case file of the same model and options counts as done, if it reads back whole
    // (valid, checksum matching); anything else is solved again and said so.
    const redone: string[] = [];
    for (const name of existsSync(dir) ? readdirSync(dir) : []) {
      if (!name.endsWith('.json')) continue;
      let text: string;
      try {
        text = readFileSync(join(dir, name), 'utf8');
      } catch {
        continue;
      }
      const saved = decodeCaseFile(text);
      if (!saved.ok) {
        redone.push(`${name} (${saved.why})`);
        continue;
      }
      if (saved.signature === sig && cases.some((c) => c.key === saved.row.key)) rows.set(saved.row.key, saved.row);
    }
    const reused = rows.size;
    const todo = cases.filter((c) => !rows.has(c.key));
    const failed: { key: string; message: string }[] = [];
    let done = reused;
    const keep = (row: CaseRow) => {
      rows.set(row.key, row);
      writeAtomic(join(dir, fileName(row.key)), encodeCaseFile(sig, row));
      done++;
      opts.onProgress?.(row, done, cases.length);
    };
    const fail = (key: string, message: string) => {
      failed.push({ key, message });
      done++;
      opts.onProgress?.({ key, failed: message }, done, cases.length);
    };
    if (pool) {
      const solving = pool.solveAll(todo, (c, reply) => (reply.ok ? keep(reply.row) : fail(c.key, reply.message)));
      // this thread waits for the workers: the chart's fonts are read now, not after the last case
      if (todo.length > 0) loadFonts();
      await solving;
    } else {
      for (const c of todo) {
        try {
          keep(solveCase(src, c.key, c.values, caseOpts));
        } catch (err) {
          fail(c.key, (err as Error).message);
        }
      }
    }
    const ordered = cases.map((c) => rows.get(c.key)).filter((r): r is CaseRow => !!r);
    const xExpr = opts.x ?? (src.kind === 'template' && src.model.chart ? FAMILY_X[src.model.chart.family] : undefined) ?? opts.vary[0].name;
    const files = writeSweepFiles(opts.outDir, src, ordered, opts.vary, xExpr);
    return { rows: ordered, failed, reused, redone, files, xLabel: xExpr };
  } finally {
    await pool?.close();
  }
}

/**
 * The family a sweep runs over: for a template model, the title of its chart family (the
 * model's own title names one case's dimensions, "d/W = 0.2" say), with the dimensions held;
 * for a model with parameters, its title and the parameters held.
 */
function sweepTitle(src: SweepSource): SweepTitle {
  if (src.kind === 'template' && src.model.chart) {
    const found = chartForFamily(src.model.chart.family, src.model.chart.dims);
    const dims = { ...src.model.chart.dims };
    delete dims.thickness;
    const name = found?.chart.title ?? src.model.chart.family;
    return { family: name.charAt(0).toUpperCase() + name.slice(1), fixed: dims };
  }
  return { family: src.model.title ?? src.file, fixed: { ...(src.model.parameters ?? {}) } };
}

/** x of a case: the expression evaluated with the case's values and the model's parameters or dimensions. */
function caseX(src: SweepSource, row: CaseRow, xExpr: string): number {
  const base = src.kind === 'parameters' ? (src.model.parameters ?? {}) : (src.model.chart?.dims ?? {});
  try {
    return evaluateExpression(xExpr, { ...base, ...row.values });
  } catch (e) {
    throw new ModelError('--x', `the x axis "${xExpr}" cannot be evaluated: ${(e as Error).message}`, 'give --x an expression of the varied names and the model parameters');
  }
}

function writeSweepFiles(outDir: string, src: SweepSource, rows: CaseRow[], vary: Vary[], xExpr: string): string[] {
  const names = vary.map((v) => v.name);
  const num = (v: number | null) => (v === null || !Number.isFinite(v) ? '' : Number(v.toPrecision(8)).toString());
  const lines = [[...names, 'x', 'kt_net', 'kt_gross', 'kt_error', 'chart_kt', 'status', 'peak', 'peak_x', 'peak_y', 'feature', 'dofs', 'meshes', 'time_ms'].join(',')];
  for (const r of rows) {
    lines.push(
      [...names.map((n) => num(r.values[n])), num(caseX(src, r, xExpr)), num(r.ktNet), num(r.ktGross), num(r.error), num(r.chartKt), r.status, num(r.peak), num(r.peakX), num(r.peakY), `"${r.feature.replace(/"/g, '""')}"`, String(r.dofs), String(r.meshes), num(r.timeMs)].join(','),
    );
  }
  const csv = join(outDir, 'sweep.csv');
  writeAtomic(csv, lines.join('\n') + '\n');
  const json = join(outDir, 'sweep.json');
  writeAtomic(json, JSON.stringify({ model: src.file, vary, x: xExpr, rows: rows.map((r) => ({ ...r, x: caseX(src, r, xExpr) })) }, null, 2) + '\n');
  const scene = sweepScene(rows.map((r) => ({ ...r, x: caseX(src, r, xExpr) })), vary, xExpr, sweepTitle(src), { model: `${src.model.title ?? 'untitled model'} (${src.file}), the base of the sweep`, createdAt: new Date().toISOString() });
  const svg = join(outDir, 'sweep.svg');
  writeAtomic(svg, renderSvg(scene));
  const png = join(outDir, 'sweep.png');
  writeAtomic(png, renderPng(scene).toPng());
  return [csv, json, svg, png];
}
