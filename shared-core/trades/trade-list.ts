import { decimalsForLot, roundHalfAway } from '../present/format.js';

/**
 * The trades that take a household from its holdings to a candidate's target weights, in the
 * base currency, each rounded to a multiple of the lot. The screen's trade list and the memo's
 * trades table are both this list, so they print the same amounts.
 *
 * target amount = weight x total of the holdings; trade = target - held, rounded to whole lots.
 * A full sale (target weight zero) sells the whole position, unrounded, so no stub is left
 * behind. What rounding leaves over is kept in cash (`residual`), so the trades and that cash add
 * up to zero and the values after trading plus that cash to the holdings' total (common practice
 * for rebalancing tickets).
 */
export interface TradeRow {
  asset: string;
  /** Held now, in the base currency, rounded to the plan's decimals. */
  current: number;
  /** Target weight x total, unrounded. */
  target: number;
  /** Rounded trade; positive buys, negative sells. */
  trade: number;
  /** current + trade. */
  after: number;
}

export interface TradePlan {
  /** Sells first, then buys, each by size (the order a dealer works a list), then the assets that do not trade. */
  rows: TradeRow[];
  total: number;
  buys: number;
  /** Sum of sales, as a positive amount. */
  sells: number;
  /** Cash left over (positive) or needed (negative) after the rounded trades: -(sum of trades). */
  residual: number;
  lot: number;
  /** Decimals of the amounts: those of the lot (0 for whole-currency lots). */
  decimals: number;
}

/** The lot when none is chosen: trades in multiples of 1,000 of the base currency. */
export const DEFAULT_LOT = 1000;

export interface TradeListInput {
  /** Every asset in play, in a fixed order (ties in the plan's order keep it); held or weighted assets left out are added after. */
  assets: readonly string[];
  /** Held amounts in the base currency. */
  held: Readonly<Record<string, number>>;
  /** Target weights (fractions). */
  weights: Readonly<Record<string, number>>;
  /** Trades are rounded to multiples of this amount; positive. */
  lot: number;
}

export function tradeList({ assets: order, held, weights, lot }: TradeListInput): TradePlan {
  const assets = [...new Set([...order, ...Object.keys(held), ...Object.keys(weights)])];
  const decimals = decimalsForLot(lot);
  const total = assets.reduce((s, a) => s + (held[a] ?? 0), 0);
  // Work in units of the smallest printed decimal, so sums of printed figures are exact.
  const unit = 10 ** -decimals;
  const toUnits = (x: number) => Math.round(roundHalfAway(x, decimals) / unit);
  const lotUnits = Math.max(1, Math.round(lot / unit));
  const rows: TradeRow[] = [];
  let buyUnits = 0;
  let sellUnits = 0;
  let totalUnits = 0;
  for (const asset of assets) {
    const currentUnits = toUnits(held[asset] ?? 0);
    totalUnits += currentUnits;
    const w = weights[asset] ?? 0;
    const wanted = w * total - (held[asset] ?? 0);
    let tradeUnits: number;
    if (w === 0) tradeUnits = -currentUnits;
    else {
      const lots = wanted / (lotUnits * unit);
      tradeUnits = Math.sign(lots) * Math.round(Math.abs(lots)) * lotUnits;
    }
    if (tradeUnits > 0) buyUnits += tradeUnits;
    else sellUnits -= tradeUnits;
    rows.push({
      asset,
      current: currentUnits * unit,
      target: w * total,
      trade: tradeUnits * unit + 0,
      after: (currentUnits + tradeUnits) * unit,
    });
  }
  // Sells, buys, then the rest; the sort is stable, so assets that do not trade keep the given order.
  const side = (r: TradeRow) => (r.trade < 0 ? 0 : r.trade > 0 ? 1 : 2);
  rows.sort((a, b) => side(a) - side(b) || Math.abs(b.trade) - Math.abs(a.trade));
  return {
    rows,
    total: totalUnits * unit,
    buys: buyUnits * unit,
    sells: sellUnits * unit,
    residual: (sellUnits - buyUnits) * unit,
    lot,
    decimals,
  };
}
