import type { Frequency } from '../scenario/frequency.js';
import type { PriceTable } from '../prices/price-table.js';
import { coarser, dayNumber, pricingFrequency } from './calendar.js';

/**
 * The return frequency a set of assets can be estimated at: the coarsest of their own pricing
 * frequencies (the rule `buildReturns` applies when it refuses a finer one), and the assets that
 * set it. A new scenario starts there, and the editor offers it as the one change that makes the
 * scenario computable when an asset priced monthly meets daily returns.
 */
export interface CoarsestPricing {
  frequency: Frequency;
  /** The assets priced at `frequency` when it is coarser than daily; empty for daily. */
  assets: string[];
}

export function coarsestPricing(
  table: PriceTable,
  assets: readonly string[],
  window: { from?: string; to?: string } = {},
): CoarsestPricing {
  let frequency: Frequency = 'daily';
  const by = new Map<string, Frequency>();
  for (const asset of assets) {
    const column = table.closes[table.assets.indexOf(asset)];
    if (!column) continue;
    const days: number[] = [];
    table.dates.forEach((date, t) => {
      if (!Number.isFinite(column[t])) return;
      if (window.from !== undefined && date < window.from) return;
      if (window.to !== undefined && date > window.to) return;
      days.push(dayNumber(date));
    });
    const own = pricingFrequency(days).frequency;
    by.set(asset, own);
    frequency = coarser(frequency, own);
  }
  return {
    frequency,
    assets: frequency === 'daily' ? [] : [...by].filter(([, f]) => f === frequency).map(([a]) => a),
  };
}
