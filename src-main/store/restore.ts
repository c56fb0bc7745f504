import Database from 'better-sqlite3';
import { chmodSync, copyFileSync, existsSync, linkSync, renameSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { removeSeal } from './backup-digest.js';
import { StoreOpenError } from './errors.js';
import { assertOpenable, openReadOnly, readStoreHeader } from './open-database.js';
import { withNativeBinding } from './native-binding.js';
import { StorageError, asStorageError } from './storage-error.js';
import { verifyDatabase, type StoreVerdict } from './verify-store.js';
import { announceWriter, describeWriter } from './writer-note.js';

export interface RestoreResult {
  /** The store file now holding the backup's contents. */
  store: string;
  /** Where the store that was replaced was kept, if there was one. */
  previous?: string;
  schemaVersion: number;
  /** What was checked against its checksum before the backup was let in, and what its schema could not vouch for. */
  verified: StoreVerdict['verified'];
  unverified: string[];
}

/**
 * Restores a backup into `storePath`, in an order that a crash at any point leaves the store as
 * it was or wholly restored:
 * 1. the backup is read and verified (structure, links, and every series, revision and memo
 *    against its checksum: verify-store.ts); a damaged backup is refused, naming what is
 *    damaged, before anything is written;
 * 2. the verified copy is written with SQLite's backup API beside the store and verified again;
 * 3. the store is locked exclusively (refused, leaving it as it was, while another Holdfast has
 *    it open: that window would go on writing to the replaced file), its WAL folded in, a hard
 *    link kept as `<store>.replaced-<time>`, and the new file renamed over it (atomic).
 */
export async function restoreStore(fromPath: string, storePath: string, now = new Date()): Promise<RestoreResult> {
  const from = resolve(fromPath);
  const target = resolve(storePath);
  if (!existsSync(from)) throw new StoreOpenError('no such backup file', from);
  const header = readStoreHeader(from);
  assertOpenable(from, header);
  if (header.userVersion === 0) throw new StoreOpenError('is an empty file, not a Holdfast backup', from);
  const staging = `${target}.restoring-${process.pid}`;
  const cleanStaging = () => {
    for (const f of [staging, `${staging}-wal`, `${staging}-shm`, `${staging}-journal`]) rmSync(f, { force: true });
  };
  try {
    let verdict: StoreVerdict;
    const source = readBackup(from);
    try {
      verdict = refuseDamage(source, from);
      cleanStaging();
      await source.backup(staging);
    } finally {
      source.close();
    }
    chmodSync(staging, 0o600);
    const copy = new Database(staging, withNativeBinding({ fileMustExist: true }));
    try {
      refuseDamage(copy, staging);
      removeSeal(copy); // a live store changes; its seal would soon be stale
      copy.pragma('journal_mode = WAL');
    } finally {
      copy.close();
    }
    const previous = existsSync(target) ? swapIn(staging, target, from, now) : (renameSync(staging, target), undefined);
    return {
      store: target,
      ...(previous ? { previous } : {}),
      schemaVersion: header.userVersion,
      verified: verdict.verified,
      unverified: verdict.unverified,
    };
  } catch (error) {
    throw asStorageError(error, target) ?? error;
  } finally {
    cleanStaging();
  }
}

function readBackup(from: string): Database.Database {
  try {
    return openReadOnly(from);
  } catch (error) {
    throw new StoreOpenError(`cannot be read as a Holdfast backup (${(error as Error).message})`, from);
  }
}

function refuseDamage(db: Database.Database, path: string): StoreVerdict {
  const verdict = verifyDatabase(db);
  if (verdict.problems.length)
    throw new StoreOpenError(
      `is damaged, so it was not restored and the store was left as it was: ${verdict.problems.join('; ')}`,
      path,
    );
  return verdict;
}

/** Step 3 of restoreStore, holding the store's lock; returns the name the replaced store is kept under. */
function swapIn(staging: string, target: string, from: string, now: Date): string {
  // A second to let a short write finish: an open window does not close by waiting longer.
  const old = new Database(target, withNativeBinding({ fileMustExist: true, timeout: 1000 }));
  let release: (() => void) | undefined;
  try {
    // In WAL mode an exclusive lock is granted only when no other connection has the file open.
    old.pragma('locking_mode = EXCLUSIVE');
    try {
      old.exec('BEGIN EXCLUSIVE');
      old.exec('COMMIT');
    } catch (error) {
      if ((error as { code?: string }).code?.startsWith('SQLITE_BUSY')) {
        const holder = describeWriter(target);
        throw new StorageError(
          'busy',
          target,
          `the store is open${holder ? ` and busy with ${holder}` : ' in another Holdfast window or command'}, ` +
            'so it was not replaced and was left as it was. Close Holdfast there (or stop holdfast serve) and restore again',
        );
      }
      throw error;
    }
    release = announceWriter(target, `a restore from ${from}`, now);
    old.pragma('wal_checkpoint(TRUNCATE)');
    const previous = `${target}.replaced-${now.toISOString().replace(/[:.]/g, '-')}`;
    try {
      linkSync(target, previous);
    } catch {
      copyFileSync(target, previous); // a file system without hard links
    }
    renameSync(staging, target);
    return previous;
  } finally {
    // Closing the old connection removes the old store's (empty) -wal; in exclusive mode it kept no -shm.
    old.close();
    release?.();
  }
}
