import { describeWriter } from './writer-note.js';

/**
 * What went wrong with the disk or the file rather than with the user's input: the store is
 * busy with another writer, cannot be written, the disk is full or failed. One message names
 * the file and says what to do; the command line prints it and exits 1, the service answers
 * with the code `busy` or `storage`. Nothing was written (SQLite rolled the transaction back).
 */
export type StorageProblem = 'busy' | 'read-only' | 'no-access' | 'disk-full' | 'io' | 'damaged';

export class StorageError extends Error {
  override name = 'StorageError';
  constructor(
    readonly problem: StorageProblem,
    /** The file concerned (the store, its -wal or -shm, a backup). */
    readonly file: string,
    message: string,
  ) {
    super(`${file}: ${message}`);
  }
}

/** Why a store cannot be written, found before opening it (see open-database.ts). */
export interface ReadOnlyReason {
  file: string;
  why: string;
}

const FIX_PERMISSION = 'make the file and its folder writable (for example chmod u+w on both) and try again';

/** The message for a store that cannot be changed, with the reason found when it was opened. */
export function readOnlyError(reason: ReadOnlyReason): StorageError {
  return new StorageError(
    'read-only',
    reason.file,
    `the store is read-only (${reason.why}); Holdfast can show it but not change it, and nothing was written. To save changes, ${FIX_PERMISSION}`,
  );
}

/** A busy store: who holds it, when the note beside the store says so, and what to do. */
export function busyError(storePath: string): StorageError {
  const holder = describeWriter(storePath);
  return new StorageError(
    'busy',
    storePath,
    holder
      ? `the store is busy with ${holder}; nothing was written. Try again when it has finished`
      : 'the store is busy: another Holdfast window or command is writing to it; nothing was written. Try again in a moment',
  );
}

/**
 * An error from SQLite (`SqliteError`, whose `code` is the extended result code) or from Node's
 * file system (`errno` codes) as a StorageError about `file`, or undefined when it is neither
 * (a bug, or an input error that callers handle themselves).
 */
export function asStorageError(error: unknown, file: string, readOnly?: ReadOnlyReason): StorageError | undefined {
  if (error instanceof StorageError) return error;
  if (!(error instanceof Error)) return undefined;
  const code = (error as { code?: unknown }).code;
  if (typeof code !== 'string') return undefined;
  if (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED')) return busyError(file);
  if (code.startsWith('SQLITE_READONLY') || code === 'EROFS')
    return readOnlyError(
      readOnly ?? {
        file,
        why:
          code === 'SQLITE_READONLY_DIRECTORY'
            ? 'its folder is read-only, and SQLite keeps two files beside the store'
            : code === 'EROFS'
              ? 'the file system is mounted read-only'
              : 'the file cannot be written',
      },
    );
  // SHMSIZE: SQLite could not grow the -shm file it keeps beside the store, which on a full disk
  // is the first write of all.
  if (code === 'SQLITE_FULL' || code === 'SQLITE_IOERR_SHMSIZE' || code === 'ENOSPC' || code === 'EDQUOT')
    return new StorageError(
      'disk-full',
      file,
      'the disk is full; nothing was written. Free some space on the disk that holds it and try again',
    );
  if (code.startsWith('SQLITE_CANTOPEN') || code === 'SQLITE_PERM' || code === 'EACCES' || code === 'EPERM')
    return new StorageError(
      'no-access',
      file,
      `cannot be opened or written (${error.message}); check that the file and its folder exist and that you may read and write them`,
    );
  if (code.startsWith('SQLITE_IOERR') || code === 'EIO')
    return new StorageError(
      'io',
      file,
      `the disk reported an error (${code}); nothing was written. Check the disk, then run holdfast check --store on the file`,
    );
  if (code.startsWith('SQLITE_CORRUPT') || code === 'SQLITE_NOTADB')
    return new StorageError(
      'damaged',
      file,
      'the store file is damaged; nothing was written. Run holdfast check --store on it to see what, and restore the latest backup (holdfast restore)',
    );
  return undefined;
}
