import type { Worker } from 'node:worker_threads';
import {
  crossProduct as oneThread,
  crossProductPanels,
  mirrorLower,
  packColumns,
  packedLength,
  rowPanels,
} from '../../shared-core/linalg/cross-product.js';
import type { Matrix } from '../../shared-core/linalg/matrix.js';
import { awaitJob, claimJob, DONE, endJob, FAILED, FLAG, OPEN, TAKEN_BACK } from './job-flag.js';
import { createSecondThread, processSecondThread, type SecondThread } from './second-thread.js';

/**
 * X'X on both cores with the core's own kernel (shared-core/linalg/cross-product.ts), so the
 * numbers are the single-thread ones bit for bit. The main thread packs X once into shared
 * memory; then both threads take row panels of the lower triangle from one shared counter, the
 * most expensive first, so they finish together whatever the helper's start-up, its first-call
 * compilation or the other load on the machine. It stays synchronous for the pure core that calls
 * it: the main thread waits on a shared flag with Atomics.wait, which Node allows. Below MIN_WORK
 * multiply-adds (MIN_WORK_READY once the thread is up) the main thread does all of it.
 */
export interface PanelsJob {
  kind: 'panels';
  /** X packed by packColumns. */
  packed: SharedArrayBuffer;
  out: SharedArrayBuffer;
  /** Int32 slots: FLAG (the job's state), NEXT (panels handed out), BY_HELPER (panels it computed). */
  control: SharedArrayBuffer;
  rows: number;
  cols: number;
}

/** Slots after the job state (job-flag.ts). */
const NEXT = 1;
const BY_HELPER = 2;

/** N(N+1)/2 T multiply-adds below which starting the thread (about 0.1-0.2 s) costs more than it saves (N near 900 at T = 1260). */
export const MIN_WORK = 5e8;
/**
 * The same with the thread already up (a command started it early): a hand-off then costs the
 * packing into shared memory (which one thread does anyway) and a wake-up, well under a
 * millisecond at N = 200, T = 1260 (25 million multiply-adds, about 10 ms on one thread).
 */
export const MIN_WORK_READY = 2e7;

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
    const byHelper = onTwoThreads(x, out, helper);
    stats.rowsByWorker += Math.min(n, byHelper * 4);
    return { rows: n, cols: n, data: out };
  };
  return { crossProduct, stats };
}

/** The command line's, on the process's one helper thread. */
export const twoThreadCrossProduct = createTwoThreadCrossProduct({ thread: processSecondThread }).crossProduct;

/** The claim both threads share: row panels from the last (the longest) down to 0, then -1. */
export function panelClaim(control: Int32Array, panels: number): () => number {
  return () => {
    const k = Atomics.add(control, NEXT, 1);
    return k < panels ? panels - 1 - k : -1;
  };
}

/** Fills `out` with X'X; returns how many row panels the helper computed. */
function onTwoThreads(x: Matrix, out: Float64Array, helper: Worker): number {
  const t = x.rows;
  const n = x.cols;
  const packed = packColumns(x, new Float64Array(new SharedArrayBuffer(packedLength(x) * 8)));
  const control = new Int32Array(new SharedArrayBuffer(3 * 4));
  helper.postMessage({
    kind: 'panels',
    packed: packed.buffer as SharedArrayBuffer,
    out: out.buffer as SharedArrayBuffer,
    control: control.buffer as SharedArrayBuffer,
    rows: t,
    cols: n,
  } satisfies PanelsJob);
  crossProductPanels(t, n, packed, out, panelClaim(control, rowPanels(n)));
  // Every panel is handed out: close the job if the helper never began, else wait for its last.
  const began = Atomics.compareExchange(control, FLAG, OPEN, TAKEN_BACK) !== OPEN;
  if (began && !awaitJob(control, 'its rows of the cross product')) {
    // It failed, and which of its panels it finished is unknown: all of it again, here.
    out.set(oneThread(x).data);
    return 0;
  }
  mirrorLower(out, n);
  return Atomics.load(control, BY_HELPER);
}

/** The helper's side: claims the job unless it was closed, computes panels until none is left. */
export function runPanelsJob(job: PanelsJob): void {
  const control = new Int32Array(job.control);
  if (!claimJob(control)) return;
  try {
    const panels = rowPanels(job.cols);
    const done = crossProductPanels(
      job.rows,
      job.cols,
      new Float64Array(job.packed),
      new Float64Array(job.out),
      panelClaim(control, panels),
    );
    Atomics.store(control, BY_HELPER, done);
    endJob(control, DONE);
  } catch {
    endJob(control, FAILED);
  }
}
