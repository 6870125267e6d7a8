/**
 * The numeric loop of the supernodal multifrontal Cholesky over a range of
 * supernodes (see cholesky.ts for the method and its sources), and a second
 * thread that factorises one subtree of the supernodal tree while the main
 * thread does the supernodes numbered before it.
 *
 * Independent subtrees of the elimination tree can be factorised in any
 * order or at the same time (J. W. H. Liu, "The role of elimination trees in
 * sparse factorization", SIAM J. Matrix Anal. Appl. 11, 1990;
 * "subtree-to-subcube" mapping of A. George, J. W. H. Liu and E. Ng,
 * "Communication results for parallel sparse Cholesky factorization on a
 * hypercube", Parallel Computing 10, 1989). With a postordered tree a
 * subtree is a contiguous range of supernodes, so the split is: main thread
 * [0, first(c)), worker subtree(c) = [first(c), c], then the main thread
 * takes c's update matrix and does (c, nSuper).
 *
 * `factorRange` references nothing outside its arguments, so the worker runs
 * the very same code: its source text, with the dense kernels', is handed to
 * a worker_threads Worker (eval mode). The factor values are written by both
 * threads into one SharedArrayBuffer; each thread has its own WebAssembly
 * memory for fronts and update stack.
 */

import { Worker } from 'node:worker_threads';
import { denseKernelSource, factorFrontPivots, failedPivotValue, rankUpdate, type SimdKernel } from './dense.js';
import { wasmModuleBytes, type ExtendAdd, type ZeroLower } from './wasm-kernel.js';

/** Everything factorRange reads and writes. Index bases let a thread hold only its slice. */
export interface RangeContext {
  readonly s0: number;
  readonly s1: number;
  readonly superStart: Int32Array;
  readonly superParent: Int32Array;
  readonly rowPtr: Int32Array;
  /** rows of supernodes s0..s1-1, superRows[rowPtr[s] - rowBase + t] */
  readonly superRows: Int32Array;
  readonly rowBase: number;
  readonly valuePtr: Float64Array;
  readonly entryPtr: Int32Array;
  /** values of A in entry order and their front offsets, index q - entryBase */
  readonly entryValues: Float64Array;
  readonly entryOffset: Int32Array;
  readonly entryBase: number;
  /** the factor values (full length; supernode s at valuePtr[s]) */
  readonly L: Float64Array;
  readonly front: Float64Array;
  readonly stack: Float64Array;
  readonly rel: Int32Array;
  readonly map: Int32Array;
  readonly sHead: Int32Array;
  readonly sNext: Int32Array;
  readonly updStart: Float64Array;
  readonly threshold: number;
  readonly panelScratch: Float64Array;
  /** WebAssembly helpers and SIMD kernels, or null for plain JavaScript */
  readonly zeroLower: ZeroLower | null;
  readonly extendAdd: ExtendAdd | null;
  readonly relByte: number;
  readonly stackByte: number;
  readonly simdFront: SimdKernel | null;
  readonly simdStack: SimdKernel | null;
}

/** The dense kernels, passed in so that factorRange has no free references. */
export interface RangeKernels {
  readonly factorFrontPivots: typeof factorFrontPivots;
  readonly rankUpdate: typeof rankUpdate;
  readonly lastPivot: () => number;
}

/** Outcome of factorRange: the stack top after it, or the first failed pivot. */
export interface RangeResult {
  top: number;
  /** permuted column of the first failed pivot, or -1 */
  failedColumn: number;
  pivot: number;
}

/**
 * Factorises supernodes ctx.s0 .. ctx.s1-1 in order, starting with `top`
 * doubles already on the update stack (the updates of earlier supernodes).
 * Stops at the first pivot that fails the threshold.
 */
export function factorRange(ctx: RangeContext, kern: RangeKernels, top: number): RangeResult {
  const { superStart, superParent, rowPtr, superRows, rowBase, valuePtr, entryPtr, entryValues, entryOffset, entryBase } = ctx;
  const { L, front, stack, rel, map, sHead, sNext, updStart, threshold, panelScratch } = ctx;
  const { zeroLower, extendAdd, relByte, stackByte, simdFront, simdStack } = ctx;
  for (let s = ctx.s0; s < ctx.s1; s++) {
    const f = superStart[s];
    const k = superStart[s + 1] - f;
    const r0 = rowPtr[s] - rowBase;
    const m = rowPtr[s + 1] - rowPtr[s];
    for (let t = 0; t < m; t++) map[superRows[r0 + t]] = t;
    // zero the lower triangle of the front
    if (zeroLower !== null) zeroLower(0, m * 8);
    else for (let t = 0; t < m; t++) front.fill(0, t * m, t * m + t + 1);
    // assemble the entries of A(p,p) in columns f .. f+k-1
    for (let q = entryPtr[s] - entryBase; q < entryPtr[s + 1] - entryBase; q++) front[entryOffset[q]] += entryValues[q];
    // extend-add the children's update matrices, then pop them
    let firstChildStart = -1;
    for (let ch = sHead[s]; ch !== -1; ch = sNext[ch]) {
      const kc = superStart[ch + 1] - superStart[ch];
      const rc = rowPtr[ch] - rowBase + kc;
      const mc = rowPtr[ch + 1] - rowBase - rc;
      for (let t = 0; t < mc; t++) rel[t] = map[superRows[rc + t]];
      const base = updStart[ch];
      if (firstChildStart < 0) firstChildStart = base;
      if (extendAdd !== null) {
        extendAdd(0, m * 8, stackByte + base * 8, relByte, mc);
      } else {
        let u = base;
        for (let aa = 0; aa < mc; aa++) {
          const row = rel[aa] * m;
          for (let bb = 0; bb <= aa; bb++) front[row + rel[bb]] += stack[u++];
        }
      }
    }
    if (firstChildStart >= 0) top = firstChildStart;
    // partial factorisation of the k pivot columns
    const bad = kern.factorFrontPivots(front, m, k, threshold, panelScratch, simdFront);
    if (bad >= 0) return { top, failedColumn: f + bad, pivot: kern.lastPivot() };
    // copy the factor rows out
    let dst = valuePtr[s];
    for (let aa = 0; aa < m; aa++) {
      const cnt = aa < k ? aa + 1 : k;
      const src = aa * m;
      for (let t = 0; t < cnt; t++) L[dst + t] = front[src + t];
      dst += cnt;
    }
    // Schur complement onto the stack (packed lower, row-major)
    const u = m - k;
    if (u > 0 && superParent[s] !== -1) {
      updStart[s] = top;
      kern.rankUpdate(front, m, k, m, k, m, 0, k, stack, top, simdStack);
      top += (u * (u + 1)) / 2;
    }
  }
  return { top, failedColumn: -1, pivot: 0 };
}

/**
 * Forward substitution y := L^-1 y over supernodes s0 .. s1-1 (permuted
 * numbering). Updates of rows >= deltaFrom go to delta instead of y (the
 * rows a worker shares with the other thread); pass delta = y and
 * deltaFrom = n for a plain pass. Rows below a supernode's diagonal block
 * are taken four at a time.
 */
export function forwardRange(
  L: Float64Array,
  superStart: Int32Array,
  rowPtr: Int32Array,
  superRows: Int32Array,
  valuePtr: Float64Array,
  y: Float64Array,
  s0: number,
  s1: number,
  delta: Float64Array,
  deltaFrom: number,
): void {
  for (let s = s0; s < s1; s++) {
    const f = superStart[s];
    const k = superStart[s + 1] - f;
    const r0 = rowPtr[s];
    const m = rowPtr[s + 1] - r0;
    let o = valuePtr[s];
    for (let a = 0; a < k; a++) {
      let sum = y[f + a];
      for (let j = 0; j < a; j++) sum -= L[o + j] * y[f + j];
      y[f + a] = sum / L[o + a];
      o += a + 1;
    }
    let a = k;
    for (; a + 3 < m; a += 4) {
      const o1 = o + k;
      const o2 = o1 + k;
      const o3 = o2 + k;
      let t0 = 0;
      let t1 = 0;
      let t2 = 0;
      let t3 = 0;
      for (let j = 0; j < k; j++) {
        const yj = y[f + j];
        t0 += L[o + j] * yj;
        t1 += L[o1 + j] * yj;
        t2 += L[o2 + j] * yj;
        t3 += L[o3 + j] * yj;
      }
      const i0 = superRows[r0 + a];
      const i1 = superRows[r0 + a + 1];
      const i2 = superRows[r0 + a + 2];
      const i3 = superRows[r0 + a + 3];
      if (i0 < deltaFrom) y[i0] -= t0;
      else delta[i0] -= t0;
      if (i1 < deltaFrom) y[i1] -= t1;
      else delta[i1] -= t1;
      if (i2 < deltaFrom) y[i2] -= t2;
      else delta[i2] -= t2;
      if (i3 < deltaFrom) y[i3] -= t3;
      else delta[i3] -= t3;
      o += 4 * k;
    }
    for (; a < m; a++) {
      let t0 = 0;
      for (let j = 0; j < k; j++) t0 += L[o + j] * y[f + j];
      const i0 = superRows[r0 + a];
      if (i0 < deltaFrom) y[i0] -= t0;
      else delta[i0] -= t0;
      o += k;
    }
  }
}

/**
 * Back substitution y := L^-T y over supernodes s1-1 down to s0; t is
 * scratch of at least the largest supernode's column count.
 */
export function backwardRange(
  L: Float64Array,
  superStart: Int32Array,
  rowPtr: Int32Array,
  superRows: Int32Array,
  valuePtr: Float64Array,
  y: Float64Array,
  s0: number,
  s1: number,
  t: Float64Array,
): void {
  for (let s = s1 - 1; s >= s0; s--) {
    const f = superStart[s];
    const k = superStart[s + 1] - f;
    const r0 = rowPtr[s];
    const m = rowPtr[s + 1] - r0;
    for (let j = 0; j < k; j++) t[j] = y[f + j];
    let o = valuePtr[s] + (k * (k + 1)) / 2;
    let a = k;
    for (; a + 3 < m; a += 4) {
      const x0 = y[superRows[r0 + a]];
      const x1 = y[superRows[r0 + a + 1]];
      const x2 = y[superRows[r0 + a + 2]];
      const x3 = y[superRows[r0 + a + 3]];
      const o1 = o + k;
      const o2 = o1 + k;
      const o3 = o2 + k;
      for (let j = 0; j < k; j++) t[j] -= L[o + j] * x0 + L[o1 + j] * x1 + L[o2 + j] * x2 + L[o3 + j] * x3;
      o += 4 * k;
    }
    for (; a < m; a++) {
      const x0 = y[superRows[r0 + a]];
      for (let j = 0; j < k; j++) t[j] -= L[o + j] * x0;
      o += k;
    }
    for (let a2 = k - 1; a2 >= 0; a2--) {
      const ro = valuePtr[s] + (a2 * (a2 + 1)) / 2;
      const xa = t[a2] / L[ro + a2];
      y[f + a2] = xa;
      for (let j = 0; j < a2; j++) t[j] -= L[ro + j] * xa;
    }
  }
}

/** The kernels of this thread. */
export function mainThreadKernels(): RangeKernels {
  return { factorFrontPivots, rankUpdate, lastPivot: () => failedPivotValue };
}

/** Children lists of the supernodal tree (increasing order). */
export function childLists(superParent: Int32Array): { sHead: Int32Array; sNext: Int32Array } {
  const nSuper = superParent.length;
  const sHead = new Int32Array(nSuper).fill(-1);
  const sNext = new Int32Array(nSuper).fill(-1);
  for (let s = nSuper - 1; s >= 0; s--) {
    const p = superParent[s];
    if (p !== -1) {
      sNext[s] = sHead[p];
      sHead[p] = s;
    }
  }
  return { sHead, sNext };
}

/**
 * The subtree to give the worker: the supernode c (not a root) maximising
 * min(work of subtree(c), work of the supernodes numbered before it), so
 * both threads are busy as long as possible. Work is the factorisation's
 * (dense operations per front) or the solves' (values and rows). Returns c and first(c), or
 * null when no split leaves each thread at least a fifth of the work.
 */
export function chooseSplit(
  superStart: Int32Array,
  superParent: Int32Array,
  rowPtr: Int32Array,
  measure: 'flops' | 'values' = 'flops',
): { c: number; first: number } | null {
  const nSuper = superParent.length;
  const work = new Float64Array(nSuper);
  const subtree = new Float64Array(nSuper);
  const first = new Int32Array(nSuper);
  for (let s = 0; s < nSuper; s++) first[s] = s;
  let total = 0;
  for (let s = 0; s < nSuper; s++) {
    const k = superStart[s + 1] - superStart[s];
    const m = rowPtr[s + 1] - rowPtr[s];
    work[s] = measure === 'flops' ? (k * k * k) / 3 + (m - k) * k * k + (m - k) * (m - k) * k + m * m : m * k + m;
    total += work[s];
  }
  for (let s = 0; s < nSuper; s++) {
    subtree[s] += work[s];
    const p = superParent[s];
    if (p !== -1) {
      subtree[p] += subtree[s];
      if (first[s] < first[p]) first[p] = first[s];
    }
  }
  const prefix = new Float64Array(nSuper + 1);
  for (let s = 0; s < nSuper; s++) prefix[s + 1] = prefix[s] + work[s];
  let best = -1;
  let bestScore = 0;
  for (let c = 0; c < nSuper; c++) {
    if (superParent[c] === -1) continue;
    const score = Math.min(subtree[c], prefix[first[c]]);
    if (score > bestScore) {
      bestScore = score;
      best = c;
    }
  }
  if (best < 0 || bestScore < 0.2 * total) return null;
  return { c: best, first: first[best] };
}

/** One job for the worker (structured-cloned; the SharedArrayBuffers are shared). */
interface WorkerJob {
  readonly n: number;
  readonly s0: number;
  readonly s1: number;
  readonly superStart: Int32Array;
  readonly superParent: Int32Array;
  readonly rowPtr: Int32Array;
  readonly superRows: Int32Array;
  readonly rowBase: number;
  readonly valuePtr: Float64Array;
  readonly entryPtr: Int32Array;
  readonly entryValues: Float64Array;
  readonly entryOffset: Int32Array;
  readonly entryBase: number;
  readonly maxFront: number;
  readonly stackPeak: number;
  readonly threshold: number;
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

let persistent: { worker: Worker; wasm: boolean } | null = null;
let workersUnavailable = false;

/**
 * The worker, started on first use. Its code signals readiness through a
 * shared word; a worker that cannot start (no threads here, or its code
 * does not compile in this environment) is reported as null once and the
 * factorisation stays on one thread.
 */
function workerFor(useWasm: boolean): Worker | null {
  if (workersUnavailable) return null;
  if (persistent !== null && persistent.wasm === useWasm) return persistent.worker;
  if (persistent !== null) void persistent.worker.terminate();
  persistent = null;
  const code = [denseKernelSource(), factorRange.toString(), forwardRange.toString(), backwardRange.toString(), WORKER_MAIN].join('\n');
  const ready = new SharedArrayBuffer(4);
  let worker: Worker;
  try {
    worker = new Worker(code, { eval: true, workerData: { wasmBytes: useWasm ? wasmModuleBytes() : null, ready } });
  } catch {
    workersUnavailable = true;
    return null;
  }
  worker.unref(); // never keeps the process alive
  if (Atomics.wait(new Int32Array(ready), 0, 0, WORKER_START_TIMEOUT_MS) === 'timed-out') {
    void worker.terminate();
    workersUnavailable = true;
    return null;
  }
  persistent = { worker, wasm: useWasm };
  return worker;
}

/** How long a new worker may take to start before the second thread is given up. */
const WORKER_START_TIMEOUT_MS = 10_000;

/** Sends subtree [first, c] of the supernodal tree to the worker thread; null when no worker can run. */
export function startSubtreeWorker(args: {
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
}): SubtreeWorker | null {
  const worker = workerFor(args.useWasm);
  if (worker === null) return null;
  const { first, c, superStart, rowPtr, entryPtr } = args;
  const s0 = first;
  const s1 = c + 1;
  // size the worker's front and stack for its own subtree
  let maxFront = 1;
  let stackTop = 0;
  let stackPeak = 0;
  const upd = new Float64Array(s1);
  const { sHead, sNext } = childLists(args.superParent);
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
    terminate() {
      if (persistent !== null && persistent.worker === worker) persistent = null;
      void worker.terminate();
    },
  };
}

/** A triangular-solve job under way on the worker. */
export interface SolveJob {
  join(timeoutMs: number): 'done' | 'error' | 'timeout';
  terminate(): void;
}

/**
 * Sends the worker's half of a forward or backward pass over subtree
 * [s0, s1) (shared factor, shared y; forward updates of rows from
 * superStart[s1] on go to the shared delta). Null when no worker can run.
 * The index arrays are cloned into the message unless they are shared
 * memory (superRows is, from analyzeCholesky).
 */
export function startSolveJob(
  kind: 'forward' | 'backward',
  job: {
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
  },
): SolveJob | null {
  const worker = persistent !== null ? persistent.worker : workerFor(true);
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
    terminate() {
      if (persistent !== null && persistent.worker === worker) persistent = null;
      void worker.terminate();
    },
  };
}
