/**
 * What one cell of a price file means: a date (in one of three orders, decided for the whole file
 * later), a price under the file's decimal mark, or why it is neither. Every reader of prices
 * asks here, so the import and the commands accept the same cells.
 */
import { readDecimal, type DecimalMark } from '../../shared-core/prices/plain-decimal.js';
import { priceProblem } from '../../shared-core/prices/price-value.js';
import { dayFromCivil } from '../store/days.js';

export type { DecimalMark };
export type DateOrder = 'iso' | 'day-first' | 'month-first';

/**
 * A date cell as read, before the file's date order is known, packed in one integer so that a
 * row keeps no object: ((year * 100 + a) * 100 + b), plus NUMERIC for day/month dates, where
 * (a, b) is (month, day) for ISO and the first and second parts otherwise. Two cells are the same
 * date under any one order exactly when their keys are equal. NO_DATE when unreadable.
 */
export type DateKey = number;
export const NO_DATE = -1;
const NUMERIC = 100_000_000;

const ISO = /^(\d{4})-(\d{2})-(\d{2})$/;
const DAY_MONTH = /^(\d{1,2})([./-])(\d{1,2})\2(\d{4})$/;

/** The key of the date in `text[start, end)`; the common ISO cell is read without a substring. */
export function dateKey(text: string, start = 0, end = text.length): DateKey {
  if (end - start === 10 && text.charCodeAt(start + 4) === 45 && text.charCodeAt(start + 7) === 45) {
    let key = 0;
    for (let i = start; i < end; i++) {
      if (i === start + 4 || i === start + 7) continue;
      const digit = text.charCodeAt(i) ^ 48;
      if (digit > 9) return NO_DATE;
      key = key * 10 + digit;
    }
    return key;
  }
  const t = (start === 0 && end === text.length ? text : text.slice(start, end)).trim();
  let m = ISO.exec(t);
  if (m) return (+m[1] * 100 + +m[2]) * 100 + +m[3];
  m = DAY_MONTH.exec(t);
  if (m) return NUMERIC + (+m[4] * 100 + +m[1]) * 100 + +m[3];
  return NO_DATE;
}

export function isDayMonthKey(key: DateKey): boolean {
  return key >= NUMERIC;
}

/** The first and second parts of a day/month key (to tell which order it allows). */
export function keyParts(key: DateKey): { a: number; b: number } {
  return { a: Math.floor(key / 100) % 100, b: key % 100 };
}

/** The day number (days since 1970-01-01) of a key under a date order; undefined when no such date. */
export function dayOfKey(key: DateKey, order: DateOrder): number | undefined {
  const k = key >= NUMERIC ? key - NUMERIC : key;
  const year = Math.floor(k / 10000);
  const a = Math.floor(k / 100) % 100;
  const b = k % 100;
  const [month, day] = key < NUMERIC || order === 'month-first' ? [a, b] : [b, a];
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) return undefined;
  return dayFromCivil(year, month, day);
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

export const DATE_FORMS = 'expected YYYY-MM-DD, DD/MM/YYYY or MM/DD/YYYY';

/** A price cell: its value, or why it is not a price (an empty cell is neither: no price that day). */
export function readPrice(
  text: string,
  mark: DecimalMark,
): number | { why: string; kind: 'unparseable' | 'non-positive' } {
  const v = readDecimal(text, mark);
  if (Number.isNaN(v))
    return {
      kind: 'unparseable',
      why: `'${shownCell(text)}' is not a number${mark === 'comma' ? ' with a decimal comma (like 101,25)' : ' (like 101.25)'}`,
    };
  const why = priceProblem(v);
  if (why) return { kind: v > 0 ? 'unparseable' : 'non-positive', why };
  return v;
}

/** A blank cell (no price that day). */
export function isBlank(text: string): boolean {
  return text === '' || (text.charCodeAt(0) <= 32 && text.trim() === '');
}

/** Evidence for the decimal mark in one cell: 1 comma, -1 point, 0 neither (integers, blanks). */
export function decimalEvidence(text: string): number {
  const t = text.trim();
  if (/^[+-]?\d*,\d+$/.test(t)) return 1;
  if (/^[+-]?\d*\.\d+([eE][+-]?\d+)?$/.test(t)) return -1;
  return 0;
}

/** Most characters of a cell echoed in a message: a 5 MB cell is shown by its first 80. */
export const SHOWN_CHARACTERS = 80;

export function shownCell(text: string): string {
  return text.length <= SHOWN_CHARACTERS ? text : `${text.slice(0, SHOWN_CHARACTERS - 1)}…`;
}
