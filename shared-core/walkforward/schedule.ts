import type { RebalanceSchedule } from './types.js';

/** The period a date belongs to for a calendar schedule: `2024-03` (month), `2024-Q1`, `2024`. */
export function periodKey(date: string, schedule: Exclude<RebalanceSchedule, 'drift'>): string {
  const year = date.slice(0, 4);
  if (schedule === 'yearly') return year;
  const month = Number(date.slice(5, 7));
  return schedule === 'monthly' ? date.slice(0, 7) : `${year}-Q${Math.ceil(month / 3)}`;
}

/**
 * Rows on which a calendar schedule rebalances: the start row, then the last trading day of
 * each month, quarter or year in the data (trading at the close of the period's last day is
 * common practice), never the final row (nothing would be held afterwards). Only dates are
 * read, never prices. For `drift` only the start row is scheduled; the engine adds the rest.
 */
export function scheduledRows(dates: readonly string[], startIndex: number, schedule: RebalanceSchedule): Set<number> {
  const rows = new Set<number>();
  const last = dates.length - 1;
  if (startIndex >= last) return rows;
  rows.add(startIndex);
  if (schedule === 'drift') return rows;
  for (let t = startIndex + 1; t < last; t++)
    if (periodKey(dates[t], schedule) !== periodKey(dates[t + 1], schedule)) rows.add(t);
  return rows;
}

/** True when any drifted weight is further than `band` from its target (the drift schedule's trigger). */
export function outsideBand(drifted: ArrayLike<number>, target: ArrayLike<number>, band: number): boolean {
  for (let i = 0; i < target.length; i++) if (Math.abs(drifted[i] - target[i]) > band + 1e-15) return true;
  return false;
}
