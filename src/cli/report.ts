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
import { addSignOffOptions, applySignOff, EXIT_NO_PDF, type PdfFlags, type SignOffFlags } from './output-options.js';

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

export function declareReport(cmd: Command, setCode: (c: number) => void): void {
  cmd.argument('<dir>', `the folder holding ${SAVED_FILE} (or that file); report.html is written there`);
  addSignOffOptions(cmd, false).action(async (dir: string, flags: SignOffFlags & PdfFlags) => setCode(await runReport(dir, flags)));
}
