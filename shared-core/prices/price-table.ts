/**
 * A wide table of closing prices: the in-memory form every part of Holdfast hands around
 * (parsed from a price file, read from the store, fed to the returns engine and walk-forward).
 */
export interface PriceTable {
  /** Ascending ISO dates `YYYY-MM-DD`, no repeats. */
  readonly dates: readonly string[];
  /** Asset ids in file (or universe) order. */
  readonly assets: readonly string[];
  /** One column per asset, aligned with `dates`; NaN where the asset has no price that day. */
  readonly closes: readonly Float64Array[];
  /** Currency of each asset's prices (ISO 4217), where known; same order as `assets`. */
  readonly currencies?: readonly (string | undefined)[];
}

/** The column of one asset, or undefined when the table lacks it. */
export function column(table: PriceTable, asset: string): Float64Array | undefined {
  const i = table.assets.indexOf(asset);
  return i === -1 ? undefined : table.closes[i];
}
