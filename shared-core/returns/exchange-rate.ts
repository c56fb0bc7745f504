import { InputError } from '../errors.js';
import type { PriceTable } from '../prices/price-table.js';
import { dayNumber } from './calendar.js';

/** The last finite rate on or before `day`, if it is at most `maxFill` days old. */
export function rateOn(fxDays: Int32Array, rates: Float64Array, day: number, maxFill: number): number | undefined {
  let lo = 0;
  let hi = fxDays.length; // first index with fxDays > day
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (fxDays[mid] <= day) lo = mid + 1;
    else hi = mid;
  }
  for (let i = lo - 1; i >= 0 && day - fxDays[i] <= maxFill; i--)
    if (Number.isFinite(rates[i]) && rates[i] > 0) return rates[i];
  return undefined;
}

/**
 * The price table in the base currency: every close of an asset priced in another currency
 * times that currency's rate on the same day (or the last one at most `maxFill` days before,
 * never a later one, so nothing is looked ahead). Assets in the base currency, or with no
 * currency given, are unchanged. The walk-forward converts once, so that its estimates and its
 * holding-period returns are measured in the same currency.
 */
export function inBaseCurrency(
  table: PriceTable,
  base: string,
  fx: PriceTable | undefined,
  maxFill: number,
): PriceTable {
  const currencies = table.currencies;
  if (!currencies || currencies.every((c) => c === undefined || c === base)) return table;
  const days = fx ? Int32Array.from(fx.dates, dayNumber) : undefined;
  const closes = table.closes.map((c, a) => {
    const currency = currencies[a];
    if (currency === undefined || currency === base) return c;
    const f = fx?.assets.indexOf(currency) ?? -1;
    if (!fx || !days || f === -1)
      throw new InputError(
        `${table.assets[a]} is priced in ${currency} but there is no ${currency} rate series in ${base}`,
      );
    const rates = fx.closes[f];
    return c.map((close, t) => {
      if (!Number.isFinite(close)) return close;
      const rate = rateOn(days, rates, dayNumber(table.dates[t]), maxFill);
      if (rate === undefined)
        throw new InputError(
          `no ${currency} rate in ${base} for ${table.assets[a]} on ${table.dates[t]} (none within ${maxFill} days before)`,
        );
      return close * rate;
    });
  });
  return { dates: table.dates, assets: table.assets, closes };
}

/**
 * Where the rate of one currency in the base currency comes from: a stored exchange-rate series
 * (an asset tagged `fx`, units of its quote per one unit of its base), read as it is or inverted.
 */
export interface FxSource {
  currency: string;
  /** The series holding the rate. */
  assetId: string;
  inverted: boolean;
}

/** The id of the series quoting `quote` per one unit of `base`, if there is one. */
export type FindFxSeries = (base: string, quote: string) => string | undefined;

/**
 * The one exchange-rate lookup: for each currency other than the base (sorted, once each), the
 * series that prices it in the base currency, a direct one first, else the inverse one; the
 * currencies without either are `missing`. The store, the app's page and the command line all
 * choose their series here.
 */
export function fxSources(
  currencies: readonly (string | null | undefined)[] | undefined,
  base: string,
  find: FindFxSeries,
): { sources: FxSource[]; missing: string[] } {
  const needed = [...new Set((currencies ?? []).filter((c): c is string => !!c && c !== base))].sort();
  const sources: FxSource[] = [];
  const missing: string[] = [];
  for (const currency of needed) {
    const direct = find(currency, base);
    const inverse = direct === undefined ? find(base, currency) : undefined;
    if (direct !== undefined) sources.push({ currency, assetId: direct, inverted: false });
    else if (inverse !== undefined) sources.push({ currency, assetId: inverse, inverted: true });
    else missing.push(currency);
  }
  return { sources, missing };
}

/**
 * The rate table the returns engine reads (one column per currency, units of the base per one
 * unit of it) from an aligned table of the source series (columns found by `assetId`).
 */
export function fxTable(rates: PriceTable, sources: readonly FxSource[]): PriceTable {
  return {
    dates: rates.dates,
    assets: sources.map((s) => s.currency),
    closes: sources.map((s) => {
      const column = rates.closes[rates.assets.indexOf(s.assetId)];
      return s.inverted ? Float64Array.from(column, (v) => 1 / v) : column;
    }),
  };
}

/**
 * The last finite, positive rate of `currency` on or before `asOf` in a rate table, with its
 * date: how a holding dated `asOf` is valued in the base currency. Undefined when there is none.
 */
export function rateOnOrBefore(
  fx: PriceTable | undefined,
  currency: string,
  asOf: string,
): { rate: number; date: string } | undefined {
  const column = fx?.closes[fx.assets.indexOf(currency)];
  if (!fx || !column) return undefined;
  for (let i = fx.dates.length - 1; i >= 0; i--)
    if (fx.dates[i] <= asOf && Number.isFinite(column[i]) && column[i] > 0)
      return { rate: column[i], date: fx.dates[i] };
  return undefined;
}
