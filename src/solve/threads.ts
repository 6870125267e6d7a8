/**
 * The solver's second thread: a worker_threads Worker that factorises one subtree of the
 * supernodal tree (numeric.ts) or does its half of the triangular solves (triangular.ts) while
 * this thread does the rest. The worker runs the very kernels of multifrontal.ts and dense.ts,
 * from their source text (eval mode). The factor values are written by both threads into one
 * SharedArrayBuffer; each thread has its own WebAssembly memory for fronts and update stack.
 *
 * A SolverThreads owns its worker: created by whoever solves (solveSpd for one solve, the
 * pipeline for one mesh's solves), it starts the worker on first use, keeps it between
 * factorisations and solves (its compiled code and WebAssembly memory are reused), and stops it
 * on close(). Nothing is kept at module level. The worker is unref'd, so a SolverThreads left
 * open never keeps the process alive.
 */

import { Worker } from 'node:worker_threads';
import { denseKernelSource } from './dense.js';
import { wasmModuleBytes } from './wasm-kernel.js';
import { childLists } from './etree.js';
import { backwardRange, factorRange, forwardRange, type RangeContext } from './multifrontal.js';

/**
 * One job for the worker (structured-cloned; the SharedArrayBuffers are shared): the slice of
 * the factorisation's range context that crosses the thread boundary, and the shared buffers
 * the worker builds its own working arrays on.
 */
interface WorkerJob
  extends Pick<
    RangeContext,
    's0' | 's1' | 'superStart' | 'superParent' | 'rowPtr' | 'superRows' | 'rowBase' | 'valuePtr' | 'entryPtr' | 'entryValues' | 'entryOffset' | 'entryBase' | 'threshold'
  > {
  readonly n: number;
  readonly maxFront: number;
  readonly stackPeak: number;
  readonly useWasm: boolean;
  /** shared: factor values */
  readonly lBuffer: SharedArrayBuffer;
  /** shared: the update matrix of the subtree root, packed */
  readonly handoff: SharedArrayBuffer;
  /** shared Int32: [state (0 running, 1 done, 2 pivot failed, 3 error), failed column] */
  readonly status: SharedArrayBuffer;
  /** shared Float64: [failed pivot value] */
  readonly pivot: SharedArrayBuffer;
}

/**
 * Body of the worker (CommonJS, eval mode; the kernels' source is prepended).
 * It stays alive between factorisations, so its compiled code and its
 * WebAssembly memory are reused; each job arrives as a message and is
 * answered through the job's shared status word.
 */
const WORKER_MAIN = `
const { parentPort, workerData } = require('node:worker_threads');
{
  const ready = new Int32Array(workerData.ready);
  Atomics.store(ready, 0, 1);
  Atomics.notify(ready, 0);
}
let memory = null, ex = null;
if (workerData.wasmBytes !== null) {
  memory = new WebAssembly.Memory({ initial: 1 });
  ex = new WebAssembly.Instance(new WebAssembly.Module(workerData.wasmBytes), { env: { mem: memory } }).exports;
}
function runJob(d) {
  const status = new Int32Array(d.status);
  try {
    const superParent = d.superParent;
    const nSuper = superParent.length;
    const sHead = new Int32Array(nSuper).fill(-1);
    const sNext = new Int32Array(nSuper).fill(-1);
    for (let s = nSuper - 1; s >= 0; s--) {
      const p = superParent[s];
      if (p !== -1) { sNext[s] = sHead[p]; sHead[p] = s; }
    }
    const frontLen = d.maxFront * d.maxFront;
    const stackLen = Math.max(1, d.stackPeak);
    const relDoubles = Math.ceil(d.maxFront / 2) + 1;
    let front, stack, rel, zeroLower = null, extendAdd = null, simdFront = null, simdStack = null;
    const relByte = (frontLen + stackLen) * 8;
    if (d.useWasm && ex !== null) {
      const bytes = (frontLen + stackLen + relDoubles) * 8;
      if (bytes > memory.buffer.byteLength) memory.grow(Math.ceil((bytes - memory.buffer.byteLength) / 65536));
      const view = new Float64Array(memory.buffer);
      front = view.subarray(0, frontLen);
      stack = view.subarray(frontLen, frontLen + stackLen);
      rel = new Int32Array(memory.buffer, relByte, d.maxFront);
      zeroLower = ex.zeroLower;
      extendAdd = ex.extendAdd;
      simdFront = { rowBlock4: ex.rowBlock4, fByte: 0, outByte: 0 };
      simdStack = { rowBlock4: ex.rowBlock4, fByte: 0, outByte: frontLen * 8 };
    } else {
      front = new Float64Array(frontLen);
      stack = new Float64Array(stackLen);
      rel = new Int32Array(d.maxFront);
    }
    const ctx = {
      s0: d.s0, s1: d.s1, superStart: d.superStart, superParent, rowPtr: d.rowPtr,
      superRows: d.superRows, rowBase: d.rowBase, valuePtr: d.valuePtr, entryPtr: d.entryPtr,
      entryValues: d.entryValues, entryOffset: d.entryOffset, entryBase: d.entryBase,
      L: new Float64Array(d.lBuffer), front, stack, rel, map: new Int32Array(d.n), sHead, sNext,
      updStart: new Float64Array(nSuper), threshold: d.threshold, panelScratch: new Float64Array(PANEL),
      zeroLower, extendAdd, relByte, stackByte: frontLen * 8, simdFront, simdStack,
    };
    const kern = { factorFrontPivots, rankUpdate, lastPivot: () => failedPivotValue };
    const r = factorRange(ctx, kern, 0);
    if (r.failedColumn >= 0) {
      status[1] = r.failedColumn;
      new Float64Array(d.pivot)[0] = r.pivot;
      Atomics.store(status, 0, 2);
    } else {
      const c = d.s1 - 1;
      const u = (d.rowPtr[c + 1] - d.rowPtr[c]) - (d.superStart[c + 1] - d.superStart[c]);
      const size = (u * (u + 1)) / 2;
      new Float64Array(d.handoff).set(stack.subarray(ctx.updStart[c], ctx.updStart[c] + size));
      Atomics.store(status, 0, 1);
    }
  } catch (e) {
    Atomics.store(status, 0, 3);
  }
  Atomics.notify(status, 0);
}
function runSolve(d) {
  const status = new Int32Array(d.status);
  try {
    const L = new Float64Array(d.L);
    const y = new Float64Array(d.y);
    if (d.kind === 'forward') {
      const delta = new Float64Array(d.delta);
      forwardRange(L, d.superStart, d.rowPtr, d.superRows, d.valuePtr, y, d.s0, d.s1, delta, d.superStart[d.s1]);
    } else {
      backwardRange(L, d.superStart, d.rowPtr, d.superRows, d.valuePtr, y, d.s0, d.s1, new Float64Array(Math.max(1, d.maxFront)));
    }
    Atomics.store(status, 0, 1);
  } catch (e) {
    Atomics.store(status, 0, 3);
  }
  Atomics.notify(status, 0);
}
parentPort.on('message', (d) => (d.kind === undefined ? runJob(d) : runSolve(d)));
`;

/** A subtree factorisation under way on the worker. */
export interface SubtreeWorker {
  /** blocks until the worker is done (or timeoutMs passed) */
  join(timeoutMs: number): { state: 'done' | 'pivot' | 'error' | 'timeout'; failedColumn: number; pivot: number };
  readonly handoff: Float64Array;
  /** stops the worker (after a failure elsewhere or a time-out); a later job starts a new one */
  terminate(): void;
}

/** A triangular-solve job under way on the worker. */
export interface SolveJob {
  join(timeoutMs: number): 'done' | 'error' | 'timeout';
  terminate(): void;
}

/** How long a new worker may take to start before the second thread is given up. */
const WORKER_START_TIMEOUT_MS = 10_000;

/** What a subtree factorisation needs (see SolverThreads.startSubtree). */
export interface SubtreeArgs {
  n: number;
  first: number;
  c: number;
  superStart: Int32Array;
  superParent: Int32Array;
  rowPtr: Int32Array;
  superRows: Int32Array;
  valuePtr: Float64Array;
  entryPtr: Int32Array;
  entryValues: Float64Array;
  entryOffset: Int32Array;
  threshold: number;
  lBuffer: SharedArrayBuffer;
  useWasm: boolean;
}

/** What one half of a forward or backward pass needs (see SolverThreads.startSolveJob). */
export interface SolveJobArgs {
  L: SharedArrayBuffer;
  superStart: Int32Array;
  rowPtr: Int32Array;
  superRows: Int32Array;
  valuePtr: Float64Array;
  y: SharedArrayBuffer;
  delta: SharedArrayBuffer;
  s0: number;
  s1: number;
  maxFront: number;
}

/** The second thread of the solver; see the top of this file. */
export class SolverThreads {
  /** the running worker, and whether it was given the WebAssembly kernels */
  private current: { worker: Worker; wasm: boolean } | null = null;
  /** set when a worker could not start here: the solver then stays on one thread */
  private unavailable = false;

  /**
   * The worker, started on first use. Its code signals readiness through a
   * shared word; a worker that cannot start (no threads here, or its code
   * does not compile in this environment) is reported as null once and the
   * factorisation stays on one thread.
   */
  private workerFor(useWasm: boolean): Worker | null {
    if (this.unavailable) return null;
    if (this.current !== null && this.current.wasm === useWasm) return this.current.worker;
    if (this.current !== null) void this.current.worker.terminate();
    this.current = null;
    const code = [denseKernelSource(), factorRange.toString(), forwardRange.toString(), backwardRange.toString(), WORKER_MAIN].join('\n');
    const ready = new SharedArrayBuffer(4);
    let worker: Worker;
    try {
      worker = new Worker(code, { eval: true, workerData: { wasmBytes: useWasm ? wasmModuleBytes() : null, ready } });
    } catch {
      this.unavailable = true;
      return null;
    }
    worker.unref(); // never keeps the process alive
    if (Atomics.wait(new Int32Array(ready), 0, 0, WORKER_START_TIMEOUT_MS) === 'timed-out') {
      void worker.terminate();
      this.unavailable = true;
      return null;
    }
    this.current = { worker, wasm: useWasm };
    return worker;
  }

  /** Stops this worker (after a failure elsewhere or a time-out); a later job starts a new one. */
  private stop(worker: Worker): void {
    if (this.current !== null && this.current.worker === worker) this.current = null;
    void worker.terminate();
  }

  /** Stops the worker, if one runs. A later job on this object starts a new one. */
  close(): void {
    if (this.current !== null) this.stop(this.current.worker);
  }

  /** Sends subtree [first, c] of the supernodal tree to the worker thread; null when no worker can run. */
  startSubtree(args: SubtreeArgs): SubtreeWorker | null {
    const worker = this.workerFor(args.useWasm);
    if (worker === null) return null;
    const { first, c, superStart, rowPtr, entryPtr } = args;
    const s0 = first;
    const s1 = c + 1;
    // size the worker's front and stack for its own subtree
    let maxFront = 1;
    let stackTop = 0;
    let stackPeak = 0;
    const upd = new Float64Array(s1);
    const { head: sHead, next: sNext } = childLists(args.superParent);
    for (let s = s0; s < s1; s++) {
      const k = superStart[s + 1] - superStart[s];
      const m = rowPtr[s + 1] - rowPtr[s];
      if (m > maxFront) maxFront = m;
      for (let ch = sHead[s]; ch !== -1; ch = sNext[ch]) stackTop -= upd[ch];
      const u = m - k;
      upd[s] = (u * (u + 1)) / 2;
      stackTop += upd[s];
      if (stackTop > stackPeak) stackPeak = stackTop;
    }
    const status = new SharedArrayBuffer(8);
    const pivot = new SharedArrayBuffer(8);
    const handoff = new SharedArrayBuffer(Math.max(8, upd[c] * 8));
    const rowBase = rowPtr[s0];
    const entryBase = entryPtr[s0];
    const job: WorkerJob = {
      n: args.n,
      s0,
      s1,
      superStart,
      superParent: args.superParent,
      rowPtr,
      // the row structure is shared memory (analyzeCholesky): sent without a copy
      superRows: args.superRows.buffer instanceof SharedArrayBuffer ? args.superRows : args.superRows.slice(rowBase, rowPtr[s1]),
      rowBase: args.superRows.buffer instanceof SharedArrayBuffer ? 0 : rowBase,
      valuePtr: args.valuePtr,
      entryPtr,
      // shared memory (the factorisation allocates them so): no copies
      ...(args.entryValues.buffer instanceof SharedArrayBuffer && args.entryOffset.buffer instanceof SharedArrayBuffer
        ? { entryValues: args.entryValues, entryOffset: args.entryOffset, entryBase: 0 }
        : {
            entryValues: args.entryValues.slice(entryBase, entryPtr[s1]),
            entryOffset: args.entryOffset.slice(entryBase, entryPtr[s1]),
            entryBase,
          }),
      maxFront,
      stackPeak,
      threshold: args.threshold,
      useWasm: args.useWasm,
      lBuffer: args.lBuffer,
      handoff,
      status,
      pivot,
    };
    worker.postMessage(job);
    const st = new Int32Array(status);
    return {
      handoff: new Float64Array(handoff, 0, upd[c]),
      join(timeoutMs: number) {
        const deadline = Date.now() + timeoutMs;
        while (Atomics.load(st, 0) === 0) {
          const left = deadline - Date.now();
          if (left <= 0) return { state: 'timeout', failedColumn: -1, pivot: 0 };
          Atomics.wait(st, 0, 0, Math.min(left, 1000));
        }
        const state = Atomics.load(st, 0);
        if (state === 1) return { state: 'done', failedColumn: -1, pivot: 0 };
        if (state === 2) return { state: 'pivot', failedColumn: st[1], pivot: new Float64Array(pivot)[0] };
        return { state: 'error', failedColumn: -1, pivot: 0 };
      },
      terminate: () => this.stop(worker),
    };
  }

  /**
   * Sends the worker's half of a forward or backward pass over subtree
   * [s0, s1) (shared factor, shared y; forward updates of rows from
   * superStart[s1] on go to the shared delta). Null when no worker can run.
   * The index arrays are cloned into the message unless they are shared
   * memory (superRows is, from analyzeCholesky).
   */
  startSolveJob(kind: 'forward' | 'backward', job: SolveJobArgs): SolveJob | null {
    const worker = this.current !== null ? this.current.worker : this.workerFor(true);
    if (worker === null) return null;
    const status = new SharedArrayBuffer(8);
    worker.postMessage({ ...job, kind, status });
    const st = new Int32Array(status);
    return {
      join(timeoutMs: number) {
        const deadline = Date.now() + timeoutMs;
        while (Atomics.load(st, 0) === 0) {
          const left = deadline - Date.now();
          if (left <= 0) return 'timeout';
          Atomics.wait(st, 0, 0, Math.min(left, 1000));
        }
        return Atomics.load(st, 0) === 1 ? 'done' : 'error';
      },
      terminate: () => this.stop(worker),
    };
  }
}
