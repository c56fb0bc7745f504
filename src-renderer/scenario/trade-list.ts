import type { Holdings } from '../../shared-core/contract/service-api.js';
import { DEFAULT_LOT, tradeList, type TradePlan } from '../../shared-core/trades/trade-list.js';

/**
 * The screen's trade list: the household's holdings, valued in the base currency by the service,
 * planned by the one trade list the memo prints too (shared-core/trades), rounded to the same lot.
 * A holding the service could not value stops the list with a sentence saying which and why.
 */
export type HoldingsTrades =
  | {
      ok: true;
      plan: TradePlan;
      currency: string;
      asOf: string | null;
      /** The exchange rates used, in words. */
      rates: string[];
    }
  | { ok: false; reason: string };

/** Each holding's value in the base currency, or the sentence naming what could not be valued. */
export function baseAmounts(
  holdings: Holdings,
): { ok: true; amounts: Map<string, number> } | { ok: false; reason: string } {
  if (holdings.positions.length === 0)
    return { ok: false, reason: 'the household has no holdings on file, so there is nothing to trade from' };
  const missing = holdings.positions.filter((p) => p.valueInBase === null);
  if (missing.length > 0)
    return {
      ok: false,
      reason:
        `${missing.map((p) => `${p.asset} is held in ${p.currency}`).join('; ')}, and the store has no rate to ` +
        `${holdings.baseCurrency} on or before the holdings date`,
    };
  const amounts = new Map<string, number>();
  for (const p of holdings.positions) amounts.set(p.asset, (amounts.get(p.asset) ?? 0) + (p.valueInBase as number));
  return { ok: true, amounts };
}

/** Trades from the holdings to `weights`, in the order of the weights' assets (the estimate's, as in the memo). */
export function tradesFromHoldings(
  weights: Readonly<Record<string, number>>,
  holdings: Holdings,
  lot: number = DEFAULT_LOT,
): HoldingsTrades {
  const converted = baseAmounts(holdings);
  if (!converted.ok) return converted;
  const held = Object.fromEntries(converted.amounts);
  if (!(Object.values(held).reduce((s, v) => s + v, 0) > 0))
    return { ok: false, reason: 'the holdings add up to zero, so weights cannot become amounts' };
  return {
    ok: true,
    plan: tradeList({ assets: Object.keys(weights), held, weights, lot }),
    currency: holdings.baseCurrency,
    asOf: holdings.asOf,
    rates: holdings.rates,
  };
}

/** Current weights from the holdings (the turnover reference), or the reason they cannot be had. */
export function weightsFromHoldings(
  holdings: Holdings,
): { ok: true; weights: Record<string, number> } | { ok: false; reason: string } {
  const converted = baseAmounts(holdings);
  if (!converted.ok) return converted;
  const total = [...converted.amounts.values()].reduce((s, v) => s + v, 0);
  if (!(total > 0)) return { ok: false, reason: 'the holdings add up to zero' };
  const weights: Record<string, number> = {};
  for (const [asset, amount] of converted.amounts) weights[asset] = amount / total;
  return { ok: true, weights };
}
