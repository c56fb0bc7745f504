/** The file is not a Holdfast store, is damaged, or was written by a newer Holdfast. Nothing was changed. */
export class StoreOpenError extends Error {
  override name = 'StoreOpenError';
  constructor(
    message: string,
    readonly path: string,
  ) {
    super(`${path}: ${message}`);
  }
}

/** A long operation was cancelled through its AbortSignal; nothing of it was written. */
export class CancelledError extends Error {
  override name = 'CancelledError';
  constructor(message = 'cancelled; nothing was written') {
    super(message);
  }
}

/** A name or id the caller gave does not exist in the store. */
export class NotFoundError extends Error {
  override name = 'NotFoundError';
}
