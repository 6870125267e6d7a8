/** `raiser sweep` and `raiser size`: Kt charts over a dimension, and the dimension that meets a limit. */
import { basename, join } from 'node:path';
import { Option, type Command } from 'commander';
import { ModelError } from '../model/errors.js';
import { STRESS_MEASURES, type StressMeasure } from '../model/schema.js';
import { fmt } from '../report/summary.js';
import { prepareOutputDir } from '../report/files.js';
import { parseVary } from '../sweep/cases.js';
import { runSweep } from '../sweep/run.js';
import { runSize } from '../sweep/size.js';
import { parseAccuracy } from './accuracy.js';

const collect = (v: string, prev: string[] = []) => [...prev, v];

export function sweepCommands(program: Command, setCode: (c: number) => void): void {
  program
    .command('sweep')
    .description('solve a model over a range of a dimension and write a Kt chart: raiser sweep m.json --vary fillet=1:10:10')
    .argument('<model>', 'model file (JSON) with the parameters, or made by raiser new')
    .requiredOption('--vary <name=from:to:count>', 'a parameter and its values (give two for a family of curves)', collect)
    .option('-o, --out <dir>', 'folder for the chart and the finished cases (default: <model>-sweep)')
    .option('--jobs <n>', 'worker threads (default: up to 2)')
    .option('--accuracy <target>', 'accuracy of each case (default 1%)')
    .option('--single-mesh', 'one mesh per case, no convergence study')
    .option('--x <expression>', 'the plot\'s x axis as an expression of the names (default: the family\'s dimensionless ratio, or the first name)')
    .option('--json', 'print the rows as JSON on stdout at the end')
    .option('--allow-drawing-outside', 'let geometry.from read a drawing outside the model file\'s folder (an absolute path, or one through ..)')
    .action(async (file: string, flags: { vary: string[]; out?: string; jobs?: string; accuracy?: string; singleMesh?: boolean; x?: string; json?: boolean; allowDrawingOutside?: boolean }) => {
      const vary = flags.vary.map(parseVary);
      if (vary.length > 2) throw new ModelError('--vary', 'a sweep varies one or two names', 'drop the extra --vary');
      const jobs = flags.jobs === undefined ? undefined : Number(flags.jobs);
      if (jobs !== undefined && !(Number.isInteger(jobs) && jobs >= 1 && jobs <= 64)) throw new ModelError('--jobs', `--jobs ${flags.jobs} must be a whole number from 1 to 64`);
      const out = flags.out ?? `${basename(file).replace(/\.json$/i, '')}-sweep`;
      prepareOutputDir(out, [], true);
      const t0 = performance.now();
      const res = await runSweep(file, {
        vary,
        outDir: out,
        jobs,
        target: flags.accuracy ? parseAccuracy(flags.accuracy) : undefined,
        singleMesh: flags.singleMesh,
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

  program
    .command('size')
    .description('find the smallest (or largest) value of a dimension that meets a Kt or stress limit: raiser size m.json --vary fillet=1:20 --kt-max 1.8')
    .argument('<model>', 'model file (JSON) with the parameter, or made by raiser new')
    .requiredOption('--vary <name=low:high>', 'the dimension and its range')
    .option('--kt-max <limit>', 'the largest Kt allowed')
    .option('--stress-max <limit>', 'the largest peak stress allowed (model stress units)')
    .addOption(new Option('--kt <which>', 'the Kt the limit applies to').choices(['net', 'gross']).default('net'))
    .option('--largest', 'find the largest value that meets the limit instead of the smallest')
    .option('--accuracy <target>', 'accuracy of each solution (default 0.5%)')
    .addOption(new Option('--measure <measure>', 'stress measure').choices(STRESS_MEASURES as unknown as string[]))
    .option('--json', 'print the result as JSON')
    .option('--allow-drawing-outside', 'let geometry.from read a drawing outside the model file\'s folder (an absolute path, or one through ..)')
    .action((file: string, flags: { vary: string; ktMax?: string; stressMax?: string; kt: 'net' | 'gross'; largest?: boolean; accuracy?: string; measure?: StressMeasure; json?: boolean; allowDrawingOutside?: boolean }) => {
      const m = /^\s*([A-Za-z_][A-Za-z0-9_-]*)\s*=\s*([^:]+):([^:]+)\s*$/.exec(flags.vary);
      if (!m) throw new ModelError('--vary', `"${flags.vary}" is not a range`, 'write --vary name=low:high');
      const num = (s: string | undefined, what: string) => {
        if (s === undefined) return undefined;
        const v = Number(s);
        if (!Number.isFinite(v)) throw new ModelError(what, `${what} ${s} is not a number`);
        return v;
      };
      const res = runSize(file, {
        name: m[1],
        lo: num(m[2], '--vary')!,
        hi: num(m[3], '--vary')!,
        ktMax: num(flags.ktMax, '--kt-max'),
        stressMax: num(flags.stressMax, '--stress-max'),
        kt: flags.kt,
        largest: flags.largest,
        measure: flags.measure,
        allowDrawingOutside: flags.allowDrawingOutside,
        target: flags.accuracy ? parseAccuracy(flags.accuracy) : undefined,
        onStep: (row, meets) => process.stderr.write(`  ${row.key}: Kt net ${row.ktNet === null ? '-' : fmt(row.ktNet, 4)}${row.error !== null ? ` +- ${fmt(100 * row.error, 2)}%` : ''}, peak ${fmt(row.peak)}: ${meets ? 'meets' : 'fails'} the limit\n`),
      });
      if (flags.json) process.stdout.write(JSON.stringify(res, null, 2) + '\n');
      else {
        process.stdout.write(`${res.message}\n`);
        if (res.met && res.row) {
          const q = res.quantity.startsWith('Kt') ? (flags.kt === 'gross' ? res.row.ktGross : res.row.ktNet) : res.row.peak;
          process.stdout.write(`  ${res.quantity} there: ${fmt(q!, 4)}${res.row.error !== null ? ` +- ${fmt(100 * res.row.error, 2)}%` : ''}; limit ${res.limit}; margin ${fmt(100 * res.margin!, 3)}% with the band\n`);
          process.stdout.write(`  peak at (${fmt(res.row.peakX, 5)}, ${fmt(res.row.peakY, 5)}), ${res.row.feature}; ${res.steps.length} solutions\n`);
        }
      }
      setCode(res.met ? 0 : 3);
    });
}
