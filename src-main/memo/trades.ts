import { roundHalfAway } from '../../shared-core/present/format.js';

/**
 * The trades that take the household from its holdings to the target weights, in the base
 * currency, each rounded to a multiple of the lot. A full sale (target weight zero) sells the
 * whole position, unrounded, so no stub is left behind. What rounding leaves over is kept in
 * cash and shown as its own line, so the trade column adds up to zero and the values after
 * trading add up to the holdings' total (common practice for rebalancing tickets).
 */
export interface TradeRow {
  asset: string;
  current: number;
  target: number;
  /** Rounded trade; positive buys, negative sells. */
  trade: number;
  /** current + trade. */
  after: number;
}

export interface TradePlan {
  rows: TradeRow[];
  total: number;
  buys: number;
  /** Sum of sales, as a positive amount. */
  sells: number;
  /** Cash left over (positive) or needed (negative) after the rounded trades: -(sum of trades). */
  residual: number;
  lot: number;
  /** Decimals of the amounts (0 for whole-currency lots). */
  decimals: number;
}

export function planTrades(
  assets: readonly string[],
  currentAmounts: Readonly<Record<string, number>>,
  targetWeights: Readonly<Record<string, number>>,
  lot: number,
  decimals: number,
): TradePlan {
  const total = assets.reduce((s, a) => s + (currentAmounts[a] ?? 0), 0);
  // Work in units of the smallest printed decimal, so sums of printed figures are exact.
  const unit = 10 ** -decimals;
  const toUnits = (x: number) => Math.round(roundHalfAway(x, decimals) / unit);
  const lotUnits = Math.max(1, Math.round(lot / unit));
  const rows: TradeRow[] = [];
  let buyUnits = 0;
  let sellUnits = 0;
  let totalUnits = 0;
  for (const asset of assets) {
    const currentUnits = toUnits(currentAmounts[asset] ?? 0);
    totalUnits += currentUnits;
    const w = targetWeights[asset] ?? 0;
    const wanted = w * total - (currentAmounts[asset] ?? 0);
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
      trade: tradeUnits * unit,
      after: (currentUnits + tradeUnits) * unit,
    });
  }
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
