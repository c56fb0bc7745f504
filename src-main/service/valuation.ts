import type { Holdings } from '../../shared-core/contract/service-api.js';
import type { Holding, HouseholdRecord, Store } from '../store/store.js';

/**
 * Values a household's holdings in its base currency with the exchange rates the store holds:
 * the last close on or before the as-of date of the series quoting the base currency per unit
 * of the holding's currency (or the inverse series, inverted). No rate, no value: the figure is
 * left empty rather than guessed.
 */
interface Rate {
  rate: number;
  date: string;
  series: string;
}

function lastCloseOnOrBefore(store: Store, assetId: string, asOf: string): { close: number; date: string } | null {
  const series = store.priceSeries(assetId);
  if (!series) return null;
  for (let i = series.dates.length - 1; i >= 0; i--)
    if (series.dates[i] <= asOf && Number.isFinite(series.closes[i]))
      return { close: series.closes[i], date: series.dates[i] };
  return null;
}

export function exchangeRate(store: Store, from: string, to: string, asOf: string): Rate | null {
  const direct = store.fxAsset(from, to);
  if (direct) {
    const last = lastCloseOnOrBefore(store, direct.id, asOf);
    if (last) return { rate: last.close, date: last.date, series: direct.id };
  }
  const inverse = store.fxAsset(to, from);
  if (inverse) {
    const last = lastCloseOnOrBefore(store, inverse.id, asOf);
    if (last && last.close > 0) return { rate: 1 / last.close, date: last.date, series: inverse.id };
  }
  return null;
}

export function valueHoldings(store: Store, household: HouseholdRecord, holdings: readonly Holding[]): Holdings {
  const base = household.baseCurrency;
  const asOf = holdings.reduce<string | null>(
    (latest, h) => (latest === null || h.asOf > latest ? h.asOf : latest),
    null,
  );
  const rates = new Map<string, Rate | null>();
  const values = holdings.map((h) => {
    if (h.currency === base) return h.amount;
    if (!rates.has(h.currency)) rates.set(h.currency, exchangeRate(store, h.currency, base, h.asOf));
    const rate = rates.get(h.currency);
    return rate ? h.amount * rate.rate : null;
  });
  const complete = values.every((v) => v !== null);
  const total = holdings.length && complete ? values.reduce<number>((s, v) => s + (v ?? 0), 0) : null;
  return {
    householdId: String(household.id),
    baseCurrency: base,
    asOf,
    positions: holdings.map((h, i) => ({
      asset: h.assetId,
      amount: h.amount,
      currency: h.currency,
      valueInBase: values[i],
      weight: total && values[i] !== null ? (values[i] as number) / total : null,
    })),
    total,
    rates: [...rates.entries()].map(([ccy, r]) =>
      r
        ? `${ccy} to ${base} ${r.rate.toPrecision(6)} on ${r.date}, series ${r.series}`
        : `${ccy} to ${base}: no exchange rate on file`,
    ),
  };
}
