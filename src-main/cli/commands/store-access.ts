import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../../../shared-core/errors.js';
import { StoreOpenError, openStore, type Store } from '../../store/store.js';

/**
 * Opening the store named by `--store` for a command: a StoreOpenError (not a store, newer
 * version) becomes an InputError naming the file, so the command exits 2 with that message.
 */
export function storeAt(cwd: string, path: string, options: { create: boolean }): Store | undefined {
  const full = resolve(cwd, path);
  if (!options.create && !existsSync(full)) return undefined;
  try {
    return openStore(full, { create: options.create });
  } catch (error) {
    if (error instanceof StoreOpenError) throw new InputError(error.message.slice(full.length + 2), { file: path });
    throw error;
  }
}

/** The store for a command that only reads or changes an existing one. */
export function existingStore(cwd: string, path: string): Store {
  const store = storeAt(cwd, path, { create: false });
  if (!store) throw new InputError('no such store', { file: path });
  return store;
}
