import type { DocumentChange } from './store.js';

/** Paths where two JSON documents differ, in the JSON-path form the scenario errors use. */
export function diffDocuments(before: unknown, after: unknown, path = ''): DocumentChange[] {
  if (Object.is(before, after)) return [];
  const bothArrays = Array.isArray(before) && Array.isArray(after);
  const bothObjects = isRecord(before) && isRecord(after);
  if (bothArrays) {
    const a = before as unknown[];
    const b = after as unknown[];
    const out: DocumentChange[] = [];
    for (let i = 0; i < Math.max(a.length, b.length); i++)
      out.push(...diffDocuments(i < a.length ? a[i] : undefined, i < b.length ? b[i] : undefined, `${path}[${i}]`));
    return out;
  }
  if (bothObjects) {
    const a = before as Record<string, unknown>;
    const b = after as Record<string, unknown>;
    const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort();
    return keys.flatMap((k) => diffDocuments(a[k], b[k], path ? `${path}.${k}` : k));
  }
  const change: DocumentChange = { path: path || '(document)' };
  if (before !== undefined) change.before = before;
  if (after !== undefined) change.after = after;
  return [change];
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return value !== null && typeof value === 'object' && !Array.isArray(value);
}
