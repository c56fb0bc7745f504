import type { PriceTable } from '../prices/price-table.js';
import { maxDrawdown } from '../analytics/drawdown.js';
import type { AssetSet } from './targets.js';

/**
 * Historical stress: the worst periods in the data, replayed on a candidate's weights. For a
 * basis (the equal-weight universe, a group or an asset class: equal weights rebalanced daily,
 * common practice for a simple benchmark) find its worst calendar month and its maximum-drawdown
 * window (peak to trough), then apply each candidate's weights bought at the window's first close
 * and held to its last: sum_i w_i (P_i,end / P_i,start - 1).
 */
export interface HistoricalWindow {
  name: string;
  kind: 'worst-month' | 'worst-drawdown';
  basis: string;
  /** Whether the basis is the universe or a group band (`group`) or an asset class. */
  basisKind: AssetSet['kind'];
  /** Close the window starts from and close it ends at. */
  from: string;
  to: string;
  basisReturn: number;
}

/** Last known price of each asset at each row (valuation carry over missing closes). */
function carried(prices: PriceTable, assets: readonly string[]): Float64Array[] {
  return assets.map((a) => {
    const c = prices.closes[prices.assets.indexOf(a)];
    const out = new Float64Array(c.length);
    let last = NaN;
    for (let t = 0; t < c.length; t++) {
      if (Number.isFinite(c[t])) last = c[t];
      out[t] = last;
    }
    return out;
  });
}

function basisReturns(columns: Float64Array[]): Float64Array {
  const T = columns[0].length;
  const r = new Float64Array(T - 1);
  for (let t = 1; t < T; t++) {
    let s = 0;
    let k = 0;
    for (const c of columns)
      if (Number.isFinite(c[t]) && Number.isFinite(c[t - 1])) {
        s += c[t] / c[t - 1] - 1;
        k++;
      }
    r[t - 1] = k ? s / k : 0;
  }
  return r;
}

export function worstWindows(prices: PriceTable, bases: readonly AssetSet[]): HistoricalWindow[] {
  const dates = prices.dates;
  if (dates.length < 2) return [];
  const out: HistoricalWindow[] = [];
  for (const basis of bases) {
    const columns = carried(prices, basis.members);
    const r = basisReturns(columns);
    // Worst calendar month: compound the returns of rows in the month, from the previous close.
    let worst: { from: number; to: number; ret: number } | null = null;
    let from = 0;
    let growth = 1;
    for (let t = 1; t < dates.length; t++) {
      growth *= 1 + r[t - 1];
      const endOfMonth = t === dates.length - 1 || dates[t + 1].slice(0, 7) !== dates[t].slice(0, 7);
      if (endOfMonth) {
        if (!worst || growth - 1 < worst.ret) worst = { from, to: t, ret: growth - 1 };
        from = t;
        growth = 1;
      }
    }
    if (worst)
      out.push({
        name: `Worst month of ${basis.label}`,
        kind: 'worst-month',
        basis: basis.name,
        basisKind: basis.kind,
        from: dates[worst.from],
        to: dates[worst.to],
        basisReturn: worst.ret,
      });
    const dd = maxDrawdown(r, dates.slice(1), dates[0]);
    if (dd.depth > 0)
      out.push({
        name: `Largest drawdown of ${basis.label}`,
        kind: 'worst-drawdown',
        basis: basis.name,
        basisKind: basis.kind,
        from: dd.peakDate,
        to: dd.troughDate,
        basisReturn: -dd.depth,
      });
  }
  return out;
}

/** Buy-and-hold return of `weights` (in `assets` order) from the close of `from` to the close of `to`. */
export function replay(
  prices: PriceTable,
  assets: readonly string[],
  weights: ArrayLike<number>,
  from: string,
  to: string,
): number {
  const a = prices.dates.indexOf(from);
  const b = prices.dates.indexOf(to);
  if (a === -1 || b === -1 || b < a) throw new RangeError(`no window ${from} to ${to} in the price table`);
  const columns = carried(prices, assets);
  let r = 0;
  for (let i = 0; i < assets.length; i++) if (weights[i] !== 0) r += weights[i] * (columns[i][b] / columns[i][a] - 1);
  return r;
}
