/** Runs the built command line (dist/, made by `npm test`'s build step) and captures its output. */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

export const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const BIN = fileURLToPath(new URL('../../dist/cli/raiser.js', import.meta.url));

export function raiser(args: string[], input?: string) {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd: ROOT, input, encoding: 'utf8', timeout: 120_000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}
