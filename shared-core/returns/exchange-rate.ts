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
