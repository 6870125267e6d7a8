/**
 * The certified Kt of the strap example (examples/strap-bolt-hole.json, an invented part) as one
 * fresh process pays for it: loading the model, then `certifyModel` (every mesh of the series,
 * its solves and evaluations), timed from the call to its return, so module loading and the
 * command line are left out; the whole-process time is another row's. Each run is a new Node
 * process, so the compilation of the analysis code on its first use is in every run, as it is
 * for a user. Prints one JSON line per child; runSeriesBench prints the median and spread.
 *
 *   node dist/bench/series.js --child
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { performance } from 'node:perf_hooks';
import { readModelFile } from '../model/load.js';
import { certifyModel } from '../pipeline/certify.js';
import { median } from './stats.js';

/** The speed target of this row: the certified Kt's analysis in a fresh process, seconds. */
const TARGET_SECONDS = 0.45;
const RUNS = 5;

interface SeriesChild {
  seconds: number;
  meshes: number;
  dofs: number;
  status: string;
}

function runChild(): SeriesChild {
  const model = readModelFile(fileURLToPath(new URL('../../examples/strap-bolt-hole.json', import.meta.url)));
  const t0 = performance.now();
  const c = certifyModel(model, { target: 0.01 });
  const seconds = (performance.now() - t0) / 1e3;
  return { seconds, meshes: c.meshes.length, dofs: c.meshes[c.meshes.length - 1].dofs, status: c.status };
}

/** The row "certified Kt of the strap example, analysis only, fresh process": median and spread of RUNS children. */
export function runSeriesBench(log: (s: string) => void): void {
  const script = fileURLToPath(import.meta.url);
  const rows: SeriesChild[] = [];
  for (let r = 0; r < RUNS; r++) {
    const out = spawnSync(process.execPath, [script, '--child'], { encoding: 'utf8' });
    if (out.status !== 0) throw new Error(`series bench child failed: ${out.stderr}`);
    rows.push(JSON.parse(out.stdout.trim().split('\n').pop()!) as SeriesChild);
  }
  const s = rows.map((x) => x.seconds).sort((a, b) => a - b);
  const m = median(s);
  log('| case | meshes | DOF of the last | median | spread (min - max) | target |');
  log('|---|---|---|---|---|---|');
  log(
    `| certified Kt of the strap example, analysis only, fresh process (${RUNS} runs) | ${rows[0].meshes} (${rows[0].status}) | ${rows[0].dofs} | ${m.toFixed(3)} s | ${s[0].toFixed(3)} - ${s[s.length - 1].toFixed(3)} s | ${TARGET_SECONDS} s (${m <= TARGET_SECONDS ? 'met' : 'not met'}) |`,
  );
}

if (process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1] && process.argv.includes('--child')) {
  process.stdout.write(JSON.stringify(runChild()) + '\n');
}
