import type { Worker } from 'node:worker_threads';
import { crossProduct as oneThread, crossProductRows, mirrorLower } from '../../shared-core/linalg/cross-product.js';
import type { Matrix } from '../../shared-core/linalg/matrix.js';
import { createSecondThread, processSecondThread, type SecondThread } from './second-thread.js';

/**
 * X'X on both cores: the main thread computes the first rows of the lower triangle, a worker
 * thread the rest, with the core's own kernel (shared-core/linalg/cross-product.ts), so the
 * numbers are the single-thread ones bit for bit. It stays synchronous for the pure core that
 * calls it: the main thread waits on a shared flag with Atomics.wait, which Node allows. Below
 * MIN_WORK multiply-adds (MIN_WORK_READY once the thread is up), or if the worker has not started
 * within STARTUP_MS, the main thread does all of it.
 */
export interface RowsJob {
  kind: 'rows';
  x: SharedArrayBuffer;
  out: SharedArrayBuffer;
  flag: SharedArrayBuffer;
  rows: number;
  cols: number;
  rowStart: number;
  rowEnd: number;
}

/** Job flag states. */
export const CLAIMED = 1;
export const DONE = 2;
export const FAILED = 3;
export const TAKEN_BACK = 4;

/** N(N+1)/2 T multiply-adds below which starting the thread (about 0.1-0.2 s) costs more than it saves (N near 900 at T = 1260). */
export const MIN_WORK = 5e8;
/**
 * The same with the thread already up (a command started it early): a hand-off then costs the
 * copy of X into shared memory and a wake-up, well under a millisecond at N = 200, T = 1260
 * (25 million multiply-adds, about 10 ms on one thread).
 */
export const MIN_WORK_READY = 2e7;
const STARTUP_MS = 2000;
const JOB_MS = 10 * 60 * 1000;

export interface TwoThreadOptions {
  /** The helper thread; by default a new one from `script` (compute-thread.js beside this module). */
  thread?: SecondThread;
  script?: URL;
  minWork?: number;
  minWorkReady?: number;
}

/** A two-thread X'X with its own worker; `rowsByWorker` counts the rows the worker computed. */
export function createTwoThreadCrossProduct(options: TwoThreadOptions = {}): {
  crossProduct: (x: Matrix) => Matrix;
  stats: { rowsByWorker: number };
} {
  const thread = options.thread ?? createSecondThread(options.script);
  const minWork = options.minWork ?? MIN_WORK;
  const minWorkReady = options.minWorkReady ?? MIN_WORK_READY;
  const stats = { rowsByWorker: 0 };
  const crossProduct = (x: Matrix): Matrix => {
    const n = x.cols;
    const work = (n * (n + 1) * x.rows) / 2;
    const helper = work >= minWork || (work >= minWorkReady && thread.ready()) ? thread.worker() : undefined;
    if (!helper) return oneThread(x);
    const out = new Float64Array(new SharedArrayBuffer(n * n * 8));
    const byWorker = onTwoThreads(x, out, helper);
    stats.rowsByWorker += byWorker;
    return { rows: n, cols: n, data: out };
  };
  return { crossProduct, stats };
}

/** The command line's, on the process's one helper thread. */
export const twoThreadCrossProduct = createTwoThreadCrossProduct({ thread: processSecondThread }).crossProduct;

/** Fills `out` with X'X, the worker taking the last rows; returns how many rows it computed. */
function onTwoThreads(x: Matrix, out: Float64Array, helper: Worker): number {
  const t = x.rows;
  const n = x.cols;
  const shared = new SharedArrayBuffer(x.data.byteLength);
  new Float64Array(shared).set(x.data);
  const xs = { rows: t, cols: n, data: new Float64Array(shared) };
  // Rows [0, split) hold half of the triangle's work when split = N / sqrt(2), on a panel boundary.
  const split = Math.round(n / Math.SQRT2 / 4) * 4;
  const flag = new Int32Array(new SharedArrayBuffer(4));
  helper.postMessage({
    kind: 'rows',
    x: shared,
    out: out.buffer as SharedArrayBuffer,
    flag: flag.buffer as SharedArrayBuffer,
    rows: t,
    cols: n,
    rowStart: split,
    rowEnd: n,
  } satisfies RowsJob);
  crossProductRows(xs, out, 0, split);
  let byWorker = n - split;
  // Give the worker its start-up time to claim the job; if it has not, take it back.
  if (Atomics.wait(flag, 0, 0, STARTUP_MS) === 'timed-out' && Atomics.compareExchange(flag, 0, 0, TAKEN_BACK) === 0) {
    crossProductRows(xs, out, split, n);
    byWorker = 0;
  } else {
    while (Atomics.load(flag, 0) === CLAIMED)
      if (Atomics.wait(flag, 0, CLAIMED, JOB_MS) === 'timed-out')
        throw new Error('the second thread of the cross product did not finish');
    if (Atomics.load(flag, 0) === FAILED) {
      crossProductRows(xs, out, split, n);
      byWorker = 0;
    }
  }
  mirrorLower(out, n);
  return byWorker;
}
