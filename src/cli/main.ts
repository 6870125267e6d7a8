/**
 * The command line: parses arguments, calls the library, prints. No analysis logic lives here.
 * Exit codes: 0 done, 2 bad input, 3 the model cannot be analysed as given, 1 internal fault.
 */
import { Command, CommanderError, Option } from 'commander';
import { STRESS_MEASURES, type StressMeasure } from '../model/schema.js';
import { AnalysisError, ModelError, ModelTooLargeError } from '../model/errors.js';
import { loadModelFileAndDrawing } from '../pipeline/load.js';
import { analyseModelCases, type Analysis } from '../pipeline/analyse.js';
import { certifyModelCases, type Certified } from '../pipeline/certify.js';
import { buildCasesResult, TOOL_VERSION } from '../report/result.js';
import { formatSummary } from '../report/summary.js';
import { prepareOutputDir, writeAtomic, writeResultFiles } from '../report/files.js';
import { environment, formatVerifyLine, formatVerifySummary, verifyReportMarkdown } from '../report/verify-report.js';
import { runVerify, verifyCases } from '../verify/suite.js';
import { join } from 'node:path';
import { totalmem } from 'node:os';
import { newCommand } from './new.js';
import { chartsCommand } from './charts.js';
import { sweepCommands } from './sweep.js';
import { meshCommand } from './mesh.js';
import { benchSolveCommand } from './bench-solve.js';
import { parseAccuracy } from './accuracy.js';
import { addressSpaceLimit } from './address-space.js';
import { addSolvePictureOptions, exportMatrixIfAsked, plotCommand, prepareSolveOutputs, solveOutputOptions } from './plot.js';
import { probeCommand } from './probe.js';
import { addSignOffOptions, applySignOff, checkSolvePdf, printPdfOf, reportCommand, EXIT_NO_PDF } from './report.js';

const EXIT = { ok: 0, internal: 1, badInput: 2, cannotAnalyse: 3, noPdf: EXIT_NO_PDF } as const;

interface SolveFlags {
  accuracy?: string;
  maxMemory?: string;
  singleMesh?: boolean;
  json?: boolean;
  out?: string;
  force?: boolean;
  measure?: StressMeasure;
  element?: 'linear' | 'quadratic';
  debug?: boolean;
  allowDrawingOutside?: boolean;
  pdf?: boolean;
  paper?: string;
}

/**
 * The default memory limit under a virtual memory limit (ulimit -v): 60% of it when that is
 * less than 60% of the machine, so a model too large is refused up front with its size said,
 * rather than failing in an allocation part way. Undefined: the analysis's own default.
 */
function defaultMemoryLimit(): number | undefined {
  const limit = addressSpaceLimit();
  return limit !== undefined && 0.6 * limit < 0.6 * totalmem() ? 0.6 * limit : undefined;
}

/** "8", "8GB", "512MB" -> bytes. */
function parseMemory(text: string): number {
  const m = /^\s*(\d*\.?\d+)\s*(GB|G|MB|M)?\s*$/i.exec(text);
  const v = m ? Number(m[1]) * (m[2] && /^m/i.test(m[2]) ? 2 ** 20 : 2 ** 30) : NaN;
  if (!(v > 0)) throw new ModelError('--max-memory', `"${text}" is not an amount of memory`, 'write --max-memory 8 (gigabytes) or 512MB');
  return v;
}

function runSolve(file: string, flags: SolveFlags): number {
  // The output folders are checked, made and locked before anything is read or solved.
  checkSolvePdf(flags);
  prepareSolveOutputs(flags);
  const loaded = loadModelFileAndDrawing(file, { allowDrawingOutside: flags.allowDrawingOutside });
  const { model, drawing, warnings } = loaded;
  applySignOff(model, flags);
  const opts = { measure: flags.measure, element: flags.element, maxMemoryBytes: flags.maxMemory ? parseMemory(flags.maxMemory) : defaultMemoryLimit(), drawing };
  // A problem found while building the geometry or the mesh is placed in the model file too.
  const placed = <T>(work: () => T): T => {
    try {
      return work();
    } catch (e) {
      throw e instanceof ModelError || e instanceof ModelTooLargeError ? loaded.locate(e) : e;
    }
  };
  // One run per load case (one for a model of plain loads), all cases on shared meshes.
  let runs: { analysis: Analysis; cert: Certified | null }[];
  if (flags.singleMesh) {
    runs = placed(() => analyseModelCases(model, opts)).map((analysis) => ({ analysis, cert: null }));
  } else {
    runs = placed(() => certifyModelCases(model, { ...opts, target: parseAccuracy(flags.accuracy ?? '1%') })).map((cert) => ({ analysis: cert.analysis, cert }));
    for (const { analysis, cert } of runs) {
      if (cert!.status === 'not-converged') {
        analysis.warnings.push(`the accuracy target ${(100 * cert!.target).toPrecision(2)}% was not met; the error band shown is what the meshes support`);
      }
    }
  }
  for (const { analysis } of runs) analysis.warnings.unshift(...warnings.map((w) => w.describe()));
  const result = buildCasesResult(runs, file);
  // the files and pictures are of the governing case (result.loadCase), the summary names it
  const analysis = runs.find((r) => r.analysis.loadCase === result.loadCase)!.analysis;
  let written: string[] = [];
  if (flags.out !== undefined) written = writeResultFiles(flags.out, analysis, result, flags.force ?? false, solveOutputOptions(flags));
  written.push(...exportMatrixIfAsked(flags, analysis));
  if (flags.json) {
    process.stdout.write(JSON.stringify(result, null, 2) + '\n');
  } else {
    process.stdout.write(formatSummary(result) + '\n');
    if (written.length) process.stdout.write(`\n  wrote ${written.join(', ')}\n`);
  }
  return EXIT.ok;
}

function runVerifyCommand(flags: { json?: boolean; out?: string; force?: boolean; only?: string }): number {
  const only = flags.only ? flags.only.split(',').map((x) => x.trim()).filter(Boolean) : undefined;
  if (flags.out !== undefined) prepareOutputDir(flags.out, ['verify-report.md', 'verify.json'], flags.force ?? false);
  if (!flags.json) process.stdout.write(`raiser ${TOOL_VERSION} verification suite\n`);
  const rows = runVerify(only, flags.json ? undefined : (r) => process.stdout.write(formatVerifyLine(r) + '\n'));
  if (rows.length === 0) throw new ModelError('--only', `no verification case starts with ${flags.only}`, `the cases are ${verifyCases().map((c) => c.id).join(', ')}`);
  const summary = { environment: environment(), pass: rows.every((r) => r.pass), rows };
  if (flags.out !== undefined) {
    writeAtomic(join(flags.out, 'verify-report.md'), verifyReportMarkdown(rows));
    writeAtomic(join(flags.out, 'verify.json'), JSON.stringify(summary, null, 2) + '\n');
  }
  if (flags.json) process.stdout.write(JSON.stringify(summary, null, 2) + '\n');
  else {
    process.stdout.write(formatVerifySummary(rows) + '\n');
    if (flags.out !== undefined) process.stdout.write(`  wrote ${join(flags.out, 'verify-report.md')} and ${join(flags.out, 'verify.json')}\n`);
  }
  // A failed case means this installation does not reproduce a published value: a fault.
  return summary.pass ? EXIT.ok : EXIT.internal;
}

/** Runs the program; returns the exit code (the process is not exited here, so tests can call it). */
export async function main(argv: string[]): Promise<number> {
  let code: number = EXIT.ok;
  let debug = argv.includes('--debug');
  const program = new Command();
  program
    .name('raiser')
    .description('Stress concentration factors of flat parts by finite elements')
    .version(TOOL_VERSION)
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) });

  program
    .command('solve')
    .description('mesh, solve and report the peak stress, nominal stress and Kt of a model file')
    .argument('<model>', 'model file (JSON)')
    .option('--accuracy <target>', 'refine until the estimated error of the peak (and Kt) is below this, e.g. 0.5% (default 1%)')
    .option('--single-mesh', 'solve on one mesh only, without the convergence study (no error estimate)')
    .option('--max-memory <GB>', 'refuse models estimated to need more memory than this (default 60% of this machine)')
    .option('--json', 'print the result as one JSON object on stdout, nothing else')
    .option('-o, --out <dir>', 'write result files (result.json, nodes.csv, the saved solution, VTU, pictures, report.html) into this folder')
    .option('--force', 'replace result files that already exist in the output folder')
    .addOption(new Option('--measure <measure>', 'stress measure for the peak and Kt').choices(STRESS_MEASURES as unknown as string[]))
    .addOption(new Option('--element <type>', 'element type, overriding the model file').choices(['linear', 'quadratic']))
    .option('--debug', 'show internal details (stack traces) on errors')
    .option('--allow-drawing-outside', 'let geometry.from read a drawing outside the model file\'s folder (an absolute path, or one through ..)')
    .action(async (file: string, flags: SolveFlags) => {
      debug = debug || !!flags.debug;
      code = runSolve(file, flags);
      if (code === EXIT.ok && flags.pdf && flags.out !== undefined) code = await printPdfOf(flags.out, flags, !!flags.json);
    });

  newCommand(program, (c) => (code = c));
  chartsCommand(program, (c) => (code = c));
  sweepCommands(program, (c) => (code = c));
  addSolvePictureOptions(program.commands.find((c) => c.name() === 'solve')!);
  addSignOffOptions(program.commands.find((c) => c.name() === 'solve')!, true);
  plotCommand(program, (c) => (code = c));
  reportCommand(program, (c) => (code = c));
  probeCommand(program, (c) => (code = c));
  meshCommand(program, (c) => (code = c));
  benchSolveCommand(program, (c) => (code = c));

  program
    .command('verify')
    .description('run the verification suite: published and closed-form cases, with sources and tolerances')
    .option('--json', 'print the rows as one JSON object on stdout, nothing else')
    .option('-o, --out <dir>', 'write verify-report.md and verify.json into this folder')
    .option('--force', 'replace report files that already exist')
    .option('--only <ids>', 'run only the cases whose id starts with one of these (comma separated)')
    .action((flags: { json?: boolean; out?: string; force?: boolean; only?: string }) => {
      code = runVerifyCommand(flags);
    });

  try {
    await program.parseAsync(argv, { from: 'user' });
  } catch (err) {
    return reportError(err, debug);
  }
  return code;
}

/** An allocation that the engine or the system refused: not a bug, a model too large for the memory allowed. */
function outOfMemory(err: unknown): boolean {
  return err instanceof RangeError && /could not allocate memory|Array buffer allocation failed|Invalid typed array length|out of memory/i.test(err.message);
}

function reportError(err: unknown, debug: boolean): number {
  if (err instanceof CommanderError) {
    // commander has already printed its message (help and version exit with code 0).
    return err.exitCode === 0 ? EXIT.ok : EXIT.badInput;
  }
  if (err instanceof ModelError) {
    process.stderr.write(`raiser: bad input: ${err.describe()}\n`);
    if (debug && err.stack) process.stderr.write(err.stack + '\n');
    return EXIT.badInput;
  }
  if (err instanceof AnalysisError) {
    process.stderr.write(`raiser: cannot analyse: ${err.describe()}\n`);
    if (debug && err.stack) process.stderr.write(err.stack + '\n');
    return EXIT.cannotAnalyse;
  }
  if (outOfMemory(err)) {
    const limit = addressSpaceLimit();
    process.stderr.write(
      `raiser: cannot analyse: the analysis needs more memory than this process may use (${(err as Error).message})${limit !== undefined ? `; its address space is limited to ${(limit / 2 ** 30).toFixed(1)} GB (ulimit -v)` : ''}\n  fix: coarsen the mesh (mesh.size, mesh.raiserSize), lower --max-memory so the model is refused or solved iteratively, or raise the limit\n`,
    );
    if (debug && (err as Error).stack) process.stderr.write((err as Error).stack + '\n');
    return EXIT.cannotAnalyse;
  }
  const e = err as Error;
  process.stderr.write(`raiser: internal fault: ${e?.message ?? String(err)}\n  this is a bug in raiser, not in your model; please report it with the model file\n`);
  if (debug && e?.stack) process.stderr.write(e.stack + '\n');
  return EXIT.internal;
}
