import type { Frequency } from '../scenario/frequency.js';

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
export function pricingFrequency(days: ArrayLike<number>): { frequency: Frequency; medianGap: number } {
  if (days.length < 3) return { frequency: 'daily', medianGap: 0 };
  // The median gap by counting (gaps are whole days, nearly all short), as a sort would find it:
  // element (gaps >> 1) of [gaps below 0 sorted, 0 .. COUNTED_GAPS counted, longer ones sorted].
  const rank = (days.length - 1) >> 1;
  const counts = new Int32Array(COUNTED_GAPS + 1);
  const below: number[] = [];
  const above: number[] = [];
  for (let i = 1; i < days.length; i++) {
    const gap = days[i] - days[i - 1];
    if (gap < 0) below.push(gap);
    else if (gap > COUNTED_GAPS) above.push(gap);
    else counts[gap]++;
  }
  let medianGap: number;
  if (rank < below.length) medianGap = below.sort((a, b) => a - b)[rank];
  else {
    let seen = below.length;
    let g = 0;
    while (g <= COUNTED_GAPS && rank >= seen + counts[g]) seen += counts[g++];
    medianGap = g <= COUNTED_GAPS ? g : above.sort((a, b) => a - b)[rank - seen];
  }
  return { frequency: medianGap <= 5 ? 'daily' : medianGap <= 10 ? 'weekly' : 'monthly', medianGap };
}

/** Gaps up to this many days are counted in a table; longer ones (rare) are sorted. */
const COUNTED_GAPS = 64;
