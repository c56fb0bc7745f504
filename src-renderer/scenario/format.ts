/**
 * How figures read on screen (design notes): weights and volatilities as percentages with one
 * decimal, ratios with two, currency with thousands separators and its ISO 4217 code, dates in
 * the user's locale. Every screen figure goes through one of these, so they never disagree.
 */

/** `undefined` means the browser's own locale. */
export type Locale = string | undefined;

const cache = new Map<string, Intl.NumberFormat>();

function numberFormat(locale: Locale, options: Intl.NumberFormatOptions): Intl.NumberFormat {
  const key = `${locale ?? ''}|${JSON.stringify(options)}`;
  let format = cache.get(key);
  if (!format) {
    format = new Intl.NumberFormat(locale, options);
    cache.set(key, format);
  }
  return format;
}

const DASH = '\u2013';

/** 0.1234 -> "12.3%". Not-a-number reads as an en dash, never "NaN%". */
export function formatPercent(value: number | null | undefined, locale?: Locale, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return DASH;
  // Avoid "-0.0%" for tiny negative solver noise.
  const rounded = Math.abs(value) < 0.5 * 10 ** -(digits + 2) ? 0 : value;
  return numberFormat(locale, {
    style: 'percent',
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
  }).format(rounded);
}

/** Signed percentage points for differences: 0.021 -> "+2.1%". */
export function formatSignedPercent(value: number | null | undefined, locale?: Locale, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return DASH;
  const text = formatPercent(Math.abs(value), locale, digits);
  if (text === formatPercent(0, locale, digits)) return text;
  return `${value < 0 ? '\u2212' : '+'}${text}`;
}

/** Diversification ratio, effective bets and holdings: two decimals. */
export function formatRatio(value: number | null | undefined, locale?: Locale): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return DASH;
  return numberFormat(locale, { minimumFractionDigits: 2, maximumFractionDigits: 2 }).format(value);
}

/** 1234567.4, "EUR" -> "EUR 1,234,567" (whole units: trade lists are read, not booked). */
export function formatCurrency(amount: number | null | undefined, currency: string, locale?: Locale): string {
  if (amount === null || amount === undefined || !Number.isFinite(amount)) return DASH;
  // Half away from zero, as a person rounds money (Math.round sends -0.5 up).
  const whole = Math.sign(amount) * Math.round(Math.abs(amount));
  const digits = numberFormat(locale, { maximumFractionDigits: 0, useGrouping: true }).format(Math.abs(whole));
  return `${whole < 0 ? '\u2212' : ''}${currency} ${digits}`;
}

/** "2024-03-31" -> the locale's medium date, read in UTC so the day never shifts. */
export function formatDate(iso: string, locale?: Locale): string {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso);
  if (!match) return iso;
  const date = new Date(Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3])));
  return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeZone: 'UTC' }).format(date);
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

/** A fraction back to the text the field shows: 0.15 -> "15", 0.125 -> "12.5". */
export function percentInputText(value: number | undefined): string {
  if (value === undefined || !Number.isFinite(value)) return '';
  return String(Number((value * 100).toPrecision(12)));
}
