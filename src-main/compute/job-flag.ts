/**
 * The hand-off protocol every helper-thread job shares (compute-thread.ts): slot FLAG of an Int32
 * array in shared memory goes OPEN -> CLAIMED -> DONE or FAILED as the helper takes and finishes
 * the job, or OPEN -> TAKEN_BACK when the caller needs the result before the helper has begun
 * (the caller then computes it itself).
 */
export const FLAG = 0;
export const OPEN = 0;
export const CLAIMED = 1;
export const DONE = 2;
export const FAILED = 3;
export const TAKEN_BACK = 4;
const JOB_MS = 10 * 60 * 1000;

/** The helper's side: true if it now owns the job (the caller had not taken it back). */
export function claimJob(flag: Int32Array): boolean {
  return Atomics.compareExchange(flag, FLAG, OPEN, CLAIMED) === OPEN;
}

/** The helper's side: the job's end, DONE or FAILED, and a wake-up for a waiting caller. */
export function endJob(flag: Int32Array, state: typeof DONE | typeof FAILED): void {
  Atomics.store(flag, FLAG, state);
  Atomics.notify(flag, FLAG);
}

/** The caller's side: waits for a job the helper claimed; false if it was taken back now or failed. */
export function awaitJob(flag: Int32Array, what: string): boolean {
  if (Atomics.compareExchange(flag, FLAG, OPEN, TAKEN_BACK) === OPEN) return false;
  while (Atomics.load(flag, FLAG) === CLAIMED)
    if (Atomics.wait(flag, FLAG, CLAIMED, JOB_MS) === 'timed-out')
      throw new Error(`the helper thread did not finish ${what}`);
  return Atomics.load(flag, FLAG) === DONE;
}
