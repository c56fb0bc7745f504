import Database from 'better-sqlite3';
import { closeSync, existsSync, openSync } from 'node:fs';
import { StoreOpenError } from './errors.js';
import { withNativeBinding } from './native-binding.js';
import { LATEST_SCHEMA_VERSION, STORE_APPLICATION_ID, migrate } from './migrations.js';

export interface StoreHeader {
  applicationId: number;
  userVersion: number;
  tables: number;
}

/** Reads the header of an existing file without changing a byte of it. */
export function readStoreHeader(path: string): StoreHeader {
  let db: Database.Database | undefined;
  try {
    db = new Database(path, withNativeBinding({ readonly: true, fileMustExist: true }));
    return {
      applicationId: db.pragma('application_id', { simple: true }) as number,
      userVersion: db.pragma('user_version', { simple: true }) as number,
      tables: (db.prepare("SELECT count(*) AS n FROM sqlite_schema WHERE type = 'table'").get() as { n: number }).n,
    };
  } catch (error) {
    throw new StoreOpenError(`cannot be read as a Holdfast store (${(error as Error).message})`, path);
  } finally {
    db?.close();
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

/**
 * Opens (creating owner-only when asked) and migrates a store file. WAL so a reader never blocks
 * the writer and a crash rolls back cleanly; synchronous FULL so a committed change survives
 * power loss; foreign keys on.
 */
export function openDatabase(path: string, options: { create: boolean; migrateTo?: number }): Database.Database {
  if (existsSync(path)) assertOpenable(path, readStoreHeader(path));
  else {
    if (!options.create) throw new StoreOpenError('no such store', path);
    // An empty file is a valid empty SQLite database; creating it ourselves sets 0600, and SQLite
    // gives its -wal and -shm files the same mode as the database file.
    closeSync(openSync(path, 'wx', 0o600));
  }
  const db = new Database(path, withNativeBinding({}));
  try {
    db.pragma('journal_mode = WAL');
    db.pragma('synchronous = FULL');
    db.pragma('foreign_keys = ON');
    db.pragma('busy_timeout = 5000');
    migrate(db, options.migrateTo);
    return db;
  } catch (error) {
    db.close();
    throw error;
  }
}
