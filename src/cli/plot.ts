/**
 * `raiser plot <saved>`: draws the pictures again from a saved solution (solution.raiser, or the
 * folder holding it) with other options, without solving. Also the picture options of
 * `raiser solve -o` and `--export-matrix`. Parsing and calling only; the drawing lives in
 * src/report/pictures.ts.
 */
import { dirname, join } from 'node:path';
import { statSync } from 'node:fs';
import { Command, Option } from 'commander';
import { ModelError } from '../model/errors.js';
import { STRESS_MEASURES, type StressMeasure } from '../model/measures.js';
import type { Analysis } from '../pipeline/analyse.js';
import { writeAtomic } from '../report/atomic.js';
import { prepareOutputDir, RESULT_FILES, type OutputOptions } from '../report/files.js';
import { reportHtml } from '../report/html.js';
import { reportPictures } from '../report/report-pictures.js';
import { MATRIX_FILES, writeMatrixFiles } from '../report/matrix.js';
import { pictureFileNames, PICTURES, picturesFor, writePictures, type PictureOptions, type PictureSet } from '../report/pictures.js';
import { readSaved, SAVED_FILE, type PlotSource } from '../report/saved.js';
import { checkSolveOutputOptions, deprecatedSizeOption, noteDeprecatedSize, pictureOptions, type PictureFlags } from './output-options.js';

/** The names `--only` takes, from the registry of pictures (src/report/pictures.ts). */
const PICTURE_NAMES: readonly string[] = PICTURES.map((p) => p.name);

/**
 * Readies the output folders of `raiser solve` before anything is solved: -o and
 * --export-matrix checked, made and locked, and files there not replaced without --force, so a
 * bad folder is said at once rather than after the solve. Every file the solve may write is
 * checked (the convergence picture unless --single-mesh), so nothing is refused afterwards.
 */
export function prepareSolveOutputs(flags: object): void {
  const f = flags as { out?: string; exportMatrix?: string; force?: boolean; pictures?: boolean; singleMesh?: boolean; pdf?: boolean };
  const force = f.force ?? false;
  checkSolveOutputOptions(flags);
  if (f.out !== undefined) {
    const names = [...RESULT_FILES, SAVED_FILE, 'result.vtu', ...(f.pictures !== false ? [...pictureFileNames(f.singleMesh !== true), 'report.html'] : []), ...(f.pdf ? ['report.pdf'] : [])];
    prepareOutputDir(f.out, names, force, '-o');
  }
  if (f.exportMatrix !== undefined) prepareOutputDir(f.exportMatrix, MATRIX_FILES, force, '--export-matrix');
}

/** --export-matrix DIR of `raiser solve`. */
export function exportMatrixIfAsked(flags: object, a: Analysis): string[] {
  const f = flags as { exportMatrix?: string; force?: boolean };
  return f.exportMatrix ? writeMatrixFiles(f.exportMatrix, a, f.force ?? false) : [];
}

function scenes(src: PlotSource, only: string[], o: PictureOptions): PictureSet[] {
  const want = new Set(only);
  const out: PictureSet[] = [];
  // in the registry's order, whatever the order of --only
  for (const kind of PICTURES) {
    if (!want.has(kind.name)) continue;
    const scene = kind.scene(src, o);
    if (!scene) {
      const why = kind.needsConvergence ? 'no convergence series (it was solved on a single mesh)' : `nothing to show in the ${kind.name} picture`;
      throw new ModelError('--only', `this solution has ${why}`, `leave ${kind.name} out of --only`);
    }
    out.push({ name: kind.stem, scene });
  }
  return out;
}

interface PlotFlags extends PictureFlags {
  out?: string;
  force?: boolean;
  only?: string;
  format?: string;
  report?: boolean;
}

function runPlot(saved: string, flags: PlotFlags): number {
  const src = readSaved(saved);
  noteDeprecatedSize(flags);
  const o = pictureOptions(flags);
  let only: string[];
  if (flags.only) {
    only = flags.only.split(',').map((x) => x.trim()).filter(Boolean);
    for (const n of only) if (!PICTURE_NAMES.includes(n)) throw new ModelError('--only', `there is no picture "${n}"`, `the pictures are ${PICTURE_NAMES.join(', ')}`);
  } else only = picturesFor(src.result.convergence.meshes.length >= 2).map((p) => p.name);
  const formats = (flags.format ?? 'png,svg').split(',').map((x) => x.trim());
  for (const fm of formats) if (fm !== 'png' && fm !== 'svg') throw new ModelError('--format', `"${fm}" is not a picture format raiser writes`, 'give png, svg or png,svg');
  let dir = flags.out;
  if (!dir) {
    let isDir = false;
    try {
      isDir = statSync(saved).isDirectory();
    } catch {
      /* readSaved has already said what is wrong */
    }
    dir = isDir ? saved : dirname(saved);
  }
  const sets = scenes(src, only, o);
  const names = sets.flatMap((s) => formats.map((fm) => `${s.name}.${fm}`));
  if (flags.report) names.push('report.html');
  prepareOutputDir(dir, names, flags.force ?? false);
  const { written } = writePictures(dir, sets, formats as ('png' | 'svg')[]);
  if (flags.report) {
    // The report draws its own pictures, for its column, whatever was asked for the files.
    const html = join(dir, 'report.html');
    writeAtomic(html, reportHtml(src, reportPictures(src)));
    written.push(html);
  }
  process.stdout.write(`raiser plot: ${src.result.model.title ?? 'untitled model'}\n  wrote ${written.join(', ')}\n`);
  return 0;
}

export function declarePlot(cmd: Command, setCode: (c: number) => void): void {
  cmd
    .argument('<saved>', `${SAVED_FILE} or the folder holding it`)
    .option('-o, --out <dir>', 'folder for the pictures (default: the folder of the saved solution)')
    .option('--force', 'replace pictures that already exist')
    .option('--only <names>', `pictures to draw, comma separated: ${PICTURE_NAMES.join(', ')} (default all)`)
    .option('--format <list>', 'png, svg or png,svg (default png,svg)')
    .addOption(new Option('--measure <measure>', 'stress measure to draw (default: the analysis measure)').choices(STRESS_MEASURES as unknown as string[]))
    .option('--range <lo:hi>', 'value range of the colours, e.g. 0:300 (values beyond take the end colours)')
    .option('--picture-size <WxH>', 'picture size in pixels (default 1600x1000)')
    .addOption(deprecatedSizeOption())
    .option('--window <x0,y0,x1,y1>', 'model region to show, in model length units')
    .option('--mesh', 'draw the element edges on the contour')
    .option('--no-mesh', 'leave the element edges off (also on the close-up)')
    .option('--no-iso', 'no iso-lines')
    .option('--line <x0,y0,x1,y1>', 'the line for the section picture (default: the net section)')
    .option('--report', 'also write report.html with the new pictures')
    .action((saved: string, flags: PlotFlags) => setCode(runPlot(saved, flags)));
}
