import { resolve } from 'node:path';
import { guardStorage } from './guard-storage.js';
import { openDatabase, type OpenedDatabase } from './open-database.js';
import { SqliteStore } from './sqlite-store.js';
import { asStorageError } from './storage-error.js';
import type { OpenStoreOptions, Store } from './store.js';

/**
 * Opens the store file at `path`, creating it (owner-only) unless `create: false`, and brings
 * its schema up to date. Throws StoreOpenError for a file that is not a Holdfast store or comes
 * from a newer Holdfast; such a file is never modified. A store this process cannot write opens
 * read-only (`readOnly` says why); disk and lock failures are StorageErrors naming the file.
 */
export function openStore(path: string, options: OpenStoreOptions = {}): Store {
  const full = resolve(path);
  let opened: OpenedDatabase;
  try {
    opened = openDatabase(full, { create: options.create ?? true, busyTimeoutMs: options.busyTimeoutMs });
  } catch (error) {
    throw asStorageError(error, full) ?? error;
  }
  return guardStorage(
    new SqliteStore(opened.db, full, options.now ?? (() => new Date()), opened.readOnly),
    opened.readOnly,
  );
}
