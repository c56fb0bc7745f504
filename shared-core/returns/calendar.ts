import type { Frequency } from '../estimators/types.js';

/**
 * Calendar arithmetic on ISO dates `YYYY-MM-DD` for the returns engine: day numbers for gaps
 * measured in calendar days, and the week (Monday to Sunday, as ISO 8601) and month a date
 * falls in, for sampling on the last trading day of each period.
 */
export function dayNumber(date: string): number {
  const y = Number(date.slice(0, 4));
  const m = Number(date.slice(5, 7));
  const d = Number(date.slice(8, 10));
  return Math.round(Date.UTC(y, m - 1, d) / 86_400_000);
}

/** Index of the ISO week (Monday start) containing the day; consecutive weeks differ by 1. */
export function weekIndex(day: number): number {
  // Day 0 (1970-01-01) was a Thursday; shifting by 3 puts Mondays at multiples of 7.
  return Math.floor((day + 3) / 7);
}

/** Index of the calendar month containing the date; consecutive months differ by 1. */
export function monthIndex(date: string): number {
  return Number(date.slice(0, 4)) * 12 + Number(date.slice(5, 7)) - 1;
}

const ORDER: Record<Frequency, number> = { daily: 0, weekly: 1, monthly: 2 };

export function coarser(a: Frequency, b: Frequency): Frequency {
  return ORDER[a] >= ORDER[b] ? a : b;
}

export function isCoarser(a: Frequency, than: Frequency): boolean {
  return ORDER[a] > ORDER[than];
}

/**
 * How often a series is priced, from the median gap in calendar days between its prices:
 * up to 5 days is daily (weekends and holidays), up to 10 weekly, longer monthly (fund NAVs).
 * The thresholds are Holdfast's choice.
 */
export function pricingFrequency(days: readonly number[]): { frequency: Frequency; medianGap: number } {
  if (days.length < 3) return { frequency: 'daily', medianGap: 0 };
  const gaps = new Float64Array(days.length - 1);
  for (let i = 1; i < days.length; i++) gaps[i - 1] = days[i] - days[i - 1];
  gaps.sort(); // a typed array sorts numerically, and far faster than an array with a comparator
  const medianGap = gaps[gaps.length >> 1];
  return { frequency: medianGap <= 5 ? 'daily' : medianGap <= 10 ? 'weekly' : 'monthly', medianGap };
}
