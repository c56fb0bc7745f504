import Database from 'better-sqlite3';
import { chmodSync, existsSync, renameSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { StoreOpenError } from './errors.js';
import { assertOpenable, readStoreHeader } from './open-database.js';
import { withNativeBinding } from './native-binding.js';

export interface RestoreResult {
  /** The store file now holding the backup's contents. */
  store: string;
  /** Where the store that was replaced was kept, if there was one. */
  previous?: string;
  schemaVersion: number;
}

/**
 * Restores a backup into `storePath`. The backup is checked first (a Holdfast store of a schema
 * this version reads, passing `PRAGMA integrity_check`); it is copied with SQLite's backup API
 * into a new file beside the store and checked again, and only then swapped in. A store that was
 * there is kept as `<store>.replaced-<time>` rather than deleted.
 */
export async function restoreStore(fromPath: string, storePath: string, now = new Date()): Promise<RestoreResult> {
  const from = resolve(fromPath);
  const target = resolve(storePath);
  if (!existsSync(from)) throw new StoreOpenError('no such backup file', from);
  const header = readStoreHeader(from);
  assertOpenable(from, header);
  if (header.userVersion === 0) throw new StoreOpenError('is an empty file, not a Holdfast backup', from);
  const source = new Database(from, withNativeBinding({ readonly: true, fileMustExist: true }));
  const staging = `${target}.restoring-${process.pid}`;
  try {
    checkIntegrity(source, from);
    rmSync(staging, { force: true });
    await source.backup(staging);
  } finally {
    source.close();
  }
  try {
    chmodSync(staging, 0o600);
    const copy = new Database(staging, withNativeBinding({ fileMustExist: true }));
    try {
      checkIntegrity(copy, staging);
      copy.pragma('journal_mode = WAL');
    } finally {
      copy.close();
    }
    let previous: string | undefined;
    if (existsSync(target)) {
      // Fold the old store's WAL into its file first, so no stale -wal is left beside the new one.
      const old = new Database(target, withNativeBinding({ fileMustExist: true }));
      old.pragma('wal_checkpoint(TRUNCATE)');
      old.close();
      previous = `${target}.replaced-${now.toISOString().replace(/[:.]/g, '-')}`;
      renameSync(target, previous);
      rmSync(`${target}-wal`, { force: true });
      rmSync(`${target}-shm`, { force: true });
    }
    renameSync(staging, target);
    return { store: target, ...(previous ? { previous } : {}), schemaVersion: header.userVersion };
  } finally {
    rmSync(staging, { force: true });
    rmSync(`${staging}-wal`, { force: true });
    rmSync(`${staging}-shm`, { force: true });
  }
}

function checkIntegrity(db: Database.Database, path: string): void {
  let result: string[];
  try {
    result = (db.pragma('integrity_check') as { integrity_check: string }[]).map((r) => r.integrity_check);
  } catch (error) {
    throw new StoreOpenError(`fails the integrity check: ${(error as Error).message}`, path);
  }
  if (result.length !== 1 || result[0] !== 'ok')
    throw new StoreOpenError(`fails the integrity check: ${result.slice(0, 5).join('; ')}`, path);
  const fk = db.pragma('foreign_key_check') as unknown[];
  if (fk.length) throw new StoreOpenError(`has ${fk.length} rows pointing at missing records`, path);
}
