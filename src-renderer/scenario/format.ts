/**
 * How figures read on screen (design notes): weights and volatilities as percentages with one
 * decimal, ratios with two, currency with thousands separators and its ISO 4217 code, dates in
 * the user's locale. The digits come from the memo's formatter (shared-core/present/format.ts);
 * this module only adds the locale's notation and reads a missing figure as a dash.
 */

import {
  DASH,
  formatPercent1,
  MINUS,
  PLAIN,
  formatDay,
  formatInstant,
  formatMoney,
  formatPct,
  formatRatio2,
  formatSignedPct,
  notationFor,
} from '../../shared-core/present/format.js';

/** `undefined` means the browser's own locale. */
export type Locale = string | undefined;

type Figure = number | null | undefined;

/** 0.1234 -> "12.3%". Not-a-number reads as an en dash, never "NaN%". */
export function formatPercent(value: Figure, locale?: Locale, digits = 1): string {
  return value === null || value === undefined ? DASH : formatPct(value, notationFor(locale), digits);
}

/** Signed percentage points for differences: 0.021 -> "+2.1%". */
export function formatSignedPercent(value: Figure, locale?: Locale, digits = 1): string {
  return value === null || value === undefined ? DASH : formatSignedPct(value, notationFor(locale), digits);
}

/** Diversification ratio, effective bets and holdings: two decimals. */
export function formatRatio(value: Figure, locale?: Locale): string {
  return value === null || value === undefined ? DASH : formatRatio2(value, notationFor(locale));
}

/** 1234567.4, "EUR" -> "1,234,567 EUR", as the memo prints it (whole units: trade lists are read, not booked). */
export function formatCurrency(amount: Figure, currency: string, locale?: Locale): string {
  return amount === null || amount === undefined ? DASH : formatMoney(amount, currency, 0, notationFor(locale));
}

/** "2024-03-31" -> the locale's medium date, read in UTC so the day never shifts. */
export function formatDate(iso: string, locale?: Locale): string {
  return formatDay(iso, locale);
}

/** "2026-12-05T11:44:18Z" -> the locale's medium date and short time. */
export function formatDateTime(iso: string, locale?: Locale): string {
  return formatInstant(iso, locale);
}

/** Milliseconds for the busy line: "84 ms", "1.2 s". */
export function formatDuration(ms: number): string {
  if (!Number.isFinite(ms)) return DASH;
  return ms < 1000 ? `${Math.round(ms)} ms` : `${(ms / 1000).toFixed(1)} s`;
}

/**
 * A weight typed as per cent ("15", "15%", "12,5") to a fraction, or null with no number in it.
 * Accepts a decimal comma because advisors type in their own locale.
 */
export function parsePercentInput(text: string): number | null {
  const cleaned = text.trim().replace(/%$/, '').trim().replace(',', '.');
  if (cleaned === '' || !/^[-+]?(\d+(\.\d*)?|\.\d+)$/.test(cleaned)) return null;
  // Divide the decimal string, not a float, so "15" gives exactly 0.15.
  return Number(cleaned) / 100;
}

/**
 * A fraction back to the text the field shows, to at most `decimals` decimals of a per cent and
 * without trailing zeros: 0.15 -> "15", 0.125 -> "12.5", 0.128456 -> "12.85" (one figure reads the
 * same in the field as in the tables; what the advisor types is kept as typed).
 */
export function percentInputText(value: number | undefined, decimals = 2): string {
  if (value === undefined || !Number.isFinite(value)) return '';
  return formatPercent1(value, PLAIN, decimals)
    .replace(/(\.\d*?)0+$/, '$1')
    .replace(/\.$/, '')
    .replace(MINUS, '-');
}
