import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { StoreOpenError } from './errors.js';
import { assertOpenable, openReadOnly, readStoreHeader } from './open-database.js';
import { verifyDatabase, type StoreVerdict } from './verify-store.js';

/**
 * Verifies a store or backup file as it is on disk (verify-store.ts), read-only: no schema
 * upgrade, nothing written, no file created beside it. Throws StoreOpenError for a file that is
 * missing, empty or not a Holdfast store.
 */
export function checkStoreFile(path: string): StoreVerdict {
  const full = resolve(path);
  if (!existsSync(full)) throw new StoreOpenError('no such store', full);
  const header = readStoreHeader(full);
  assertOpenable(full, header);
  if (header.userVersion === 0) throw new StoreOpenError('is an empty file, not a Holdfast store', full);
  let db;
  try {
    db = openReadOnly(full);
  } catch (error) {
    throw new StoreOpenError(`cannot be read as a Holdfast store (${(error as Error).message})`, full);
  }
  try {
    return verifyDatabase(db);
  } finally {
    db.close();
  }
}
