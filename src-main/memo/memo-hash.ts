import { createHash } from 'node:crypto';
import { MEMO_LAYOUT_VERSION, type MemoInput } from './memo-input.js';

/**
 * The memo's own hash, printed in its footer. A PDF cannot contain the hash of its own bytes,
 * so the memo hash covers what determines those bytes: SHA-256 of the canonical JSON of
 * `{ layout: MEMO_LAYOUT_VERSION, input: MemoInput }`. Canonical JSON: object keys sorted by
 * code unit, no whitespace, undefined members dropped, typed arrays as arrays, numbers as
 * JavaScript prints them (shortest round-trip form), non-finite numbers as the strings "NaN",
 * "Infinity", "-Infinity". Because `renderMemo` is a pure function of its input, equal memo
 * hashes mean equal PDF bytes; the store also keeps the SHA-256 of the bytes themselves.
 */
export function canonicalJson(value: unknown): string {
  if (value === null) return 'null';
  if (typeof value === 'number') return Number.isFinite(value) ? JSON.stringify(value) : JSON.stringify(String(value));
  if (typeof value === 'string' || typeof value === 'boolean') return JSON.stringify(value);
  if (ArrayBuffer.isView(value) && !(value instanceof DataView))
    return canonicalJson(Array.from(value as unknown as ArrayLike<number>));
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  if (typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>)
      .filter(([, v]) => v !== undefined)
      .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(',')}}`;
  }
  throw new TypeError(`cannot hash a value of type ${typeof value}`);
}

export function memoHash(input: MemoInput): string {
  return createHash('sha256')
    .update(canonicalJson({ layout: MEMO_LAYOUT_VERSION, input }))
    .digest('hex');
}
