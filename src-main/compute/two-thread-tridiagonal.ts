import type { Matrix } from '../../shared-core/linalg/matrix.js';
import {
  fusedColumns,
  tridiagonalForm,
  type SecondHalf,
  type TridiagonalForm,
} from '../../shared-core/linalg/tridiagonal-form.js';
import { startRotations } from './rotations-ahead.js';
import { createSecondThread, processSecondThread, type SecondThread } from './second-thread.js';

/**
 * The tridiagonal reduction (shared-core/linalg/tridiagonal-form.ts) on both cores: at every step
 * the helper thread runs the second column range of the pass while the main thread runs the first,
 * with the core's own kernel on shared memory, so the numbers are the single-thread ones bit for
 * bit. A step is handed over by bumping a sequence number that the helper waits on and handed
 * back the same way; each side spins briefly before it sleeps, because the two halves take about
 * the same time and a futex wake-up costs tens of microseconds at every one of N steps. Steps the
 * helper has not claimed yet (it starts in 0.05-0.2 s) run on the main thread.
 */
export interface TridiagonalJob {
  kind: 'tridiagonal';
  n: number;
  w: SharedArrayBuffer;
  u: SharedArrayBuffer;
  q: SharedArrayBuffer;
  v: SharedArrayBuffer;
  second: SharedArrayBuffer;
  /** Int32 slots, see the constants below. */
  control: SharedArrayBuffer;
}

/** control[STATE]: OPEN until the helper claims the job (CLAIMED) or the main thread closes it unclaimed (CLOSED). */
export const STATE = 0;
/** control[GO]: the sequence number of the last step handed over; the helper waits on it. */
export const GO = 1;
/** control[DONE]: the sequence number of the last step the helper finished; FAILED_STEP if it threw. */
export const DONE = 2;
export const SIZE = 3;
export const SPLIT = 4;
/** control[SIZE] = STOP_SIZE ends the job. */
export const STOP_SIZE = -1;
export const FAILED_STEP = -1;
export const OPEN = 0;
export const CLAIMED = 1;
export const CLOSED = 2;
const CONTROL_SLOTS = 5;

/**
 * Below this size the second thread costs more than it saves: starting it (40-60 ms) and N
 * hand-offs against about 45 % of a reduction that takes 2.3 s x (N / 1500)^3 on one thread. At
 * N = 500 one thread was faster by 42 ms in a whole-process A/B run (medians of 11); the two
 * break even near N = 600.
 */
export const MIN_SIZE = 700;
/** Spins before a wait: a few microseconds. */
export const SPINS = 2000;
const STEP_MS = 60 * 1000;

export interface TwoThreadTridiagonalOptions {
  thread?: SecondThread;
  script?: URL;
  minSize?: number;
}

export function createTwoThreadTridiagonal(options: TwoThreadTridiagonalOptions = {}): {
  tridiagonalise: (m: Matrix) => TridiagonalForm;
  stats: { stepsByHelper: number };
} {
  const thread = options.thread ?? createSecondThread(options.script);
  const minSize = options.minSize ?? MIN_SIZE;
  const stats = { stepsByHelper: 0 };
  const tridiagonalise = (m: Matrix): TridiagonalForm => {
    const helper = m.rows < minSize ? undefined : thread.worker();
    if (!helper) return tridiagonalForm(m);
    const control = new Int32Array(new SharedArrayBuffer(CONTROL_SLOTS * 4));
    let space: ReturnType<SecondHalf['allocate']> | undefined;
    let n = 0;
    let sequence = 0;
    let remote = false;
    let range: [number, number] = [0, 0];
    const second: SecondHalf = {
      allocate(length) {
        n = length;
        const shared = (count: number) => new Float64Array(new SharedArrayBuffer(count * 8));
        space = { w: shared(n * n), u: shared(n), q: shared(n), v: shared(n), second: shared(n) };
        helper.postMessage({
          kind: 'tridiagonal',
          n,
          w: space.w.buffer as SharedArrayBuffer,
          u: space.u.buffer as SharedArrayBuffer,
          q: space.q.buffer as SharedArrayBuffer,
          v: space.v.buffer as SharedArrayBuffer,
          second: space.second.buffer as SharedArrayBuffer,
          control: control.buffer as SharedArrayBuffer,
        } satisfies TridiagonalJob);
        return space;
      },
      start(size, split) {
        remote = Atomics.load(control, STATE) === CLAIMED;
        range = [size, split];
        if (!remote) return;
        Atomics.store(control, SIZE, size);
        Atomics.store(control, SPLIT, split);
        Atomics.store(control, GO, ++sequence);
        Atomics.notify(control, GO);
      },
      finish() {
        if (!remote) {
          const s = space!;
          fusedColumns(s.w, n, range[0], range[1], range[0], s.u, s.q, s.v, s.second);
          return;
        }
        awaitValue(control, DONE, sequence);
        stats.stepsByHelper++;
      },
    };
    try {
      const form = tridiagonalForm(m, second);
      if (Atomics.load(control, STATE) !== CLAIMED) return form;
      // The helper is free again: it runs the QL iteration for the effective bets while the
      // caller solves; read on first use (undefined if the helper did not get to it).
      startRotations(helper, form);
      return form;
    } finally {
      // Release the helper: stop a claimed job, close an unclaimed one so a late claim returns at once.
      if (Atomics.compareExchange(control, STATE, OPEN, CLOSED) === CLAIMED) {
        Atomics.store(control, SIZE, STOP_SIZE);
        Atomics.store(control, GO, ++sequence);
        Atomics.notify(control, GO);
      }
    }
  };
  return { tridiagonalise, stats };
}

/** Waits until control[slot] equals `value`: spins, then sleeps; throws if the helper failed or hung. */
function awaitValue(control: Int32Array, slot: number, value: number): void {
  for (let spin = 0; spin < SPINS; spin++) if (Atomics.load(control, slot) === value) return;
  for (;;) {
    const seen = Atomics.load(control, slot);
    if (seen === value) return;
    if (seen === FAILED_STEP) throw new Error('the second thread of the tridiagonal reduction failed');
    if (Atomics.wait(control, slot, seen, STEP_MS) === 'timed-out' && Atomics.load(control, slot) === seen)
      throw new Error('the second thread of the tridiagonal reduction stopped answering');
  }
}

/** The command line's, on the process's one helper thread. */
export const twoThreadTridiagonal = createTwoThreadTridiagonal({ thread: processSecondThread }).tridiagonalise;
