/** Worker thread of a sweep or a sizing (pool.ts): solves the cases it is sent and posts each row back. */
import { parentPort, workerData } from 'node:worker_threads';
import { readSweepSource } from './cases.js';
import { solveCase, type CaseOptions } from './solve-case.js';

const { file, vary, options } = workerData as { file: string; vary: { name: string; values: number[] }[]; options: CaseOptions };
const src = readSweepSource(file, vary, { allowDrawingOutside: options.allowDrawingOutside });
// the pool (pool.ts) stops the worker when the sweep is done
parentPort!.on('message', (msg: { key: string; values: Record<string, number> }) => {
  try {
    parentPort!.postMessage({ ok: true, row: solveCase(src, msg.key, msg.values, options) });
  } catch (err) {
    parentPort!.postMessage({ ok: false, key: msg.key, values: msg.values, message: (err as Error).message, name: (err as Error).name, hint: (err as { hint?: string }).hint });
  }
});
