import { ServiceFailure } from '../../shared-core/contract/define.js';
import { CancelledError, NotFoundError } from '../store/errors.js';
import { StorageError } from '../store/storage-error.js';

/** A wire id ("12") to the store's row id; anything else names what was not found. */
export function rowId(kind: string, wireId: string): number {
  if (!/^[1-9]\d{0,14}$/.test(wireId)) throw new ServiceFailure('not-found', `no ${kind} with id '${wireId}'`);
  return Number(wireId);
}

export function notFound(kind: string, wireId: string | number): ServiceFailure {
  return new ServiceFailure('not-found', `no ${kind} with id '${wireId}'`);
}

/**
 * The store's own error classes to the service's error codes, so a caller can tell "not found",
 * "cancelled", a busy store and a disk that cannot be written from a fault. Input errors pass through: `dispatch` formats them.
 */
export function translateStoreError(error: unknown): unknown {
  if (error instanceof NotFoundError) return new ServiceFailure('not-found', error.message);
  if (error instanceof CancelledError) return new ServiceFailure('cancelled', error.message);
  if (error instanceof StorageError)
    return new ServiceFailure(error.problem === 'busy' ? 'busy' : 'storage', error.message);
  return error;
}
