import { InputError } from '../../shared-core/errors.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import type { Store } from '../store/store.js';

/**
 * The exchange rates a run needs to bring prices into the base currency: one column per
 * currency (named by its ISO code), units of the base per one unit of it, from the stored
 * exchange-rate series (an inverse series inverted). Undefined when every price is in the base.
 * Shared by the service and the command line's store forms; a missing series is an InputError
 * (the service answers it as a bad request, the command line exits 2).
 */
export function storedExchangeRates(
  store: Store,
  base: string,
  currencies: readonly (string | null | undefined)[],
): PriceTable | undefined {
  const wanted = [...new Set(currencies.filter((c): c is string => !!c && c !== base))].sort();
  if (wanted.length === 0) return undefined;
  const series = wanted.map((ccy) => {
    const direct = store.fxAsset(ccy, base);
    const inverse = direct ? undefined : store.fxAsset(base, ccy);
    if (!direct && !inverse)
      throw new InputError(
        `assets are priced in ${ccy} but the store has no ${ccy}/${base} exchange-rate series; import one first`,
      );
    return { ccy, id: (direct ?? inverse)!.id, invert: !direct };
  });
  const table = store.priceTable({ assets: series.map((x) => x.id) });
  return {
    dates: table.dates,
    assets: series.map((x) => x.ccy),
    closes: table.closes.map((c, i) => (series[i].invert ? c.map((v) => 1 / v) : c)),
  };
}
