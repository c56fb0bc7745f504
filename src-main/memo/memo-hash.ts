import { createHash } from 'node:crypto';
import { MEMO_LAYOUT_VERSION, type MemoInput } from './memo-input.js';

/**
 * The memo's own hash, printed in its footer. A PDF cannot contain the hash of its own bytes,
 * so the memo hash covers what determines those bytes: SHA-256 of the canonical JSON of
 * `{ layout: MEMO_LAYOUT_VERSION, input: MemoInput }`. Canonical JSON: object keys sorted by
 * code unit, no whitespace, undefined members dropped, typed arrays as arrays, numbers as
 * JavaScript prints them (shortest round-trip form), non-finite numbers as the strings "NaN",
 * "Infinity", "-Infinity". The solver's wall time (`run.candidates[].solver.ms`) is left out:
 * the memo does not print it and it differs from run to run. Because `renderMemo` is a pure
 * function of the rest, equal memo hashes mean equal PDF bytes; the store also keeps the
 * SHA-256 of the bytes themselves.
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

/** The input as the memo hash sees it: without the solver's timing. */
export function hashedInput(input: MemoInput): MemoInput {
  return {
    ...input,
    run: {
      ...input.run,
      candidates: input.run.candidates.map((c) => ({ ...c, solver: { ...c.solver, ms: 0 } })),
    },
  };
}

export function memoHash(input: MemoInput): string {
  return createHash('sha256')
    .update(canonicalJson({ layout: MEMO_LAYOUT_VERSION, input: hashedInput(input) }))
    .digest('hex');
}
