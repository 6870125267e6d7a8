/**
 * `raiser solve <model>`: mesh, solve and certify one model file, print the summary and (with -o)
 * write the result files. Parsing and calling only; the analysis lives in src/pipeline.
 */
import { Option, type Command } from 'commander';
import { totalmem } from 'node:os';
import { STRESS_MEASURES, type StressMeasure } from '../model/measures.js';
import { ModelError, ModelTooLargeError } from '../model/errors.js';
import { loadModelFileAndDrawing } from '../pipeline/load.js';
import { analyseModelCases, type Analysis } from '../pipeline/analyse.js';
import { certifyModelCases, type Certified } from '../pipeline/certify.js';
import { buildCasesResult } from '../report/result.js';
import { formatSummary } from '../report/summary.js';
import { parseAccuracy } from './accuracy.js';
import { addressSpaceLimit } from './address-space.js';
import { addSignOffOptions, addSolvePictureOptions, applySignOff, checkSolveOutputOptions, checkSolvePdf, solveOutputOptions } from './output-options.js';

/** The modules that write result files and draw pictures: loaded only when the solve writes something. */
async function loadWriters() {
  const [{ writeResultFiles }, { exportMatrixIfAsked, prepareSolveOutputs }, { printPdfOf }] = await Promise.all([import('../report/files.js'), import('./plot.js'), import('./report.js')]);
  return { writeResultFiles, exportMatrixIfAsked, prepareSolveOutputs, printPdfOf };
}
type Writers = Awaited<ReturnType<typeof loadWriters>>;

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
  exportMatrix?: string;
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

function runSolve(file: string, flags: SolveFlags, writers: Writers | undefined): number {
  // The output folders are checked, made and locked before anything is read or solved.
  checkSolvePdf(flags);
  if (writers) writers.prepareSolveOutputs(flags);
  else checkSolveOutputOptions(flags);
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
  if (writers) {
    if (flags.out !== undefined) written = writers.writeResultFiles(flags.out, analysis, result, flags.force ?? false, solveOutputOptions(flags));
    written.push(...writers.exportMatrixIfAsked(flags, analysis));
  }
  if (flags.json) {
    process.stdout.write(JSON.stringify(result, null, 2) + '\n');
  } else {
    process.stdout.write(formatSummary(result) + '\n');
    if (written.length) process.stdout.write(`\n  wrote ${written.join(', ')}\n`);
  }
  return 0;
}

export function declareSolve(cmd: Command, setCode: (c: number) => void): void {
  cmd
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
      const writers = flags.out !== undefined || flags.exportMatrix !== undefined ? await loadWriters() : undefined;
      let code = runSolve(file, flags, writers);
      if (code === 0 && writers && flags.pdf && flags.out !== undefined) code = await writers.printPdfOf(flags.out, flags, !!flags.json);
      setCode(code);
    });
  addSolvePictureOptions(cmd);
  addSignOffOptions(cmd, true);
}
