import type Database from 'better-sqlite3';
import { createHash } from 'node:crypto';

/**
 * A backup file's seal: one SHA-256 over every row of every table (in table-name and rowid
 * order, each value with its type), kept in the backup's `meta` table under BACKUP_DIGEST_KEY.
 * The series, revisions and memos carry checksums of their own; the seal covers the rest of a
 * backup too (names, holdings, universes, the audit log), which a live store, changing all the
 * time, cannot keep. It is written by `backup`, verified by `check` and `restore`, and removed
 * from a store that is restored or opened for writing, where it would soon be stale.
 */
export const BACKUP_DIGEST_KEY = 'backup_digest';

export function contentDigest(db: Database.Database): string {
  const hash = createHash('sha256');
  const tables = db
    .prepare("SELECT name FROM sqlite_schema WHERE type = 'table' AND name NOT LIKE 'sqlite_%' ORDER BY name")
    .pluck()
    .all() as string[];
  for (const table of tables) {
    hash.update(`table\0${table}\0`);
    const skip = table === 'meta' ? ` WHERE key <> '${BACKUP_DIGEST_KEY}'` : '';
    const rows = db.prepare(`SELECT * FROM "${table}"${skip} ORDER BY rowid`).raw().iterate() as IterableIterator<
      unknown[]
    >;
    for (const row of rows) {
      for (const value of row) {
        if (value === null) hash.update('n\0');
        else if (Buffer.isBuffer(value)) {
          hash.update(`b${value.byteLength}\0`);
          hash.update(value);
        } else hash.update(`${typeof value === 'string' ? 's' : 'v'}${String(value)}\0`);
      }
      hash.update('\n');
    }
  }
  return hash.digest('hex');
}

/** The seal a backup was written with, or undefined (a live store, or a backup from before seals). */
export function storedDigest(db: Database.Database): string | undefined {
  const hasMeta = db.prepare("SELECT 1 FROM sqlite_schema WHERE type = 'table' AND name = 'meta'").get();
  if (!hasMeta) return undefined;
  return db.prepare('SELECT value FROM meta WHERE key = ?').pluck().get(BACKUP_DIGEST_KEY) as string | undefined;
}

export function sealBackup(db: Database.Database): void {
  db.prepare('INSERT INTO meta (key, value) VALUES (?, ?) ON CONFLICT (key) DO UPDATE SET value = excluded.value').run(
    BACKUP_DIGEST_KEY,
    contentDigest(db),
  );
}

export function removeSeal(db: Database.Database): void {
  if (storedDigest(db) !== undefined) db.prepare('DELETE FROM meta WHERE key = ?').run(BACKUP_DIGEST_KEY);
}
