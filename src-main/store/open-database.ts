import Database from 'better-sqlite3';
import {
  accessSync,
  chmodSync,
  closeSync,
  constants,
  existsSync,
  openSync,
  readFileSync,
  readSync,
  statSync,
} from 'node:fs';
import { dirname } from 'node:path';
import { removeSeal } from './backup-digest.js';
import { StoreOpenError } from './errors.js';
import { withNativeBinding } from './native-binding.js';
import { LATEST_SCHEMA_VERSION, STORE_APPLICATION_ID, migrate } from './migrations.js';
import { readOnlyError, StorageError, type ReadOnlyReason } from './storage-error.js';

export interface StoreHeader {
  applicationId: number;
  userVersion: number;
  tables: number;
}

/**
 * Reads the header of an existing file without changing a byte of it or leaving a file beside
 * it. A store whose WAL holds committed pages is read through SQLite (its -wal and -shm exist
 * already); otherwise the first 100 bytes are the SQLite header itself (sqlite.org/fileformat2:
 * the schema cookie at 40, user_version at 60, application_id at 68, big-endian), and opening
 * it read-only would leave a -shm behind.
 */
export function readStoreHeader(path: string): StoreHeader {
  try {
    if (walHoldsPages(path)) return headerThroughSqlite(path);
    const head = Buffer.alloc(100);
    const fd = openSync(path, 'r');
    let read: number;
    try {
      read = readSync(fd, head, 0, 100, 0);
    } finally {
      closeSync(fd);
    }
    if (read === 0) return { applicationId: 0, userVersion: 0, tables: 0 };
    if (read < 100 || head.toString('latin1', 0, 16) !== 'SQLite format 3\0') throw new Error('file is not a database');
    return {
      applicationId: head.readUInt32BE(68),
      userVersion: head.readUInt32BE(60),
      tables: head.readUInt32BE(40) > 0 ? 1 : 0,
    };
  } catch (error) {
    throw new StoreOpenError(`cannot be read as a Holdfast store (${(error as Error).message})`, path);
  }
}

function headerThroughSqlite(path: string): StoreHeader {
  const db = new Database(path, withNativeBinding({ readonly: true, fileMustExist: true }));
  try {
    return {
      applicationId: db.pragma('application_id', { simple: true }) as number,
      userVersion: db.pragma('user_version', { simple: true }) as number,
      tables: (db.prepare("SELECT count(*) AS n FROM sqlite_schema WHERE type = 'table'").get() as { n: number }).n,
    };
  } finally {
    db.close();
  }
}

function walHoldsPages(path: string): boolean {
  try {
    return statSync(`${path}-wal`).size > 0;
  } catch {
    return false;
  }
}

/** Refuses a file that is not a Holdfast store, or is one from a newer Holdfast. */
export function assertOpenable(path: string, header: StoreHeader): void {
  if (header.applicationId !== STORE_APPLICATION_ID && (header.tables > 0 || header.userVersion > 0))
    throw new StoreOpenError('is an SQLite file but not a Holdfast store; it was left untouched', path);
  if (header.userVersion > LATEST_SCHEMA_VERSION)
    throw new StoreOpenError(
      `was written by a newer Holdfast (store schema ${header.userVersion}; this version reads up to ${LATEST_SCHEMA_VERSION}). ` +
        'Open it with that newer version; the file was left untouched',
      path,
    );
}

function writeDenied(path: string): NodeJS.ErrnoException | undefined {
  try {
    accessSync(path, constants.W_OK);
    return undefined;
  } catch (error) {
    return error as NodeJS.ErrnoException;
  }
}

/**
 * Why this process cannot write the store at `path`, or undefined when it can. SQLite in WAL
 * mode writes the file and two files beside it (-wal, -shm), created in the folder when absent.
 */
export function findReadOnlyReason(path: string): ReadOnlyReason | undefined {
  const file = writeDenied(path);
  if (file)
    return {
      file: path,
      why: file.code === 'EROFS' ? 'the file system is mounted read-only' : 'the file is read-only',
    };
  const sidecarsReady = [`${path}-wal`, `${path}-shm`].every((p) => existsSync(p) && !writeDenied(p));
  const folder = sidecarsReady ? undefined : writeDenied(dirname(path));
  if (folder)
    return {
      file: path,
      why:
        folder.code === 'EROFS'
          ? 'the file system is mounted read-only'
          : `its folder ${dirname(path)} is read-only, and SQLite keeps two files beside the store`,
    };
  return undefined;
}

/**
 * A -wal or -shm that this process cannot write, beside a store it can write, is what a
 * read-only session of an older Holdfast (or another tool) left: SQLite gives them the store
 * file's mode, so after `chmod u+w` on the store they stay read-only and every write fails.
 * They get the store's mode back; one we cannot change is named with what to do.
 */
function repairSidecars(path: string): void {
  const mode = statSync(path).mode & 0o777;
  for (const sidecar of [`${path}-wal`, `${path}-shm`]) {
    if (!existsSync(sidecar) || !writeDenied(sidecar)) continue;
    try {
      chmodSync(sidecar, mode);
    } catch {
      // not ours to change: said below
    }
    if (writeDenied(sidecar))
      throw new StorageError(
        'read-only',
        sidecar,
        'this file beside the store is read-only (left by an earlier read-only session), so nothing can be written. ' +
          'Close every Holdfast window using the store, make the file writable or delete it, and try again',
      );
  }
}

/**
 * The store read-only, with nothing created beside it. With committed pages in its WAL SQLite
 * must read them (its -wal and -shm exist already); otherwise the file is read into memory,
 * marked as a rollback-journal database there (header bytes 18 and 19; the file is untouched)
 * since SQLite cannot open an in-memory copy in WAL mode.
 */
export function openReadOnly(path: string): Database.Database {
  if (walHoldsPages(path)) return new Database(path, withNativeBinding({ readonly: true, fileMustExist: true }));
  const bytes = readFileSync(path);
  if (bytes.length >= 20 && bytes[18] === 2 && bytes[19] === 2) bytes[18] = bytes[19] = 1;
  return new Database(bytes, withNativeBinding({ readonly: true }));
}

export interface OpenedDatabase {
  db: Database.Database;
  /** Set when this process cannot write the store: it is open read-only, and why. */
  readOnly?: ReadOnlyReason;
}

/** How long a write waits for another writer to finish before the user is told the store is busy. */
export const BUSY_TIMEOUT_MS = 5000;

/**
 * Opens (creating owner-only when asked) and migrates a store file. WAL so a reader never blocks
 * the writer and a crash rolls back cleanly; synchronous FULL so a committed change survives
 * power loss; foreign keys on; a busy timeout for writers queueing behind one another. A store
 * this process cannot write is opened read-only (see openReadOnly); one that would need a schema
 * upgrade first is refused then, since the upgrade writes.
 */
export function openDatabase(
  path: string,
  options: { create: boolean; migrateTo?: number; busyTimeoutMs?: number | undefined },
): OpenedDatabase {
  const timeout = options.busyTimeoutMs ?? BUSY_TIMEOUT_MS;
  let readOnly: ReadOnlyReason | undefined;
  if (existsSync(path)) {
    const header = readStoreHeader(path);
    assertOpenable(path, header);
    readOnly = findReadOnlyReason(path);
    if (readOnly && header.userVersion < (options.migrateTo ?? LATEST_SCHEMA_VERSION))
      throw readOnlyError({
        ...readOnly,
        why: `${readOnly.why}, and this Holdfast must first bring its layout up to date`,
      });
    if (!readOnly) repairSidecars(path);
  } else {
    if (!options.create) throw new StoreOpenError('no such store', path);
    // An empty file is a valid empty SQLite database; creating it ourselves sets 0600, and SQLite
    // gives its -wal and -shm files the same mode as the database file.
    closeSync(openSync(path, 'wx', 0o600));
  }
  const db = readOnly ? openReadOnly(path) : new Database(path, withNativeBinding({ timeout }));
  try {
    if (!readOnly) {
      db.pragma('journal_mode = WAL');
      db.pragma('synchronous = FULL');
    }
    db.pragma('foreign_keys = ON');
    db.pragma(`busy_timeout = ${timeout}`);
    if (!readOnly) {
      migrate(db, options.migrateTo);
      removeSeal(db); // a backup opened as a store: its seal would be stale at the first change
    }
    return readOnly ? { db, readOnly } : { db };
  } catch (error) {
    db.close();
    throw error;
  }
}
