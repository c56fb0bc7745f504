import { dayFromIso, isoFromDay, weekday } from '../store/days.js';

/**
 * Which dates an asset has prices for, as a person reads it: first and last date, and the gaps.
 * A gap is a run of weekdays without a price that is longer than both `minGapWeekdays` (a few
 * missing weekdays are holidays; five is common practice for daily series) and one and a half
 * times the asset's usual spacing, so a fund priced once a month does not show a gap every month.
 */
export interface GapRun {
  after: string;
  before: string;
  missingWeekdays: number;
}

export interface SeriesCoverage {
  observations: number;
  firstDate: string | null;
  lastDate: string | null;
  /** Median weekdays from one price to the next (1 for a daily series, about 21 for a monthly one). */
  typicalSpacing: number | null;
  gaps: GapRun[];
}

/** Weekdays in (a, b]: from the day after `a` up to and including `b`. */
export function weekdaysBetween(a: number, b: number): number {
  if (b <= a) return 0;
  const days = b - a;
  let count = Math.floor(days / 7) * 5;
  for (let d = a + 1 + Math.floor(days / 7) * 7; d <= b; d++) if (weekday(d) < 5) count++;
  return count;
}

function median(values: number[]): number {
  const sorted = [...values].sort((x, y) => x - y);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** `dates` ascending ISO dates on which the asset has a price. */
export function seriesCoverage(dates: readonly string[], minGapWeekdays: number): SeriesCoverage {
  if (dates.length === 0) return { observations: 0, firstDate: null, lastDate: null, typicalSpacing: null, gaps: [] };
  const days = dates.map(dayFromIso);
  const spacing: number[] = [];
  for (let i = 1; i < days.length; i++) spacing.push(weekdaysBetween(days[i - 1], days[i]));
  const typical = spacing.length ? median(spacing) : null;
  const gaps: GapRun[] = [];
  spacing.forEach((s, i) => {
    const missing = s - 1;
    if (missing > minGapWeekdays && (typical === null || s > 1.5 * typical))
      gaps.push({ after: isoFromDay(days[i]), before: isoFromDay(days[i + 1]), missingWeekdays: missing });
  });
  return {
    observations: dates.length,
    firstDate: dates[0],
    lastDate: dates[dates.length - 1],
    typicalSpacing: typical,
    gaps,
  };
}
