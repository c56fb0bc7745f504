import { InputError } from '../../shared-core/errors.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { fxSources, fxTable, type FxSource } from '../../shared-core/returns/exchange-rate.js';
import type { Store } from '../store/store.js';

export interface StoredRates {
  /** One column per currency, units of the base per one unit of it; absent when none is needed or found. */
  fx?: PriceTable;
  sources: FxSource[];
  /** Currencies the store has no series for, either way round. */
  missing: string[];
}

/**
 * The stored exchange rates that bring `currencies` into `base`, chosen by the one lookup
 * (shared-core/returns/exchange-rate.ts `fxSources`) and read in one aligned table.
 */
export function storedRates(
  store: Store,
  base: string,
  currencies: readonly (string | null | undefined)[],
): StoredRates {
  const { sources, missing } = fxSources(currencies, base, (b, q) => store.fxAsset(b, q)?.id);
  if (sources.length === 0) return { sources, missing };
  const rates = store.priceTable({ assets: sources.map((s) => s.assetId) });
  return { fx: fxTable(rates, sources), sources, missing };
}

/**
 * The rates a run needs to measure prices in the base currency; undefined when every price is in
 * the base. A currency without a series is an InputError (the service answers it as a bad
 * request, the command line exits 2).
 */
export function storedExchangeRates(
  store: Store,
  base: string,
  currencies: readonly (string | null | undefined)[],
): PriceTable | undefined {
  const { fx, missing } = storedRates(store, base, currencies);
  if (missing.length > 0)
    throw new InputError(
      `assets are priced in ${missing[0]} but the store has no ${missing[0]}/${base} exchange-rate series; import one first`,
    );
  return fx;
}
