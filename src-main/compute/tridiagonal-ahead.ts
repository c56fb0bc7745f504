import type { Matrix } from '../../shared-core/linalg/matrix.js';
import { recordRotations } from '../../shared-core/linalg/symmetric-eigen.js';
import { tridiagonalForm, type TridiagonalForm } from '../../shared-core/linalg/tridiagonal-form.js';
import { MIN_SIZE } from './two-thread-tridiagonal.js';
import { createSecondThread, processSecondThread, type SecondThread } from './second-thread.js';

/**
 * The tridiagonal reduction (shared-core/linalg/tridiagonal-form.ts) run on the helper thread
 * while the calling thread goes on: `holdfast solve` solves the candidates' programmes while the
 * estimate is reduced for its condition number and effective bets, which the run needs only at
 * the end. The helper runs the core's own function on a copy of the matrix in shared memory, so
 * the form is the calling thread's bit for bit. Used between MIN_AHEAD and two-thread-tridiagonal's
 * MIN_SIZE, and only once the thread is up: above MIN_SIZE both threads reduce together instead,
 * which is sooner than one reduction in the background (it takes 2.3 s x (N / 1500)^3). The
 * helper also runs the QL iteration on the tridiagonal once and records its rotations
 * (recordRotations), so that each candidate's effective bets replay them on its weights.
 */
export interface ReduceJob {
  kind: 'reduce';
  n: number;
  /** N x N: the matrix in, the form's reflectors out. */
  matrix: SharedArrayBuffer;
  /** 4 N: the diagonal, the off-diagonal, the half norms and the QL eigenvalues out. */
  vectors: SharedArrayBuffer;
  /** The QL steps (l, m) and rotations (c, s) out, up to their capacity. */
  steps: SharedArrayBuffer;
  cs: SharedArrayBuffer;
  /**
   * Int32 slot FLAG: OPEN, CLAIMED, DONE or FAILED (written by the helper), or TAKEN_BACK; slots
   * STEP_COUNT and CS_COUNT: the recorded lengths (-1 where they did not fit).
   */
  flag: SharedArrayBuffer;
}

const FLAG = 0;
const STEP_COUNT = 1;
const CS_COUNT = 2;
/** Room for about twice what QL took on the N = 500 bench estimate: 1.7 N steps, 0.95 N^2 rotations. */
const stepCapacity = (n: number) => 8 * n + 16;
const csCapacity = (n: number) => 4 * n * n + 16;

export const OPEN = 0;
export const CLAIMED = 1;
export const DONE = 2;
export const FAILED = 3;
export const TAKEN_BACK = 4;

/** Below this size a reduction takes about a millisecond: not worth a hand-off. */
export const MIN_AHEAD = 150;
const JOB_MS = 10 * 60 * 1000;

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
    const vectors = new Float64Array(new SharedArrayBuffer(4 * n * 8));
    const steps = new Int32Array(new SharedArrayBuffer(stepCapacity(n) * 4));
    const cs = new Float64Array(new SharedArrayBuffer(csCapacity(n) * 8));
    const flag = new Int32Array(new SharedArrayBuffer(3 * 4));
    helper.postMessage({
      kind: 'reduce',
      n,
      matrix: matrix.buffer as SharedArrayBuffer,
      vectors: vectors.buffer as SharedArrayBuffer,
      steps: steps.buffer as SharedArrayBuffer,
      cs: cs.buffer as SharedArrayBuffer,
      flag: flag.buffer as SharedArrayBuffer,
    } satisfies ReduceJob);
    let form: TridiagonalForm | undefined;
    return () => {
      if (form) return form;
      // Not begun yet (the helper is busy or gone): take it back and reduce here.
      if (Atomics.compareExchange(flag, FLAG, OPEN, TAKEN_BACK) === OPEN) return (form = tridiagonalForm(m));
      while (Atomics.load(flag, FLAG) === CLAIMED)
        if (Atomics.wait(flag, FLAG, CLAIMED, JOB_MS) === 'timed-out')
          throw new Error('the helper thread did not finish the tridiagonal reduction');
      if (Atomics.load(flag, FLAG) !== DONE) return (form = tridiagonalForm(m));
      stats.byHelper++;
      const stepCount = Atomics.load(flag, STEP_COUNT);
      form = {
        n,
        reflectors: matrix,
        diagonal: vectors.subarray(0, n),
        offDiagonal: vectors.subarray(n, 2 * n),
        halfNorms: vectors.subarray(2 * n, 3 * n),
      };
      if (stepCount >= 0)
        form.rotations = {
          values: vectors.subarray(3 * n, 4 * n),
          steps: steps.subarray(0, stepCount),
          cs: cs.subarray(0, Atomics.load(flag, CS_COUNT)),
        };
      return form;
    };
  };
  return { start, stats };
}

/** The helper's side: reduce, record the QL rotations, write the form back, say so. */
export function runReduceJob(job: ReduceJob): void {
  const flag = new Int32Array(job.flag);
  if (Atomics.compareExchange(flag, FLAG, OPEN, CLAIMED) !== OPEN) return;
  try {
    const n = job.n;
    const matrix = new Float64Array(job.matrix);
    const form = tridiagonalForm({ rows: n, cols: n, data: matrix });
    matrix.set(form.reflectors);
    const vectors = new Float64Array(job.vectors);
    vectors.set(form.diagonal, 0);
    vectors.set(form.offDiagonal, n);
    vectors.set(form.halfNorms, 2 * n);
    const recorded = recordRotations(
      form,
      vectors.subarray(3 * n),
      new Int32Array(job.steps),
      new Float64Array(job.cs),
    );
    Atomics.store(flag, STEP_COUNT, recorded ? recorded.steps.length : -1);
    Atomics.store(flag, CS_COUNT, recorded ? recorded.cs.length : -1);
    Atomics.store(flag, FLAG, DONE);
  } catch {
    Atomics.store(flag, FLAG, FAILED);
  }
  Atomics.notify(flag, FLAG);
}

/** The command line's, on the process's one helper thread. */
export const tridiagonalAhead = createTridiagonalAhead({ thread: processSecondThread }).start;
