/**
 * Undo and redo for the scenario editor: a pure history of whole documents. Keystrokes in the
 * same field within `coalesceMs` fold into one step, so undo takes back a word, not a letter.
 */
export interface History<T> {
  readonly past: readonly T[];
  readonly present: T;
  readonly future: readonly T[];
  /** The field of the last edit and when it happened, for coalescing. */
  readonly lastKey?: string;
  readonly lastAt?: number;
}

/** Steps kept; older ones drop off the far end. */
export const HISTORY_LIMIT = 200;
export const COALESCE_MS = 800;

export function createHistory<T>(present: T): History<T> {
  return { past: [], present, future: [] };
}

export interface EditOptions {
  /** A field identity (e.g. its JSON path); equal keys within `coalesceMs` share one step. */
  key?: string;
  /** Clock of the edit, in ms (passed in so the history stays pure). */
  at?: number;
  coalesceMs?: number;
}

export function applyEdit<T>(history: History<T>, next: T, options: EditOptions = {}): History<T> {
  if (Object.is(next, history.present)) return history;
  const { key, at, coalesceMs = COALESCE_MS } = options;
  const coalesce =
    key !== undefined &&
    key === history.lastKey &&
    at !== undefined &&
    history.lastAt !== undefined &&
    at - history.lastAt <= coalesceMs &&
    history.future.length === 0;
  const past = coalesce ? history.past : [...history.past, history.present].slice(-HISTORY_LIMIT);
  return { past, present: next, future: [], lastKey: key, lastAt: at };
}

export function canUndo<T>(history: History<T>): boolean {
  return history.past.length > 0;
}

export function canRedo<T>(history: History<T>): boolean {
  return history.future.length > 0;
}

export function undo<T>(history: History<T>): History<T> {
  if (history.past.length === 0) return history;
  const previous = history.past[history.past.length - 1];
  return { past: history.past.slice(0, -1), present: previous, future: [history.present, ...history.future] };
}

export function redo<T>(history: History<T>): History<T> {
  if (history.future.length === 0) return history;
  const [next, ...rest] = history.future;
  return { past: [...history.past, history.present], present: next, future: rest };
}

/** Replaces the document without an undo step (loading a saved draft or restoring a revision). */
export function resetHistory<T>(present: T): History<T> {
  return createHistory(present);
}
