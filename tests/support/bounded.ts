/**
 * Runs the built command line in a child process with a bounded heap, and reports its exit code,
 * output and peak resident memory (VmHWM of the child itself, read by the child as it exits).
 * Tests of hostile input assert the exit code, the message and the peak memory; time is not
 * asserted (a test must not depend on the machine's speed), but a child still running after
 * `killAfterMs` is stopped and reported as having no exit code, which fails the test.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const MAIN = fileURLToPath(new URL('../../dist/cli/main.js', import.meta.url));
const MEMORY = fileURLToPath(new URL('../../dist/bench/memory.js', import.meta.url));

export interface BoundedRun {
  /** exit code, or null when the child was killed (by the time-out or out of memory) */
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
  /** peak resident memory of the child, bytes (NaN when it did not exit by itself) */
  peakBytes: number;
}

export function runBounded(args: string[], opts: { cwd?: string; heapMb?: number; killAfterMs?: number; env?: NodeJS.ProcessEnv } = {}): BoundedRun {
  const script = [
    `import { main } from ${JSON.stringify(MAIN)};`,
    `import { peakResidentBytes } from ${JSON.stringify(MEMORY)};`,
    `const code = await main(process.argv.slice(1));`,
    `process.stderr.write('\\nRAISER_PEAK_BYTES ' + peakResidentBytes() + '\\n');`,
    `process.exit(code);`,
  ].join('\n');
  const r = spawnSync(process.execPath, [`--max-old-space-size=${opts.heapMb ?? 512}`, '--input-type=module', '-e', script, '--', ...args], {
    cwd: opts.cwd,
    encoding: 'utf8',
    timeout: opts.killAfterMs ?? 120_000,
    maxBuffer: 64 * 2 ** 20,
    env: opts.env ?? process.env,
  });
  const m = /\nRAISER_PEAK_BYTES (\d+)\n/.exec(r.stderr ?? '');
  return {
    code: r.status,
    signal: r.signal,
    stdout: r.stdout ?? '',
    stderr: (r.stderr ?? '').replace(/\nRAISER_PEAK_BYTES \d+\n/, ''),
    peakBytes: m ? Number(m[1]) : NaN,
  };
}
