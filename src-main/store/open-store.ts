import { resolve } from 'node:path';
import { openDatabase } from './open-database.js';
import { SqliteStore } from './sqlite-store.js';
import type { OpenStoreOptions, Store } from './store.js';

/**
 * Opens the store file at `path`, creating it (owner-only) unless `create: false`, and brings
 * its schema up to date. Throws StoreOpenError for a file that is not a Holdfast store or comes
 * from a newer Holdfast; such a file is never modified.
 */
export function openStore(path: string, options: OpenStoreOptions = {}): Store {
  const full = resolve(path);
  const db = openDatabase(full, { create: options.create ?? true });
  return new SqliteStore(db, full, options.now ?? (() => new Date()));
}
