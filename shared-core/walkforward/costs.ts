import { InputError } from '../errors.js';
import { canonicalAssetClass } from '../scenario/asset-class.js';
import type { AssetInfo } from '../scenario/schema.js';

/**
 * Transaction cost rates per asset as fractions of traded value, from the scenario's
 * `backtest.costBps`: one figure for every asset, or one per asset class with `default` for the
 * rest (asset classes come from `assetInfo[id].assetClass`).
 */
export function costRates(
  assets: readonly string[],
  costBps: number | Record<string, number>,
  assetInfo: Record<string, AssetInfo> = {},
): Float64Array {
  const rates = new Float64Array(assets.length);
  if (typeof costBps === 'number') return rates.fill(costBps / 10_000);
  const classOf = (asset: string) => {
    const c = assetInfo[asset]?.assetClass;
    return c === undefined ? undefined : canonicalAssetClass(c);
  };
  const classes = new Set(assets.map(classOf).filter((c): c is string => c !== undefined));
  // A class is named in any spelling ("Equity" for equity), as the document's classes are.
  const byClass = new Map(Object.entries(costBps).map(([key, bps]) => [canonicalAssetClass(key), bps]));
  for (const key of Object.keys(costBps))
    if (key !== 'default' && !classes.has(canonicalAssetClass(key)))
      throw new InputError(
        `no asset has class '${key}'${classes.size ? `; classes are ${[...classes].join(', ')}` : ' (assetInfo gives no asset classes)'}`,
        { path: `backtest.costBps.${key}` },
      );
  assets.forEach((asset, i) => {
    const assetClass = classOf(asset);
    const bps = (assetClass !== undefined ? byClass.get(assetClass) : undefined) ?? costBps.default;
    if (bps === undefined)
      throw new InputError(
        `asset '${asset}'${assetClass ? ` (class '${assetClass}')` : ' (no asset class)'} has no cost rate; add 'default'`,
        { path: 'backtest.costBps' },
      );
    rates[i] = bps / 10_000;
  });
  return rates;
}

/** Cost of moving from `from` (null = cash) to `to`, as a fraction of portfolio value: sum |dw_i| x rate_i. */
export function tradeCost(from: ArrayLike<number> | null, to: ArrayLike<number>, rates: ArrayLike<number>): number {
  let c = 0;
  for (let i = 0; i < to.length; i++) c += Math.abs(to[i] - (from ? from[i] : 0)) * rates[i];
  return c;
}

/** Turnover sum |w_new - w_old| (from cash: sum |w_new|). */
export function turnover(from: ArrayLike<number> | null, to: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < to.length; i++) s += Math.abs(to[i] - (from ? from[i] : 0));
  return s;
}
