/**
 * The options `raiser solve` shares with `plot`, `report`, `sweep` and `size` (picture size,
 * sign-off fields, --pdf) and their parsing: kept apart from the commands that draw and write, so
 * declaring them loads nothing heavy.
 */
import { Option, type Command } from 'commander';
import { ModelError } from '../model/errors.js';
import type { Model, ReportInfo } from '../model/schema.js';
import type { StressMeasure } from '../model/measures.js';
import type { OutputOptions } from '../report/files.js';
import type { PictureOptions } from '../report/pictures.js';

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
export function noteDeprecatedSize(flags: object): void {
  if ((flags as PictureFlags).size !== undefined) process.stderr.write('raiser: --size is the old name of --picture-size and will be removed; write --picture-size\n');
}

/** The hidden old name of --picture-size. */
export function deprecatedSizeOption(): Option {
  return new Option('--size <WxH>', 'old name of --picture-size').hideHelp();
}

/** The picture options from command-line flags. */
export function pictureOptions(flags: PictureFlags, measureDefault?: StressMeasure): PictureOptions {
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

/** The picture options of `raiser solve` checked before anything is solved: a size that cannot be drawn is refused now, not after the solve. */
export function checkSolveOutputOptions(flags: object): void {
  noteDeprecatedSize(flags);
  solveOutputOptions(flags);
}

/** Adds the picture options of `raiser solve`. */
export function addSolvePictureOptions(cmd: Command): Command {
  return cmd
    .option('--no-pictures', 'with -o: write no pictures and no HTML report (results, saved solution and VTU only)')
    .option('--picture-size <WxH>', 'with -o: picture size in pixels (default 1600x1000)')
    .addOption(deprecatedSizeOption())
    .option('--export-matrix <dir>', 'write the stiffness matrix and load vector (Matrix Market) and the DOF map into this folder');
}

/** Exit status when everything else was written but the PDF could not be printed. */
export const EXIT_NO_PDF = 4;

export interface SignOffFlags {
  project?: string;
  part?: string;
  revision?: string;
  reportDate?: string;
  preparedBy?: string;
  checkedBy?: string;
  approvedBy?: string;
}

export interface PdfFlags {
  pdf?: boolean;
  paper?: string;
}

const FIELDS: [keyof SignOffFlags, keyof ReportInfo][] = [
  ['project', 'project'],
  ['part', 'part'],
  ['revision', 'revision'],
  ['reportDate', 'date'],
  ['preparedBy', 'preparedBy'],
  ['checkedBy', 'checkedBy'],
  ['approvedBy', 'approvedBy'],
];

/** The model's `report` object with the options given on the command line put over it. */
export function applySignOff(model: Model, flags: object): void {
  const f = flags as SignOffFlags;
  const info: ReportInfo = { ...(model.report ?? {}) };
  let any = false;
  for (const [flag, field] of FIELDS) {
    const v = f[flag];
    if (v === undefined) continue;
    if (v.trim() === '') throw new ModelError(`--${flag.replace(/[A-Z]/g, (c) => '-' + c.toLowerCase())}`, 'the value is empty', 'give the text, in quotes if it has spaces');
    info[field] = v;
    any = true;
  }
  if (any || model.report) model.report = info;
}

/** Adds the sign-off options and --pdf (to `raiser solve` and `raiser report`). */
export function addSignOffOptions(cmd: Command, withOut: boolean): Command {
  const w = withOut ? 'with -o: ' : '';
  return cmd
    .option('--project <text>', 'project name for the report (over the model\'s report.project)')
    .option('--part <number>', 'part or drawing number for the report (over report.part)')
    .option('--revision <rev>', 'revision of the analysis for the report (over report.revision)')
    .option('--report-date <date>', 'date of the revision as printed in the report (over report.date; default: the date of the analysis)')
    .option('--prepared-by <name>', 'engineer who prepared the analysis (over report.preparedBy)')
    .option('--checked-by <name>', 'engineer who checked it (over report.checkedBy)')
    .option('--approved-by <name>', 'who approved it (over report.approvedBy)')
    .option('--pdf', `${w}also print report.pdf through a headless Chromium (RAISER_CHROMIUM or /usr/bin/chromium)`)
    .addOption(new Option('--paper <size>', `${w}paper size of report.pdf`).choices(['a4', 'letter']).default('a4'));
}

/** `solve --pdf` needs `-o`: said before anything is solved. */
export function checkSolvePdf(flags: object): void {
  const f = flags as PdfFlags & { out?: string; pictures?: boolean };
  if (f.pdf && f.out === undefined) throw new ModelError('--pdf', 'a PDF report needs an output folder', 'add -o DIR (report.pdf is written beside report.html)');
  if (f.pdf && f.pictures === false) throw new ModelError('--pdf', '--no-pictures writes no report to print', 'leave out --no-pictures, or --pdf');
}
