import { jsonPath } from '../../shared-core/scenario/json-path.js';
import { fieldWords } from '../../shared-core/present/field-words.js';
import { percentInputText } from './format.js';

/**
 * What differs between two scenario documents, as JSON paths with the values before and after:
 * what the advisor reads when a revision is opened beside the current draft.
 */
export interface DocumentChange {
  path: string;
  before: unknown;
  after: unknown;
}

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

export function diffDocuments(before: unknown, after: unknown, path: (string | number)[] = []): DocumentChange[] {
  if (Object.is(before, after)) return [];
  // A section added or removed reads field by field, in the fields' own words, not as JSON.
  const a = before === undefined && isPlainObject(after) ? {} : before;
  const b = after === undefined && isPlainObject(before) ? {} : after;
  if (isPlainObject(a) && isPlainObject(b)) {
    const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort();
    return keys.flatMap((k) => diffDocuments(a[k], b[k], [...path, k]));
  }
  // Arrays of scalars (asset lists, a bound pair) read best whole; arrays of objects by element.
  if (Array.isArray(before) && Array.isArray(after) && [...before, ...after].some(isPlainObject)) {
    const n = Math.max(before.length, after.length);
    return Array.from({ length: n }, (_, i) => diffDocuments(before[i], after[i], [...path, i])).flat();
  }
  if (JSON.stringify(before) === JSON.stringify(after)) return [];
  return [{ path: jsonPath(path), before, after }];
}

/**
 * A value as one short line in its field's unit: a share of the portfolio in per cent ("15 %",
 * a bound pair "0 % to 15 %"), other numbers as they are, lists joined, absent as "not set".
 */
export function showValue(value: unknown, path = ''): string {
  if (value === undefined) return 'not set';
  if (fieldWords(path).unit === 'percent') {
    const pct = (v: unknown) => (typeof v === 'number' ? `${percentInputText(v)} %` : String(v));
    if (typeof value === 'number') return pct(value);
    if (Array.isArray(value) && value.length === 2 && value.every((v) => typeof v === 'number'))
      return `${pct(value[0])} to ${pct(value[1])}`;
  }
  if (Array.isArray(value) && value.every((v) => typeof v !== 'object')) return `[${value.join(', ')}]`;
  const text = JSON.stringify(value);
  return text.length > 80 ? `${text.slice(0, 77)}…` : text;
}
