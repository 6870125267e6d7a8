/** `raiser sweep` and `raiser size`: Kt charts over a dimension, and the dimension that meets a limit. */
import { basename, join } from 'node:path';
import { Option, type Command } from 'commander';
import { ModelError } from '../model/errors.js';
import { STRESS_MEASURES, type StressMeasure } from '../model/measures.js';
import { fmt } from '../report/summary.js';
import { prepareOutputDir, writeAtomic, writeResultFiles } from '../report/files.js';
import { buildResult } from '../report/result.js';
import { formatJson } from '../model/format-json.js';
import { parseVary } from '../sweep/cases.js';
import { runSweep } from '../sweep/run.js';
import { runSize, solveChosen, type SizeOptions, type SizeResult } from '../sweep/size.js';
import { prepareSolveOutputs } from './plot.js';
import { solveOutputOptions } from './output-options.js';
import { parseAccuracy } from './accuracy.js';

const collect = (v: string, prev: string[] = []) => [...prev, v];

/** The chart files a sweep writes into its folder. */
const SWEEP_FILES = ['sweep.csv', 'sweep.json', 'sweep.png', 'sweep.svg'];

function parseJobs(text: string | undefined): number | undefined {
  const jobs = text === undefined ? undefined : Number(text);
  if (jobs !== undefined && !(Number.isInteger(jobs) && jobs >= 1 && jobs <= 64)) throw new ModelError('--jobs', `--jobs ${text} must be a whole number from 1 to 64`);
  return jobs;
}

interface SizeFlags {
  vary: string;
  ktMax?: string;
  stressMax?: string;
  kt: 'net' | 'gross';
  largest?: boolean;
  tolerance?: string;
  accuracy?: string;
  singleMesh?: boolean;
  measure?: StressMeasure;
  jobs?: string;
  out?: string;
  force?: boolean;
  json?: boolean;
  allowDrawingOutside?: boolean;
}

async function runSizeCommand(file: string, flags: SizeFlags): Promise<number> {
  const m = /^\s*([A-Za-z_][A-Za-z0-9_-]*)\s*=\s*([^:]+):([^:]+)\s*$/.exec(flags.vary);
  if (!m) throw new ModelError('--vary', `"${flags.vary}" is not a range`, 'write --vary name=low:high');
  const num = (s: string | undefined, what: string) => {
    if (s === undefined) return undefined;
    const v = Number(s);
    if (!Number.isFinite(v)) throw new ModelError(what, `${what} ${s} is not a number`);
    return v;
  };
  const tolerance = num(flags.tolerance, '--tolerance');
  if (tolerance !== undefined && !(tolerance > 0)) throw new ModelError('--tolerance', `--tolerance ${flags.tolerance} must be a positive length`, 'for example --tolerance 0.05 (in the model\'s length unit)');
  // The output folder is checked, made and locked before anything is solved.
  if (flags.out !== undefined) {
    prepareSolveOutputs({ out: flags.out, force: flags.force });
    prepareOutputDir(flags.out, SIZE_FILES, flags.force ?? false);
  }
  const opts: SizeOptions = {
    name: m[1],
    lo: num(m[2], '--vary')!,
    hi: num(m[3], '--vary')!,
    ktMax: num(flags.ktMax, '--kt-max'),
    stressMax: num(flags.stressMax, '--stress-max'),
    kt: flags.kt,
    largest: flags.largest,
    tolerance,
    jobs: parseJobs(flags.jobs),
    measure: flags.measure,
    singleMesh: flags.singleMesh,
    allowDrawingOutside: flags.allowDrawingOutside,
    target: flags.accuracy ? parseAccuracy(flags.accuracy) : undefined,
  };
  opts.onStep = (row, meets, units) => process.stderr.write(`  ${opts.name} = ${fmt(row.values[opts.name], 6)}${units.value ? ` ${units.value}` : ''}: Kt net ${row.ktNet === null ? '-' : fmt(row.ktNet, 4)}${row.error !== null ? ` +- ${fmt(100 * row.error, 2)}%` : ''}, peak ${fmt(row.peak)} ${units.stress}: ${meets ? 'meets' : 'fails'} the limit\n`);
  const res = await runSize(file, opts);
  const written: string[] = [];
  if (flags.out !== undefined && res.met) {
    const chosen = solveChosen(file, opts, res);
    const modelFile = join(flags.out, 'model.json');
    writeAtomic(modelFile, formatJson(chosen.model) + '\n');
    written.push(modelFile);
    const result = buildResult(chosen.analysis, modelFile, chosen.certified);
    written.push(...writeResultFiles(flags.out, chosen.analysis, result, flags.force ?? false, solveOutputOptions({})));
  }
  if (flags.out !== undefined) {
    const sizeFile = join(flags.out, 'size.json');
    writeAtomic(sizeFile, JSON.stringify(sizeJson(res), null, 2) + '\n');
    written.push(sizeFile);
  }
  if (flags.json) process.stdout.write(JSON.stringify({ ...sizeJson(res), written }, null, 2) + '\n');
  else {
    const L = res.units.length;
    const S = res.units.stress;
    process.stdout.write(`${res.message}\n`);
    if (res.valueUnit === null) process.stdout.write(`  (${opts.name} is a parameter of the model: its value is in the unit the model gives it; lengths there are in ${L})\n`);
    if (res.met && res.row) {
      const q = res.quantity.startsWith('Kt') ? (flags.kt === 'gross' ? res.row.ktGross : res.row.ktNet) : res.row.peak;
      const qUnit = res.quantity.startsWith('Kt') ? '' : ` ${S}`;
      process.stdout.write(`  ${res.quantity} there: ${fmt(q!, 4)}${qUnit}${res.row.error !== null ? ` +- ${fmt(100 * res.row.error, 2)}%` : ''}; limit ${res.limit}${qUnit}; margin ${fmt(100 * res.margin!, 3)}% of the limit${res.row.error !== null ? ' with the band' : ' (one mesh: no error band)'}\n`);
      process.stdout.write(`  peak ${fmt(res.row.peak, 4)} ${S} at (${fmt(res.row.peakX, 5)}, ${fmt(res.row.peakY, 5)}) ${L}, ${res.row.feature}; ${res.steps.length} solutions\n`);
      process.stdout.write(`  search stopped ${res.tolerance !== null ? `at the bracket tolerance ${res.tolerance}${res.valueUnit ? ` ${res.valueUnit}` : ''} (--tolerance)` : `at 0.2% of the range or within 2% of the limit (the default; --tolerance sets a bracket length)`}\n`);
    }
    if (written.length) process.stdout.write(`\n  wrote ${written.join(', ')}\n`);
  }
  return res.met ? 0 : 3;
}

/** What size.json and --json hold: the result without the analysis of the chosen design. */
function sizeJson(res: SizeResult): Omit<SizeResult, 'solved'> {
  const { solved: _solved, ...rest } = res;
  return rest;
}

/** Files `raiser size -o` writes besides those of `raiser solve -o`. */
const SIZE_FILES = ['model.json', 'size.json'];

export function declareSweep(cmd: Command, setCode: (c: number) => void): void {
  cmd
    .argument('<model>', 'model file (JSON) with the parameters, or made by raiser new')
    .requiredOption('--vary <name=from:to:count>', 'a parameter and its values (give two for a family of curves)', collect)
    .option('-o, --out <dir>', 'folder for the chart and the finished cases (default: <model>-sweep)')
    .option('--force', 'replace the chart files (sweep.csv, sweep.json, sweep.png, sweep.svg) of an earlier sweep in the folder; its finished cases of the same model and options are still reused')
    .option('--jobs <n>', 'worker threads (default: up to 2)')
    .option('--accuracy <target>', 'accuracy of each case (default 1%)')
    .option('--single-mesh', 'one mesh per case, no convergence study')
    .addOption(new Option('--measure <measure>', 'stress measure for the peak and Kt of every case').choices(STRESS_MEASURES as unknown as string[]))
    .option('--x <expression>', 'the plot\'s x axis as an expression of the names (default: the family\'s dimensionless ratio, or the first name)')
    .option('--json', 'print the rows as JSON on stdout at the end')
    .option('--allow-drawing-outside', 'let geometry.from read a drawing outside the model file\'s folder (an absolute path, or one through ..)')
    .action(async (file: string, flags: { vary: string[]; out?: string; force?: boolean; jobs?: string; accuracy?: string; singleMesh?: boolean; measure?: StressMeasure; x?: string; json?: boolean; allowDrawingOutside?: boolean }) => {
      const vary = flags.vary.map(parseVary);
      if (vary.length > 2) throw new ModelError('--vary', 'a sweep varies one or two names', 'drop the extra --vary');
      const jobs = parseJobs(flags.jobs);
      const out = flags.out ?? `${basename(file).replace(/\.json$/i, '')}-sweep`;
      // Checked, made and locked before anything is solved. The chart of an earlier sweep is not
      // replaced without --force; its finished cases are kept either way (an interrupted sweep has
      // cases but no chart yet, and a rerun finishes it).
      prepareOutputDir(out, SWEEP_FILES, flags.force ?? false);
      const t0 = performance.now();
      const res = await runSweep(file, {
        vary,
        outDir: out,
        jobs,
        target: flags.accuracy ? parseAccuracy(flags.accuracy) : undefined,
        singleMesh: flags.singleMesh,
        measure: flags.measure,
        allowDrawingOutside: flags.allowDrawingOutside,
        x: flags.x,
        onProgress: (row, done, total) => {
          if ('failed' in row) process.stderr.write(`  [${done}/${total}] ${row.key}: failed: ${row.failed}\n`);
          else process.stderr.write(`  [${done}/${total}] ${row.key}: Kt net ${row.ktNet === null ? 'none (singular)' : fmt(row.ktNet, 4)}${row.error !== null ? ` +- ${fmt(100 * row.error, 2)}%` : ''}${row.chartKt !== null ? `, chart ${fmt(row.chartKt, 4)}` : ''} (${fmt(row.timeMs / 1000, 2)} s)\n`);
        },
      });
      if (flags.json) process.stdout.write(JSON.stringify({ rows: res.rows, failed: res.failed, x: res.xLabel }, null, 2) + '\n');
      else {
        process.stdout.write(`sweep of ${file}: ${res.rows.length} cases (${res.reused} kept from an earlier run) in ${fmt((performance.now() - t0) / 1000, 3)} s\n`);
        for (const r of res.redone.slice(0, 10)) process.stdout.write(`  solved again: the case file ${r}\n`);
        if (res.redone.length > 10) process.stdout.write(`  solved again: ${res.redone.length - 10} more case files that did not read back whole\n`);
        for (const f of res.files) process.stdout.write(`  wrote ${f}\n`);
        process.stdout.write(`  finished cases are kept in ${join(out, 'cases')}: a rerun solves only what is missing\n`);
      }
      if (res.failed.length) {
        process.stderr.write(`raiser: ${res.failed.length} cases failed: ${res.failed.map((f) => `${f.key} (${f.message})`).join('; ')}\n`);
        setCode(3);
      } else setCode(0);
    });
}

export function declareSize(cmd: Command, setCode: (c: number) => void): void {
  cmd
    .argument('<model>', 'model file (JSON) with the parameter, or made by raiser new')
    .requiredOption('--vary <name=low:high>', 'the dimension and its range')
    .option('--kt-max <limit>', 'the largest Kt allowed')
    .option('--stress-max <limit>', 'the largest peak stress allowed (model stress units)')
    .addOption(new Option('--kt <which>', 'the Kt the limit applies to').choices(['net', 'gross']).default('net'))
    .option('--largest', 'find the largest value that meets the limit instead of the smallest')
    .option('--tolerance <length>', 'stop when the value is bracketed this closely, in the model\'s length unit (default: 0.2% of the range, or as soon as a meeting value is within 2% of the limit)')
    .option('--accuracy <target>', 'accuracy of each solution (default 0.5%)')
    .option('--single-mesh', 'one mesh per solution, no convergence study (no error band: the limit is checked on the value alone)')
    .addOption(new Option('--measure <measure>', 'stress measure').choices(STRESS_MEASURES as unknown as string[]))
    .option('--jobs <n>', 'solutions at a time on worker threads: each round tries that many values inside the bracket (default 1, plain bisection)')
    .option('-o, --out <dir>', 'write the chosen design\'s model file (model.json), size.json (the search) and the files of solve -o (result.json, saved solution, VTU, pictures, report.html) into this folder')
    .option('--force', 'replace files that already exist in the output folder')
    .option('--json', 'print the result as JSON')
    .option('--allow-drawing-outside', 'let geometry.from read a drawing outside the model file\'s folder (an absolute path, or one through ..)')
    .action(async (file: string, flags: SizeFlags) => {
      setCode(await runSizeCommand(file, flags));
    });
}
