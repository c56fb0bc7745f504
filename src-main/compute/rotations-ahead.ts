import type { Worker } from 'node:worker_threads';
import { recordRotations } from '../../shared-core/linalg/symmetric-eigen.js';
import type { QlRotations, TridiagonalForm } from '../../shared-core/linalg/tridiagonal-form.js';
import { awaitJob, claimJob, DONE, endJob, FAILED } from './job-flag.js';

/**
 * The QL iteration on a reduced matrix's tridiagonal, run once on the helper thread and recorded
 * (shared-core/linalg/symmetric-eigen.ts recordRotations), while the calling thread solves: each
 * candidate's effective bets then replay the rotations on its weights in O(N^2) instead of
 * iterating again. The form itself stays the calling thread's.
 */
export interface RotationsJob {
  kind: 'rotations';
  n: number;
  /** 2 N in: the diagonal and the off-diagonal of T. */
  tridiagonal: SharedArrayBuffer;
  recording: Recording;
}

/** Where a recording goes, and its own flag. */
export interface Recording {
  /** N out: the eigenvalues in QL's order. */
  values: SharedArrayBuffer;
  steps: SharedArrayBuffer;
  cs: SharedArrayBuffer;
  /** Int32: [FLAG, STEP_COUNT, CS_COUNT]. */
  flag: SharedArrayBuffer;
}

/** Slots of a recording's Int32 flag after the job state (job-flag.ts): the recorded lengths (-1 where they did not fit). */
const STEP_COUNT = 1;
const CS_COUNT = 2;

/**
 * Room for well over what QL took on the bench estimates: 1.7 N steps and 0.95 N^2 rotations at
 * N = 500, 1.5 N and 0.64 N^2 at N = 1500 (two numbers, c and s, per rotation). A recording that
 * does not fit is dropped and the caller iterates itself.
 */
const stepCapacity = (n: number): number => 8 * n + 16;
const csCapacity = (n: number): number => 3 * n * n + 16;

/** Shared buffers for a recording of size n. */
export function newRecording(n: number): Recording {
  return {
    values: new SharedArrayBuffer(n * 8),
    steps: new SharedArrayBuffer(stepCapacity(n) * 4),
    cs: new SharedArrayBuffer(csCapacity(n) * 8),
    flag: new SharedArrayBuffer(3 * 4),
  };
}

/** The helper's side: claims the recording unless it was taken back. */
export function claimRecording(r: Recording): boolean {
  return claimJob(new Int32Array(r.flag));
}

/** The helper's side of a claimed recording: records QL on `form`, says so. */
export function recordClaimed(form: TridiagonalForm, r: Recording): void {
  const flag = new Int32Array(r.flag);
  try {
    const recorded = recordRotations(form, new Float64Array(r.values), new Int32Array(r.steps), new Float64Array(r.cs));
    Atomics.store(flag, STEP_COUNT, recorded ? recorded.steps.length : -1);
    Atomics.store(flag, CS_COUNT, recorded ? recorded.cs.length : -1);
    endJob(flag, DONE);
  } catch {
    endJob(flag, FAILED);
  }
}

/**
 * The calling thread's side: the wait for a recording, giving the rotations, or undefined if
 * the helper did not do it (formExposures then iterates itself). Waited for once.
 */
function recordedRotations(r: Recording): () => QlRotations | undefined {
  let answer: { rotations: QlRotations | undefined } | undefined;
  const read = (): QlRotations | undefined => {
    const flag = new Int32Array(r.flag);
    if (!awaitJob(flag, 'the QL iteration')) return undefined;
    const stepCount = Atomics.load(flag, STEP_COUNT);
    if (stepCount < 0) return undefined;
    return {
      values: new Float64Array(r.values),
      steps: new Int32Array(r.steps, 0, stepCount),
      cs: new Float64Array(r.cs, 0, Atomics.load(flag, CS_COUNT)),
    };
  };
  return () => (answer ??= { rotations: read() }).rotations;
}

/** Gives `form` the recording as a `rotations` read on first use. */
export function attachRotations(form: TridiagonalForm, r: Recording): TridiagonalForm {
  Object.defineProperty(form, 'rotations', { get: recordedRotations(r), enumerable: true });
  return form;
}

/** Hands the QL recording of `form` to the helper; the form reads it as `rotations` on first use. */
export function startRotations(helper: Worker, form: TridiagonalForm): void {
  const n = form.n;
  const tridiagonal = new Float64Array(new SharedArrayBuffer(2 * n * 8));
  tridiagonal.set(form.diagonal, 0);
  tridiagonal.set(form.offDiagonal, n);
  const recording = newRecording(n);
  helper.postMessage({
    kind: 'rotations',
    n,
    tridiagonal: tridiagonal.buffer as SharedArrayBuffer,
    recording,
  } satisfies RotationsJob);
  attachRotations(form, recording);
}

/** The helper's side of a `rotations` job. */
export function runRotationsJob(job: RotationsJob): void {
  const n = job.n;
  const t = new Float64Array(job.tridiagonal);
  const form: TridiagonalForm = {
    n,
    diagonal: t.subarray(0, n),
    offDiagonal: t.subarray(n, 2 * n),
    reflectors: new Float64Array(0),
    halfNorms: new Float64Array(0),
  };
  if (claimRecording(job.recording)) recordClaimed(form, job.recording);
}
