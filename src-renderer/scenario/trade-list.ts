import type { Holdings } from '../../shared-core/contract/service-api.js';

/**
 * The trades that take a household from its holdings to a candidate's weights, in the base
 * currency: target amount = weight x total value of the holdings; trade = target - held. The
 * service values each holding in the base currency with the exchange rates the store holds; a
 * holding it could not value stops the list with a sentence saying which and why.
 */
export interface TradeLine {
  asset: string;
  held: number;
  target: number;
  /** Positive: buy; negative: sell. */
  trade: number;
  heldWeight: number;
  targetWeight: number;
}

export type TradeList =
  | {
      ok: true;
      currency: string;
      total: number;
      asOf: string | null;
      lines: TradeLine[];
      bought: number;
      sold: number;
      /** The exchange rates used, in words. */
      rates: string[];
    }
  | { ok: false; reason: string };

/** Trades smaller than this, in currency units, are left out as rounding (common practice). */
export const MIN_TRADE = 1;

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

export function tradeList(weights: Readonly<Record<string, number>>, holdings: Holdings): TradeList {
  const converted = baseAmounts(holdings);
  if (!converted.ok) return converted;
  const held = converted.amounts;
  const total = [...held.values()].reduce((s, v) => s + v, 0);
  if (!(total > 0)) return { ok: false, reason: 'the holdings add up to zero, so weights cannot become amounts' };
  const assets = [...new Set([...Object.keys(weights), ...held.keys()])];
  const lines: TradeLine[] = [];
  for (const asset of assets) {
    const h = held.get(asset) ?? 0;
    const w = weights[asset] ?? 0;
    const target = w * total;
    const trade = target - h;
    if (Math.abs(trade) < MIN_TRADE) continue;
    lines.push({ asset, held: h, target, trade, heldWeight: h / total, targetWeight: w });
  }
  // Sells first, then buys, each by size: the order a dealer works a list.
  lines.sort((a, b) => Math.sign(a.trade) - Math.sign(b.trade) || Math.abs(b.trade) - Math.abs(a.trade));
  const bought = lines.reduce((s, l) => s + Math.max(0, l.trade), 0);
  const sold = lines.reduce((s, l) => s + Math.max(0, -l.trade), 0);
  return {
    ok: true,
    currency: holdings.baseCurrency,
    total,
    asOf: holdings.asOf,
    lines,
    bought,
    sold,
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
