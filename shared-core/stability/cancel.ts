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
