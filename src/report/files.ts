/**
 * Result files. Each is written to a temporary name in the same folder and renamed into place,
 * so an interrupted run never leaves a half-written file under the final name; existing
 * results are not replaced unless the caller says so. A solution's result.json is written last.
 */
import { existsSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { InternalError, ModelError } from '../model/errors.js';
import type { Analysis } from '../pipeline/analyse.js';
import { measureField } from '../post/peak.js';
import type { ResultJson } from './result-json.js';
import { startReportHtml } from './report-thread.js';
import { pictureFileNames, standardPictures, writePictures, type PictureOptions } from './pictures.js';
import { encodeSaved, plotSource, SAVED_FILE, type PlotSource } from './saved.js';
import { vtuText } from './vtu.js';
import { removeStaleTemporaries, writeAtomic } from './atomic.js';
import { checkOutputDir, lockOutputDir, makeOutputDir, processAlive } from './output-dir.js';

/**
 * Readies an output folder before any work: checks it (a writable folder, or one that can be
 * made), makes it, locks it against another run, and refuses to overwrite `names` unless `force`.
 */
export function prepareOutputDir(dir: string, names: string[], force: boolean, option = '-o'): void {
  checkOutputDir(dir, option);
  makeOutputDir(dir, option);
  lockOutputDir(dir, option);
  // Temporary files left by an interrupted run are never results: remove them.
  removeStaleTemporaries(dir, processAlive);
  if (force) return;
  const taken = names.filter((n) => existsSync(join(dir, n)));
  if (taken.length > 0) {
    throw new ModelError(option, `the output folder ${dir} already holds ${taken.join(', ')}`, `pass --force to replace them, or choose another folder with ${option}`);
  }
}

/** Atomic writes live in ./atomic.ts; re-exported for the callers that write beside result files. */
export { writeAtomic };

/** Nodal results as CSV: position, displacement, recovered stresses and measures. */
function nodalCsv(a: Analysis): string {
  const n = a.mesh.nNodes;
  const s1 = measureField(a.stress, 'max-principal', a.szzFactor);
  const s2 = measureField(a.stress, 'min-principal', a.szzFactor);
  const vm = measureField(a.stress, 'von-mises', a.szzFactor);
  const tr = measureField(a.stress, 'tresca', a.szzFactor);
  const lines = ['node,x,y,ux,uy,sxx,syy,sxy,s1,s2,von_mises,tresca'];
  const num = (v: number) => {
    if (!Number.isFinite(v)) throw new InternalError(`a nodal result is ${v}: the results are not written`);
    return Number(v.toPrecision(10)).toString();
  };
  for (let i = 0; i < n; i++) {
    lines.push(
      [i, a.mesh.nodes[2 * i], a.mesh.nodes[2 * i + 1], a.u[2 * i], a.u[2 * i + 1], a.stress[3 * i], a.stress[3 * i + 1], a.stress[3 * i + 2], s1[i], s2[i], vm[i], tr[i]]
        .map((v, k) => (k === 0 ? String(v) : num(v)))
        .join(','),
    );
  }
  return lines.join('\n') + '\n';
}

export const RESULT_FILES = ['result.json', 'nodes.csv'];

export interface OutputOptions {
  /** the pictures and the HTML report (default true) */
  pictures?: boolean;
  /** picture size, measure, range, window, mesh lines, iso-lines */
  pictureOptions?: PictureOptions;
  /** when the analysis ran (ISO 8601; default now) */
  createdAt?: string;
}

/** Every file writeResultFiles writes with these options. */
function resultFileNames(result: ResultJson, opts: OutputOptions = {}): string[] {
  const names = [...RESULT_FILES, SAVED_FILE, 'result.vtu'];
  if (opts.pictures !== false) names.push(...pictureFileNames(result.convergence.meshes.length >= 2), 'report.html');
  return names;
}

/**
 * result.json, nodes.csv, the saved solution (for raiser plot), the VTU file, and unless
 * opts.pictures is false the pictures (PNG and SVG) and the HTML report.
 */
export function writeResultFiles(dir: string, a: Analysis, result: ResultJson, force: boolean, opts: OutputOptions = {}): string[] {
  prepareOutputDir(dir, resultFileNames(result, opts), force);
  // result.json is the mark of a finished set: an old one goes first and the new one comes last,
  // so a run stopped part way leaves a folder without result.json, never a new summary beside
  // old files.
  const json = join(dir, 'result.json');
  rmSync(json, { force: true });
  const written: string[] = [];
  const csv = join(dir, 'nodes.csv');
  writeAtomic(csv, nodalCsv(a));
  written.push(csv);
  const src = plotSource(a, result, opts.createdAt);
  const saved = join(dir, SAVED_FILE);
  writeAtomic(saved, encodeSaved(src));
  written.push(saved);
  const vtu = join(dir, 'result.vtu');
  writeAtomic(vtu, vtuText({ mesh: a.mesh, u: a.u, stress: a.stress, szzFactor: a.szzFactor, title: result.model.title ?? undefined }));
  written.push(vtu);
  if (opts.pictures !== false) written.push(...writePicturesAndReport(dir, src, opts.pictureOptions ?? {}));
  writeAtomic(json, JSON.stringify(result, null, 2) + '\n');
  written.unshift(json);
  return written;
}

/** The standard pictures and report.html from a solution (also what raiser plot redraws). */
function writePicturesAndReport(dir: string, src: PlotSource, pictureOptions: PictureOptions, report = true): string[] {
  // the report's pictures are drawn in a second thread while this one draws the picture files
  const pending = report ? startReportHtml(src) : null;
  let written: string[];
  try {
    written = writePictures(dir, standardPictures(src, pictureOptions)).written;
  } catch (err) {
    pending?.cancel();
    throw err;
  }
  if (pending) {
    const html = join(dir, 'report.html');
    writeAtomic(html, pending.finish());
    written.push(html);
  }
  return written;
}
