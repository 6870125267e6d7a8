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
import { STRESS_MEASURES, type StressMeasure } from '../model/schema.js';
import type { Analysis } from '../pipeline/analyse.js';
import { writeAtomic } from '../report/atomic.js';
import { prepareOutputDir, RESULT_FILES, type OutputOptions } from '../report/files.js';
import { reportHtml } from '../report/html.js';
import { reportPictures } from '../report/report-pictures.js';
import { MATRIX_FILES, writeMatrixFiles } from '../report/matrix.js';
import { pictureFileNames, PICTURES, picturesFor, writePictures, type PictureOptions, type PictureSet } from '../report/pictures.js';
import { readSaved, SAVED_FILE, type PlotSource } from '../report/saved.js';

/** The names `--only` takes, from the registry of pictures (src/report/pictures.ts). */
const PICTURE_NAMES: readonly string[] = PICTURES.map((p) => p.name);

export interface PictureFlags {
  pictureSize?: string;
  /** the old name of --picture-size, kept working with a notice */
  size?: string;
  measure?: StressMeasure;
  range?: string;
  window?: string;
  mesh?: boolean;
  iso?: boolean;
  line?: string;
}

function numbers(text: string, count: number, what: string, example: string): number[] {
  const parts = text.split(/[,:\s]+/).filter(Boolean).map(Number);
  if (parts.length !== count || !parts.every(Number.isFinite)) throw new ModelError(what, `"${text}" is not ${count} numbers`, `write for example ${what} ${example}`);
  return parts;
}

/** "1600x1000" -> [1600, 1000], each 200 .. 8000 pixels. */
function parseSize(text: string): [number, number] {
  const m = /^\s*(\d+)\s*[xX*]\s*(\d+)\s*$/.exec(text);
  const w = m ? Number(m[1]) : NaN;
  const h = m ? Number(m[2]) : NaN;
  if (!(w >= 200 && w <= 8000 && h >= 200 && h <= 8000)) throw new ModelError('--picture-size', `"${text}" is not a picture size raiser draws`, 'give width x height in pixels, each 200 to 8000, such as 1600x1000');
  return [w, h];
}

/**
 * The picture size asked for: --picture-size, or its old name --size (which `raiser size`, the
 * sizing command, made confusing), said once on stderr so --json output stays clean.
 */
function pictureSizeText(flags: PictureFlags): string | undefined {
  return flags.pictureSize ?? flags.size;
}

/** The one-line notice for the old option name; call once per run. */
function noteDeprecatedSize(flags: object): void {
  if ((flags as PictureFlags).size !== undefined) process.stderr.write('raiser: --size is the old name of --picture-size and will be removed; write --picture-size\n');
}

/** The hidden old name of --picture-size. */
function deprecatedSizeOption(): Option {
  return new Option('--size <WxH>', 'old name of --picture-size').hideHelp();
}

/** The picture options from command-line flags. */
function pictureOptions(flags: PictureFlags, measureDefault?: StressMeasure): PictureOptions {
  const o: PictureOptions = {};
  const size = pictureSizeText(flags);
  if (size) [o.width, o.height] = parseSize(size);
  o.measure = flags.measure ?? measureDefault;
  if (flags.range) {
    const [lo, hi] = numbers(flags.range, 2, '--range', '0:300');
    if (!(hi > lo)) throw new ModelError('--range', `the range ${flags.range} is empty`, 'give the lower value first: --range 0:300');
    o.range = [lo, hi];
  }
  if (flags.window) {
    const [x0, y0, x1, y1] = numbers(flags.window, 4, '--window', '100,20,200,60');
    if (!(x1 > x0 && y1 > y0)) throw new ModelError('--window', `the window ${flags.window} is empty`, 'give xmin,ymin,xmax,ymax in model units');
    o.window = [x0, y0, x1, y1];
  }
  if (flags.mesh !== undefined) o.meshLines = flags.mesh;
  if (flags.iso === false) o.iso = false;
  if (flags.line) {
    const [x0, y0, x1, y1] = numbers(flags.line, 4, '--line', '150,0,150,60');
    if (x0 === x1 && y0 === y1) throw new ModelError('--line', 'the line has no length', 'give two different end points x0,y0,x1,y1');
    o.line = [x0, y0, x1, y1];
  }
  return o;
}

/** What `raiser solve -o` writes besides result.json and nodes.csv, from the solve flags. */
export function solveOutputOptions(flags: object): OutputOptions {
  const f = flags as PictureFlags & { pictures?: boolean };
  // --measure on solve picks the analysis measure; the pictures follow the analysis.
  return { pictures: f.pictures !== false, pictureOptions: pictureOptions({ pictureSize: f.pictureSize, size: f.size }) };
}

/**
 * Readies the output folders of `raiser solve` before anything is solved: -o and
 * --export-matrix checked, made and locked, and files there not replaced without --force, so a
 * bad folder is said at once rather than after the solve. Every file the solve may write is
 * checked (the convergence picture unless --single-mesh), so nothing is refused afterwards.
 */
export function prepareSolveOutputs(flags: object): void {
  const f = flags as { out?: string; exportMatrix?: string; force?: boolean; pictures?: boolean; singleMesh?: boolean; pdf?: boolean };
  const force = f.force ?? false;
  // A picture size that cannot be drawn is refused now, not after the solve.
  noteDeprecatedSize(flags);
  solveOutputOptions(flags);
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

/** Adds the picture options of `raiser solve`. */
export function addSolvePictureOptions(cmd: Command): Command {
  return cmd
    .option('--no-pictures', 'with -o: write no pictures and no HTML report (results, saved solution and VTU only)')
    .option('--picture-size <WxH>', 'with -o: picture size in pixels (default 1600x1000)')
    .addOption(deprecatedSizeOption())
    .option('--export-matrix <dir>', 'write the stiffness matrix and load vector (Matrix Market) and the DOF map into this folder');
}

export function plotCommand(program: Command, setCode: (c: number) => void): void {
  program
    .command('plot')
    .description(`draw the pictures again from a saved solution (${SAVED_FILE} written by solve -o, or its folder), without solving`)
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
