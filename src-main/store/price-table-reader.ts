import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { isoFromDay } from './days.js';
import { lowerBound, type SeriesArrays } from './series-codec.js';

/**
 * Aligns several stored series on the union of their dates inside [fromDay, toDay]. Dates are
 * marked in a calendar-day bitmap over the window, so the cost is linear in the points read.
 */
export function alignSeries(
  assets: readonly string[],
  series: readonly (Pick<SeriesArrays, 'days' | 'closes'> | undefined)[],
  fromDay: number,
  toDay: number,
  currencies?: readonly (string | undefined)[],
): PriceTable {
  const ranges: [number, number][] = series.map((s) =>
    s ? [lowerBound(s.days, fromDay), lowerBound(s.days, toDay + 1)] : [0, 0],
  );
  let lo = Infinity;
  let hi = -Infinity;
  series.forEach((s, a) => {
    const [start, end] = ranges[a];
    if (!s || start >= end) return;
    lo = Math.min(lo, s.days[start]);
    hi = Math.max(hi, s.days[end - 1]);
  });
  if (lo > hi) return { dates: [], assets: [...assets], closes: assets.map(() => new Float64Array(0)), currencies };
  const span = hi - lo + 1;
  const row = new Int32Array(span);
  series.forEach((s, a) => {
    const [start, end] = ranges[a];
    for (let i = start; i < end; i++) row[s!.days[i] - lo] = 1;
  });
  const dates: string[] = [];
  for (let d = 0; d < span; d++) if (row[d]) row[d] = dates.push(isoFromDay(lo + d)) - 1;
  const closes = series.map((s, a) => {
    const [start, end] = ranges[a];
    // An asset priced on every date of the table is one block copy.
    if (end - start === dates.length) return s!.closes.slice(start, end);
    const out = new Float64Array(dates.length).fill(NaN);
    for (let i = start; i < end; i++) out[row[s!.days[i] - lo]] = s!.closes[i];
    return out;
  });
  return { dates, assets: [...assets], closes, currencies };
}
