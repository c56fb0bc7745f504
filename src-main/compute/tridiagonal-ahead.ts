import type { Matrix } from '../../shared-core/linalg/matrix.js';
import { tridiagonalForm, type TridiagonalForm } from '../../shared-core/linalg/tridiagonal-form.js';
import { awaitJob, claimJob, DONE, endJob, FAILED } from './job-flag.js';
import { attachRotations, claimRecording, newRecording, recordClaimed, type Recording } from './rotations-ahead.js';
import { createSecondThread, processSecondThread, type SecondThread } from './second-thread.js';
import { MIN_SIZE } from './two-thread-tridiagonal.js';

/**
 * The tridiagonal reduction (shared-core/linalg/tridiagonal-form.ts) run on the helper thread
 * while the calling thread goes on: `holdfast solve` solves the candidates' programmes while the
 * estimate is reduced for its condition number and effective bets, which the run needs only at
 * the end. The helper runs the core's own function on a copy of the matrix in shared memory, so
 * the form is the calling thread's bit for bit, and then records the QL iteration on it
 * (rotations-ahead.ts) for the effective bets. Used between MIN_AHEAD and two-thread-tridiagonal's
 * MIN_SIZE, and only once the thread is up: above MIN_SIZE both threads reduce together instead,
 * which is sooner than one reduction in the background (it takes 2.3 s x (N / 1500)^3).
 */
export interface ReduceJob {
  kind: 'reduce';
  n: number;
  /** N x N: the matrix in, the form's reflectors out. */
  matrix: SharedArrayBuffer;
  /** 3 N: the diagonal, the off-diagonal and the half norms out. */
  vectors: SharedArrayBuffer;
  /** Int32: the reduction's state (job-flag.ts). */
  flag: SharedArrayBuffer;
  /** The QL recording out, done after the form is handed back (rotations-ahead.ts). */
  recording: Recording;
}

/** Below this size a reduction takes about a millisecond: not worth a hand-off. */
export const MIN_AHEAD = 150;

export interface TridiagonalAheadOptions {
  thread?: SecondThread;
  script?: URL;
  minSize?: number;
  maxSize?: number;
}

/**
 * `start(m)` hands m's reduction to the helper and returns the wait for its form, or undefined
 * when the helper is not up or m's size is outside [minSize, maxSize).
 */
export function createTridiagonalAhead(options: TridiagonalAheadOptions = {}): {
  start: (m: Matrix) => (() => TridiagonalForm) | undefined;
  stats: { byHelper: number };
} {
  const thread = options.thread ?? createSecondThread(options.script);
  const minSize = options.minSize ?? MIN_AHEAD;
  const maxSize = options.maxSize ?? MIN_SIZE;
  const stats = { byHelper: 0 };
  const start = (m: Matrix): (() => TridiagonalForm) | undefined => {
    const n = m.rows;
    if (m.cols !== n || n < minSize || n >= maxSize || !thread.ready()) return undefined;
    const helper = thread.worker();
    if (!helper) return undefined;
    const matrix = new Float64Array(new SharedArrayBuffer(n * n * 8));
    matrix.set(m.data.subarray(0, n * n));
    const vectors = new Float64Array(new SharedArrayBuffer(3 * n * 8));
    const recording = newRecording(n);
    const flag = new Int32Array(new SharedArrayBuffer(4));
    helper.postMessage({
      kind: 'reduce',
      n,
      matrix: matrix.buffer as SharedArrayBuffer,
      vectors: vectors.buffer as SharedArrayBuffer,
      flag: flag.buffer as SharedArrayBuffer,
      recording,
    } satisfies ReduceJob);
    let form: TridiagonalForm | undefined;
    return () => {
      if (form) return form;
      // Not begun by now (the helper is busy or gone), or failed: reduce here.
      if (!awaitJob(flag, 'the tridiagonal reduction')) return (form = tridiagonalForm(m));
      stats.byHelper++;
      // The helper goes on to record QL; the effective bets wait for it, the condition number not.
      return (form = attachRotations(
        {
          n,
          reflectors: matrix,
          diagonal: vectors.subarray(0, n),
          offDiagonal: vectors.subarray(n, 2 * n),
          halfNorms: vectors.subarray(2 * n, 3 * n),
        },
        recording,
      ));
    };
  };
  return { start, stats };
}

/** The helper's side: reduce, write the form back, say so; then record the QL rotations. */
export function runReduceJob(job: ReduceJob): void {
  const flag = new Int32Array(job.flag);
  if (!claimJob(flag)) return;
  try {
    const n = job.n;
    const matrix = new Float64Array(job.matrix);
    const form = tridiagonalForm({ rows: n, cols: n, data: matrix });
    matrix.set(form.reflectors);
    const vectors = new Float64Array(job.vectors);
    vectors.set(form.diagonal, 0);
    vectors.set(form.offDiagonal, n);
    vectors.set(form.halfNorms, 2 * n);
    // Claimed before the form is handed back, so the caller's first read of it waits for it.
    const recording = claimRecording(job.recording);
    endJob(flag, DONE);
    if (recording) recordClaimed(form, job.recording);
  } catch {
    endJob(flag, FAILED);
  }
}

/** The command line's, on the process's one helper thread. */
export const tridiagonalAhead = createTridiagonalAhead({ thread: processSecondThread }).start;
