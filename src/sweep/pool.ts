/**
 * The worker threads of a sweep or a sizing, one pool for both: each worker (worker.ts) reads
 * the model once and then solves the cases it is sent, one after another, posting back each
 * row or the error it met.
 *
 * Start-up is the slow part of a worker (it loads every module of the analysis, about half a
 * second on a loaded machine): the pool is made before the caller's own preparation (reading
 * the model, the finished cases of an earlier run), so both go on at once.
 */
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { AnalysisError, InternalError, ModelError } from '../model/errors.js';
import type { Vary } from './cases.js';
import type { CaseOptions, CaseRow } from './solve-case.js';

/** One case for a worker: its key and the values of the varied names. */
export interface PoolCase {
  key: string;
  values: Record<string, number>;
}

/** What a worker posts back when a case cannot be solved: the error's kind, message and hint. */
export interface WorkerFailure {
  ok: false;
  key?: string;
  message: string;
  name: string;
  hint?: string;
}

export type WorkerReply = { ok: true; row: CaseRow } | WorkerFailure;

/**
 * The worker's error as the kind it was thrown as, so the command exits as a solve in this
 * process would: bad input 2, an analysis refused 3 (a model too big among them), a fault 1.
 */
export function errorOfWorker(msg: WorkerFailure): Error {
  switch (msg.name) {
    case 'ModelError':
      return new ModelError('--vary', msg.message, msg.hint);
    case 'AnalysisError':
    case 'ModelTooLargeError':
      return new AnalysisError(msg.message, msg.hint);
    case 'InternalError':
      return new InternalError(msg.message);
    default:
      return new Error(msg.message);
  }
}

const workerFile = fileURLToPath(new URL('./worker.js', import.meta.url));

export class CasePool {
  private readonly workers: Worker[] = [];
  /** why each worker that stopped stopped (a worker whose model does not read fails at start) */
  private readonly stopped = new Map<Worker, Error>();

  /** Starts n workers at once; they load their modules and read the model while the caller goes on. */
  constructor(file: string, vary: Vary[], options: CaseOptions, n: number) {
    for (let k = 0; k < n; k++) {
      const w = new Worker(workerFile, { workerData: { file, vary, options } });
      // heard even when no case is out, so a worker failing at start is kept, not thrown unheard
      w.on('error', (err) => this.stopped.set(w, err));
      w.on('exit', (code) => {
        if (!this.stopped.has(w)) this.stopped.set(w, new InternalError(`a sweep worker stopped (exit code ${code})`));
      });
      this.workers.push(w);
    }
  }

  /** Whether the worker's compiled file is there (not when the sources run untranspiled). */
  static available(): boolean {
    return existsSync(workerFile);
  }

  get size(): number {
    return this.workers.length;
  }

  /** One case on one worker: what it posts back. Rejects only when the worker itself fails or stops. */
  private solveOn(w: Worker, item: PoolCase): Promise<WorkerReply> {
    return new Promise<WorkerReply>((resolve, reject) => {
      const gone = this.stopped.get(w);
      if (gone !== undefined) {
        reject(gone);
        return;
      }
      const settle = () => {
        w.off('message', onMessage);
        w.off('error', onError);
        w.off('exit', onExit);
      };
      const onMessage = (msg: WorkerReply) => {
        settle();
        resolve(msg);
      };
      const onError = (err: Error) => {
        settle();
        reject(err);
      };
      const onExit = (code: number) => {
        settle();
        reject(new InternalError(`a sweep worker stopped (exit code ${code}) while solving ${item.key}`));
      };
      w.on('message', onMessage);
      w.on('error', onError);
      w.on('exit', onExit);
      w.postMessage(item);
    });
  }

  /** Solves one case on each worker (at most as many cases as workers), all at once; a case's error rejects, as the kind it was thrown as. */
  async solveEach(items: PoolCase[]): Promise<CaseRow[]> {
    if (items.length > this.workers.length) throw new RangeError(`CasePool.solveEach: ${items.length} cases for ${this.workers.length} workers`);
    const replies = await Promise.all(items.map((item, k) => this.solveOn(this.workers[k], item)));
    return replies.map((r) => {
      if (!r.ok) throw errorOfWorker(r);
      return r.row;
    });
  }

  /**
   * Solves every case in the order given, each worker taking the next one as soon as it is
   * free; `onDone` hears each case as it finishes, with its row or the failure it met (the
   * others go on). Rejects only when a worker itself fails.
   */
  async solveAll(items: PoolCase[], onDone: (item: PoolCase, reply: WorkerReply) => void): Promise<void> {
    let next = 0;
    const drain = async (w: Worker): Promise<void> => {
      while (next < items.length) {
        const item = items[next++];
        onDone(item, await this.solveOn(w, item));
      }
    };
    await Promise.all(this.workers.map(drain));
  }

  async close(): Promise<void> {
    await Promise.all(this.workers.map((w) => w.terminate()));
  }
}
