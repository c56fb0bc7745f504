import { createHash } from 'node:crypto';

/**
 * Canonical JSON in the manner of the JSON Canonicalization Scheme (RFC 8785, Rundgren, Jordan
 * and Erdtman 2020): object keys sorted by their UTF-16 code units, no whitespace, numbers and
 * strings as ECMAScript's JSON.stringify writes them. `undefined` members are dropped, as
 * JSON.stringify drops them. Two documents that mean the same get the same text, so the same hash.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    if (typeof value === 'number' && !Number.isFinite(value))
      throw new TypeError('canonical JSON has no NaN or Infinity');
    const text = JSON.stringify(value);
    if (text === undefined) throw new TypeError(`canonical JSON cannot hold a ${typeof value}`);
    return text;
  }
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  const record = value as Record<string, unknown>;
  // Default sort compares UTF-16 code units, which is what RFC 8785 section 3.2.3 asks for.
  const keys = Object.keys(record)
    .filter((k) => record[k] !== undefined)
    .sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(record[k])}`).join(',')}}`;
}

export function sha256Hex(data: string | Uint8Array): string {
  return createHash('sha256').update(data).digest('hex');
}
