/**
 * Cooperative cancellation for long core computations (walk-forward, bootstrap). The caller
 * passes a `shouldCancel` callback (the worker checks a flag, the command line an AbortSignal);
 * the core polls it between steps and throws `CancelledError`, so nothing partial is returned.
 */
export type CancelCheck = () => boolean;

/** Progress of a long computation: `done` of `total` steps finished. */
export type ProgressCallback = (done: number, total: number) => void;

export class CancelledError extends Error {
  constructor() {
    super('cancelled');
    this.name = 'CancelledError';
  }
}

export function throwIfCancelled(shouldCancel: CancelCheck | undefined): void {
  if (shouldCancel?.()) throw new CancelledError();
}

/** Runs a step generator to its end synchronously. */
export function drain<R>(steps: Generator<void, R, void>): R {
  for (;;) {
    const next = steps.next();
    if (next.done) return next.value;
  }
}

/**
 * Runs a step generator, awaiting `pause` every `stepsPerPause` steps so the caller's event
 * loop can deliver a cancel (the core has no timers of its own: the edge passes, for example,
 * a setImmediate promise).
 */
export async function drainAsync<R>(
  steps: Generator<void, R, void>,
  pause: () => Promise<void>,
  stepsPerPause = 1,
): Promise<R> {
  for (let k = 1; ; k++) {
    const next = steps.next();
    if (next.done) return next.value;
    if (k % stepsPerPause === 0) await pause();
  }
}
