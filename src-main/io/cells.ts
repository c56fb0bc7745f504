/** Reading single cells of a price file: dates in three orders, numbers with either decimal mark. */

export type DateOrder = 'iso' | 'day-first' | 'month-first';
import { scanPlainDecimal, type DecimalMark } from '../../shared-core/prices/plain-decimal.js';

export { scanPlainDecimal, type DecimalMark };

/** A date cell as read, before the file's date order is known. */
export interface DateToken {
  kind: 'iso' | 'numeric';
  /** iso: year, month, day. numeric: first part, second part, year. */
  a: number;
  b: number;
  year: number;
}

const ISO = /^(\d{4})-(\d{2})-(\d{2})$/;
const NUMERIC = /^(\d{1,2})([./-])(\d{1,2})\2(\d{4})$/;

export function readDateToken(text: string): DateToken | undefined {
  const t = text.trim();
  let m = ISO.exec(t);
  if (m) return { kind: 'iso', a: +m[2], b: +m[3], year: +m[1] };
  m = NUMERIC.exec(t);
  if (m) return { kind: 'numeric', a: +m[1], b: +m[3], year: +m[4] };
  return undefined;
}

/** Month and day of a token under a date order, or undefined when that date does not exist. */
export function resolveDate(
  token: DateToken,
  order: DateOrder,
): { year: number; month: number; day: number } | undefined {
  const [month, day] = token.kind === 'iso' || order === 'month-first' ? [token.a, token.b] : [token.b, token.a];
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(token.year, month)) return undefined;
  return { year: token.year, month, day };
}

function daysInMonth(year: number, month: number): number {
  return month === 2
    ? year % 4 === 0 && (year % 100 !== 0 || year % 400 === 0)
      ? 29
      : 28
    : [4, 6, 9, 11].includes(month)
      ? 30
      : 31;
}

/**
 * The number in a cell under the file's decimal mark; NaN when the cell is not such a number.
 * `Number()` does the conversion (it is exact and fast); what it accepts beyond plain decimals
 * (hex, binary and octal prefixes, Infinity, blanks) is refused here, and under the decimal comma
 * a point is refused too (it could be a thousands separator).
 */
export function readNumber(text: string, mark: DecimalMark): number {
  let t = text;
  if (mark === 'comma') {
    if (t.includes('.')) return NaN;
    t = t.replace(',', '.');
  }
  const v = Number(t);
  if (!Number.isFinite(v)) return NaN;
  let i = 0;
  while (i < t.length && t.charCodeAt(i) <= 32) i++;
  if (i === t.length) return NaN; // blank: Number() reads it as 0
  const c1 = t.charCodeAt(i + 1) | 0x20; // the second character, lower-cased
  if (t.charCodeAt(i) === 48 && (c1 === 120 || c1 === 98 || c1 === 111)) return NaN; // 0x 0b 0o
  return v;
}

/** Evidence for the decimal mark in one cell: 1 comma, -1 point, 0 neither (integers, blanks). */
export function decimalEvidence(text: string): number {
  const t = text.trim();
  if (/^[+-]?\d*,\d+$/.test(t)) return 1;
  if (/^[+-]?\d*\.\d+([eE][+-]?\d+)?$/.test(t)) return -1;
  return 0;
}
