/**
 * Maximum drawdown: the largest peak-to-trough fall of the growth-of-1 curve of a return series,
 * with the peak, trough and recovery dates (common practice). The walk-forward's metrics and the
 * historical stress windows both report it.
 */
export interface Drawdown {
  /** As a positive fraction: 0.25 is a 25% fall. */
  depth: number;
  peakDate: string;
  troughDate: string;
  /** First date the curve regains the peak, null if it never does. */
  recoveryDate: string | null;
}

/** `startDate` is the date at which the curve stands at 1 (before the first return). */
export function maxDrawdown(returns: ArrayLike<number>, dates: readonly string[], startDate: string): Drawdown {
  const curve = new Float64Array(returns.length + 1);
  curve[0] = 1;
  for (let t = 0; t < returns.length; t++) curve[t + 1] = curve[t] * (1 + returns[t]);
  const dateAt = (k: number): string => (k === 0 ? startDate : dates[k - 1]);
  let peak = 0;
  let best = { depth: 0, peak: 0, trough: 0 };
  for (let k = 1; k < curve.length; k++) {
    if (curve[k] >= curve[peak]) peak = k;
    const depth = 1 - curve[k] / curve[peak];
    if (depth > best.depth) best = { depth, peak, trough: k };
  }
  let recovery: number | null = null;
  if (best.depth > 0)
    for (let k = best.trough + 1; k < curve.length; k++)
      if (curve[k] >= curve[best.peak]) {
        recovery = k;
        break;
      }
  return {
    depth: best.depth,
    peakDate: dateAt(best.peak),
    troughDate: dateAt(best.trough),
    recoveryDate: recovery === null ? null : dateAt(recovery),
  };
}
