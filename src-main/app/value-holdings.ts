import type { Holdings } from '../../shared-core/contract/service-api.js';
import { rateOnOrBefore } from '../../shared-core/returns/exchange-rate.js';
import type { Holding, Store } from '../store/store.js';
import { storedRates } from './exchange-rates.js';

/**
 * A household's holdings valued in a base currency with the exchange rates the store holds: the
 * last close on or before the holdings date of the series pricing the holding's currency in the
 * base (chosen by the one exchange-rate lookup). No rate, no value: the figure is left empty
 * rather than guessed.
 */
export function valueHoldings(
  store: Store,
  household: { id: number },
  base: string,
  holdings: readonly Holding[],
): Holdings {
  const asOf = holdings.reduce<string | null>(
    (latest, h) => (latest === null || h.asOf > latest ? h.asOf : latest),
    null,
  );
  const { fx, sources } = storedRates(
    store,
    base,
    holdings.map((h) => h.currency),
  );
  const rates = new Map<string, { rate: number; date: string; series: string } | null>();
  const values = holdings.map((h) => {
    if (h.currency === base) return h.amount;
    if (!rates.has(h.currency)) {
      const found = rateOnOrBefore(fx, h.currency, h.asOf);
      const series = sources.find((s) => s.currency === h.currency)?.assetId;
      rates.set(h.currency, found && series ? { ...found, series } : null);
    }
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
