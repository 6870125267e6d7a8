/**
 * Running under a virtual memory limit (ulimit -v). V8 reserves about 10 GB of address space
 * for every WebAssembly memory (guard pages in place of bounds checks), so under a limit below
 * about 12 GB the solver's WebAssembly kernel cannot start, whatever the model needs. Node's
 * --disable-wasm-trap-handler makes V8 check bounds instead and reserve only what is used: when
 * the limit is that low, the command line starts itself again with that option.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';

const FLAG = '--disable-wasm-trap-handler';
/** Below this address-space limit the WebAssembly reservation does not fit (bytes). */
const NEEDS = 16 * 2 ** 30;

/** The soft limit on this process's address space in bytes, or undefined when there is none (or it cannot be read). */
export function addressSpaceLimit(): number | undefined {
  try {
    const m = /^Max address space\s+(\S+)/m.exec(readFileSync('/proc/self/limits', 'utf8'));
    if (!m || m[1] === 'unlimited') return undefined;
    const v = Number(m[1]);
    return Number.isFinite(v) ? v : undefined;
  } catch {
    return undefined;
  }
}

/**
 * Starts this command again with --disable-wasm-trap-handler when the address space is limited
 * below what the WebAssembly reservation needs, and returns its exit code; undefined when no
 * new start is needed (or possible), and the caller goes on.
 */
export function relaunchUnderAddressLimit(): number | undefined {
  const limit = addressSpaceLimit();
  if (limit === undefined || limit >= NEEDS) return undefined;
  if (process.env.RAISER_RELAUNCHED || process.execArgv.includes(FLAG) || (process.env.NODE_OPTIONS ?? '').includes(FLAG)) return undefined;
  if (!process.allowedNodeEnvironmentFlags.has(FLAG)) return undefined;
  const r = spawnSync(process.execPath, [FLAG, ...process.execArgv, process.argv[1], ...process.argv.slice(2)], {
    stdio: 'inherit',
    env: { ...process.env, RAISER_RELAUNCHED: '1' },
  });
  if (r.error) return undefined; // could not start: go on in this process (the solver falls back to JavaScript)
  if (r.signal) {
    process.kill(process.pid, r.signal);
    return 1;
  }
  return r.status ?? 1;
}
