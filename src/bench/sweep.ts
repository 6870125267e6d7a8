/**
 * Bench row: a sweep's whole-process time against one case's, the way a user runs them
 * (`node dist/cli/raiser.js sweep ...`, start-up, workers, case files and chart included). The
 * model is an invented plate with a central hole (`raiser new plate-with-hole --W 100 --d 20`)
 * swept over d; one case is the same command with one value. Target: N cases on k workers
 * within 1.2 x N x (one case) / k. The row also prints 2 workers against 1: one case's whole
 * process carries the start-up and the first, cold case, which a sweep pays once per worker,
 * so the target alone says little about whether the second worker helps. The three commands run interleaved, `runs` times each,
 * after one warm-up round; medians. The machine's other load enters every figure alike.
 *
 *   npx tsc -p tsconfig.build.json && node dist/bench/sweep.js [--cases 5] [--runs 3]
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import { median } from './stats.js';

const CLI = fileURLToPath(new URL('../cli/raiser.js', import.meta.url));

/** Runs the command line; its wall time in seconds (throws on a non-zero exit). */
function timeRaiser(args: string[]): number {
  const t0 = performance.now();
  const r = spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8' });
  const t = (performance.now() - t0) / 1e3;
  if (r.status !== 0) throw new Error(`raiser ${args.join(' ')} exited ${r.status}: ${r.stderr}`);
  return t;
}


export function runSweepBench(log: (s: string) => void, cases = 5, runs = 3): void {
  const dir = mkdtempSync(join(tmpdir(), 'raiser-sweep-bench-'));
  try {
    const model = join(dir, 'hole.json');
    const made = spawnSync(process.execPath, [CLI, 'new', 'plate-with-hole', '--W', '100', '--d', '20'], { encoding: 'utf8' });
    if (made.status !== 0) throw new Error(`raiser new exited ${made.status}: ${made.stderr}`);
    writeFileSync(model, made.stdout);
    const vary = `d=10:50:${cases}`;
    const one: number[] = [];
    const k1: number[] = [];
    const k2: number[] = [];
    for (let r = 0; r <= runs; r++) {
      const out = (name: string) => {
        const o = join(dir, `${name}-${r}`);
        return ['-o', o];
      };
      const t1 = timeRaiser(['sweep', model, '--vary', 'd=30', ...out('one'), '--jobs', '1']);
      const tk1 = timeRaiser(['sweep', model, '--vary', vary, ...out('k1'), '--jobs', '1']);
      const tk2 = timeRaiser(['sweep', model, '--vary', vary, ...out('k2'), '--jobs', '2']);
      if (r === 0) continue; // warm-up round (file cache)
      one.push(t1);
      k1.push(tk1);
      k2.push(tk2);
    }
    // "one case" is a sweep of the single value d = 30
    const single = median(one);
    log('| cases N | one case | N cases, 1 worker | vs N x one | N cases, 2 workers | 2 workers / 1 worker | target 1.2 N one / 2 | vs target |');
    log('|---|---|---|---|---|---|---|---|');
    const target2 = (1.2 * cases * single) / 2;
    log(
      `| ${cases} | ${single.toFixed(2)} s | ${median(k1).toFixed(2)} s | ${(median(k1) / (cases * single)).toFixed(2)} | ${median(k2).toFixed(2)} s | ${(median(k2) / median(k1)).toFixed(2)} | ${target2.toFixed(2)} s | ${(median(k2) / target2).toFixed(2)} (${median(k2) <= target2 ? 'met' : 'NOT met'}) |`,
    );
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const arg = (name: string, dflt: number) => {
    const k = process.argv.indexOf(name);
    return k > 0 ? Number(process.argv[k + 1]) : dflt;
  };
  runSweepBench(console.log, arg('--cases', 5), arg('--runs', 3));
}
