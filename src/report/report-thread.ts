/**
 * report.html drawn beside the standard pictures: its seven pictures are drawn for the report's
 * column (src/report/report-pictures.ts), not copied from the picture files, so the two sets
 * share no pixels and can be drawn at the same time. `startReportHtml` hands the plot source to
 * a worker thread (./report-worker.ts) and returns at once; `finish` waits for the text.
 *
 * The report is the same text whichever thread draws it: the worker gets a structured clone of
 * the plot source (the same numbers, typed arrays copied exactly) and runs the same functions.
 * It is drawn in this thread instead, at `finish`, when there is no second processor, when the
 * worker's file is absent (the sources run without a build, as in the tests) and when the worker
 * fails or has not answered in time (see START_MS; it is then stopped): a failure of the drawing
 * itself then shows here, with its own error type.
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { MessageChannel, receiveMessageOnPort, Worker } from 'node:worker_threads';
import { reportHtml } from './html.js';
import { reportPictures } from './report-pictures.js';
import type { PlotSource } from './saved.js';

/**
 * How long `finish` waits for the worker before drawing the report itself: for its start (it
 * raises the flag to RUNNING first thing), and then for its end at most WAIT_FACTOR times as long
 * as this thread took for its own share (the standard pictures, a like amount of drawing) and
 * at least WAIT_LEAST_MS. A worker that died (it cannot say so while this thread waits) thus
 * costs a bounded wait, never a wrong or missing report.
 */
const START_MS = 10_000;
const WAIT_FACTOR = 4;
const WAIT_LEAST_MS = 20_000;
const NOT_STARTED = 0;
const DONE = 1;
const RUNNING = 2;

/**
 * The parent's Node options for the worker, less those that only make sense for a main script
 * given on the command line (--input-type, and -e / -p with their code), which would stop a
 * worker started from a file before its first line.
 */
function workerExecArgv(): string[] {
  const out: string[] = [];
  const argv = process.execArgv;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a.startsWith('--input-type')) {
      if (a === '--input-type') i++;
      continue;
    }
    if (a === '-e' || a === '--eval' || a === '-p' || a === '--print') {
      i++;
      continue;
    }
    if (a.startsWith('--eval=') || a.startsWith('--print=')) continue;
    out.push(a);
  }
  return out;
}

/** A report being drawn: `finish` returns report.html's text. */
export interface PendingReport {
  finish(): string;
  /** stops the drawing (when the run fails before it needs the report) */
  cancel(): void;
  /** whether a worker thread draws it (false: drawn in this thread at `finish`) */
  inWorker: boolean;
}

function drawHere(src: PlotSource): string {
  return reportHtml(src, reportPictures(src));
}

/** Starts drawing the report of `src`; `worker: false` draws it in this thread (at `finish`). */
export function startReportHtml(src: PlotSource, opts: { worker?: boolean } = {}): PendingReport {
  const file = fileURLToPath(new URL('./report-worker.js', import.meta.url));
  if (opts.worker === false || availableParallelism() < 2 || !existsSync(file)) return { finish: () => drawHere(src), cancel: () => undefined, inWorker: false };
  const flag = new Int32Array(new SharedArrayBuffer(4));
  const { port1, port2 } = new MessageChannel();
  let worker: Worker;
  try {
    worker = new Worker(file, { workerData: { src, flag, port: port2 }, transferList: [port2], execArgv: workerExecArgv() });
  } catch {
    port1.close();
    return { finish: () => drawHere(src), cancel: () => undefined, inWorker: false };
  }
  // the thread's own errors reach `finish` through the flag and the port, not as events
  worker.on('error', () => undefined);
  worker.unref();
  const startedAt = performance.now();
  const stop = () => {
    port1.close();
    void worker.terminate();
  };
  return {
    inWorker: true,
    cancel: stop,
    finish: () => {
      const ownMs = performance.now() - startedAt;
      let answered = Atomics.wait(flag, 0, NOT_STARTED, START_MS) !== 'timed-out';
      if (answered && Atomics.load(flag, 0) === RUNNING) answered = Atomics.wait(flag, 0, RUNNING, Math.max(WAIT_LEAST_MS, WAIT_FACTOR * ownMs)) !== 'timed-out';
      const msg = answered && Atomics.load(flag, 0) === DONE ? (receiveMessageOnPort(port1)?.message as { html?: string; error?: string } | undefined) : undefined;
      stop();
      if (msg && typeof msg.html === 'string') return msg.html;
      return drawHere(src);
    },
  };
}
