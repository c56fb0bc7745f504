/**
 * Immutable edits of a scenario draft by JSON path, so every field of the editor writes through
 * one function and the undo history holds whole documents.
 */
export type PathKey = string | number;

export function getIn(value: unknown, path: readonly PathKey[]): unknown {
  let cur: unknown = value;
  for (const key of path) {
    if (cur === null || typeof cur !== 'object') return undefined;
    cur = (cur as Record<PathKey, unknown>)[key];
  }
  return cur;
}

/** A copy of `value` with `path` set; `undefined` deletes the key (optional fields stay absent). */
export function setIn<T>(value: T, path: readonly PathKey[], next: unknown): T {
  if (path.length === 0) return next as T;
  const [key, ...rest] = path;
  const base: unknown = value ?? (typeof key === 'number' ? [] : {});
  if (Array.isArray(base)) {
    const copy = base.slice();
    const child = setIn(copy[key as number], rest, next);
    if (child === undefined && rest.length === 0) copy.splice(key as number, 1);
    else copy[key as number] = child;
    return copy as T;
  }
  const copy: Record<PathKey, unknown> = { ...(base as Record<PathKey, unknown>) };
  const child = rest.length === 0 ? next : setIn(copy[key], rest, next);
  if (child === undefined) delete copy[key];
  else copy[key] = child;
  return copy as T;
}
