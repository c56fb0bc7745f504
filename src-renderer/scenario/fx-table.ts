import type { Asset } from '../../shared-core/contract/service-api.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';

/**
 * The exchange rates the returns engine needs to measure every asset in the base currency: one
 * column per currency, the price of one unit of it in the base currency (shared-core/returns).
 * The store keeps each rate as an asset tagged `fx` (units of `quote` per one `base`); a series
 * quoted the other way round is inverted.
 */
export interface FxSource {
  currency: string;
  /** Store asset holding the rate. */
  assetId: string;
  inverted: boolean;
}

/** Currencies of a price table other than the base one, each with the store series that prices it. */
export function fxSources(
  currencies: readonly (string | undefined)[] | undefined,
  base: string,
  catalogue: readonly Asset[],
): { sources: FxSource[]; missing: string[] } {
  const needed = [...new Set((currencies ?? []).filter((c): c is string => !!c && c !== base))].sort();
  const sources: FxSource[] = [];
  const missing: string[] = [];
  for (const currency of needed) {
    const direct = catalogue.find((a) => a.fx?.base === currency && a.fx.quote === base);
    const inverse = direct ? undefined : catalogue.find((a) => a.fx?.base === base && a.fx.quote === currency);
    if (direct) sources.push({ currency, assetId: direct.id, inverted: false });
    else if (inverse) sources.push({ currency, assetId: inverse.id, inverted: true });
    else missing.push(currency);
  }
  return { sources, missing };
}

/** The rate table from the store's aligned table of the rate series (columns in `sources` order). */
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
