/**
 * Sample quantile by linear interpolation between order statistics: type 7 of Hyndman and Fan
 * (1996, The American Statistician 50), the default of R's `quantile` and numpy's `quantile`.
 */
export function quantile(values: ArrayLike<number>, p: number): number {
  const n = values.length;
  if (n === 0) return NaN;
  const sorted = Float64Array.from(values).sort();
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, n - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

export function mean(values: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < values.length; i++) s += values[i];
  return values.length ? s / values.length : NaN;
}

/** Sample standard deviation (divisor n - 1). */
export function standardDeviation(values: ArrayLike<number>): number {
  const n = values.length;
  if (n < 2) return NaN;
  const m = mean(values);
  let s = 0;
  for (let i = 0; i < n; i++) s += (values[i] - m) ** 2;
  return Math.sqrt(s / (n - 1));
}
