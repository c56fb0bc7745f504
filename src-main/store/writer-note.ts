import { readFileSync, rmSync, writeFileSync } from 'node:fs';

/**
 * A note beside the store saying which long write holds it (an import, a household file, a
 * restore), so that another process that finds the store busy can tell the user what it waits
 * for. SQLite's lock says only that someone writes. The note is a hint: it is written before the
 * write begins and removed after; a note whose process is gone (killed) is ignored.
 */
interface WriterNote {
  pid: number;
  activity: string;
  since: string;
}

export function writerNotePath(storePath: string): string {
  return `${storePath}.writing`;
}

/** Leaves the note for `activity` and returns the function that removes it. */
export function announceWriter(storePath: string, activity: string, now = new Date()): () => void {
  const path = writerNotePath(storePath);
  const note: WriterNote = { pid: process.pid, activity, since: now.toISOString() };
  try {
    writeFileSync(path, JSON.stringify(note), { mode: 0o600 });
  } catch {
    // A folder we cannot write: the write itself will fail and say so; the note is only a hint.
    return () => undefined;
  }
  const text = JSON.stringify(note);
  // Removed only while it is still ours: a second writer may have left its own note since.
  return () => {
    try {
      if (readFileSync(path, 'utf8') === text) rmSync(path, { force: true });
    } catch {
      // already gone
    }
  };
}

/** "an import of prices.csv (process 123, since 11:02:03 UTC)", or undefined when no live writer left a note. */
export function describeWriter(storePath: string): string | undefined {
  let note: WriterNote;
  try {
    note = JSON.parse(readFileSync(writerNotePath(storePath), 'utf8')) as WriterNote;
  } catch {
    return undefined;
  }
  if (!Number.isInteger(note.pid) || typeof note.activity !== 'string' || !alive(note.pid)) return undefined;
  const since = typeof note.since === 'string' ? `, since ${note.since.slice(11, 19)} UTC` : '';
  return `${note.activity} (process ${note.pid}${since})`;
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}
