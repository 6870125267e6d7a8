/**
 * `raiser report DIR`: writes report.html again from the saved solution in DIR (a folder written
 * by `raiser solve -o`), with the sign-off fields of the options, and with --pdf prints it to
 * report.pdf through Chromium. Also the sign-off options and --pdf of `raiser solve`.
 * Parsing and calling only: the report is made in src/report/html.ts, the PDF in src/report/pdf.ts.
 */
import { statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { Command, Option } from 'commander';
import { ModelError } from '../model/errors.js';
import type { Model, ReportInfo } from '../model/schema.js';
import { prepareOutputDir, writeAtomic } from '../report/files.js';
import { reportHtml } from '../report/html.js';
import { PdfError, printReportPdf, type Paper } from '../report/pdf.js';
import { reportPictures } from '../report/report-pictures.js';
import { readSaved, SAVED_FILE } from '../report/saved.js';

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

function paperOf(flags: PdfFlags): Paper {
  return flags.paper === 'letter' ? 'Letter' : 'A4';
}

/**
 * Prints DIR/report.html to DIR/report.pdf and says so; when it cannot, says why and how to get a
 * browser on stderr and returns EXIT_NO_PDF (everything else stands).
 */
export async function printPdfOf(dir: string, flags: PdfFlags, quiet = false): Promise<number> {
  const pdf = join(dir, 'report.pdf');
  try {
    const got = await printReportPdf(join(dir, 'report.html'), pdf, paperOf(flags));
    if (!quiet) process.stdout.write(`  wrote ${pdf} (${got.pages} page${got.pages === 1 ? '' : 's'}, ${paperOf(flags)}, printed by ${got.chromium})\n`);
    return 0;
  } catch (e) {
    if (!(e instanceof PdfError)) throw e;
    process.stderr.write(`raiser: report.pdf not written: ${e.message}\n  fix: ${e.fix}\n  ${join(dir, 'report.html')} was written and stands.\n`);
    return EXIT_NO_PDF;
  }
}

/** `solve --pdf` needs `-o`: said before anything is solved. */
export function checkSolvePdf(flags: object): void {
  const f = flags as PdfFlags & { out?: string; pictures?: boolean };
  if (f.pdf && f.out === undefined) throw new ModelError('--pdf', 'a PDF report needs an output folder', 'add -o DIR (report.pdf is written beside report.html)');
  if (f.pdf && f.pictures === false) throw new ModelError('--pdf', '--no-pictures writes no report to print', 'leave out --no-pictures, or --pdf');
}

async function runReport(dir: string, flags: SignOffFlags & PdfFlags): Promise<number> {
  let isDir = false;
  try {
    isDir = statSync(dir).isDirectory();
  } catch {
    /* readSaved says what is wrong */
  }
  // A saved solution's file stands for its folder; a path that is neither is said by readSaved.
  const src = readSaved(dir);
  if (!isDir) dir = dirname(dir);
  applySignOff(src.model, flags);
  // report.html and report.pdf are what this command makes: they are replaced.
  prepareOutputDir(dir, [], true);
  // the report draws its own copies of the pictures for its column; the picture files stay as they are
  const html = join(dir, 'report.html');
  writeAtomic(html, reportHtml(src, reportPictures(src)));
  process.stdout.write(`raiser report: ${src.result.model.title ?? 'untitled model'}\n  wrote ${html}\n`);
  return flags.pdf ? printPdfOf(dir, flags) : 0;
}

export function reportCommand(program: Command, setCode: (c: number) => void): void {
  const cmd = program
    .command('report')
    .description(`write report.html again from a saved solution (the folder solve -o wrote), with the sign-off fields, and with --pdf print it to report.pdf`)
    .argument('<dir>', `the folder holding ${SAVED_FILE} (or that file); report.html is written there`);
  addSignOffOptions(cmd, false).action(async (dir: string, flags: SignOffFlags & PdfFlags) => setCode(await runReport(dir, flags)));
}
