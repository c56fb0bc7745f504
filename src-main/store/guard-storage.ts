import { asStorageError, type ReadOnlyReason } from './storage-error.js';
import type { Store } from './store.js';

/**
 * The store with every method's disk and lock failures (SQLite's result codes, Node's errno
 * codes) turned into one StorageError that names the file and what to do. Other errors (input
 * errors, not found, cancelled) pass through unchanged. Applied once, around the whole object,
 * so that no method can forget it.
 */
export function guardStorage<S extends Store>(store: S, readOnly: ReadOnlyReason | undefined): S {
  const translate = (error: unknown) => asStorageError(error, store.path, readOnly) ?? error;
  return new Proxy(store, {
    get(target, key, receiver) {
      const value = Reflect.get(target, key, receiver) as unknown;
      if (typeof value !== 'function') return value;
      return function guarded(...args: unknown[]) {
        let result: unknown;
        try {
          result = (value as (...a: unknown[]) => unknown).apply(target, args);
        } catch (error) {
          throw translate(error);
        }
        return result instanceof Promise
          ? result.catch((error: unknown) => {
              throw translate(error);
            })
          : result;
      };
    },
  });
}
