/**
 * Drift of current holdings from a target allocation: the sum of |current - target| over every
 * asset either side names (twice the one-way turnover a rebalance to the target would need), and
 * the largest single gap. Common practice among advisors, no single source (domain notes).
 */
export interface Drift {
  /** Sum over assets of |current - target|, as a share of the portfolio. */
  total: number;
  /** The asset with the largest |current - target|, signed current - target; null when both are empty. */
  largest: { asset: string; gap: number } | null;
}

export function driftFrom(current: Readonly<Record<string, number>>, target: Readonly<Record<string, number>>): Drift {
  const assets = [...new Set([...Object.keys(target), ...Object.keys(current)])].sort();
  let total = 0;
  let largest: Drift['largest'] = null;
  for (const asset of assets) {
    const gap = (current[asset] ?? 0) - (target[asset] ?? 0);
    total += Math.abs(gap);
    if (largest === null || Math.abs(gap) > Math.abs(largest.gap)) largest = { asset, gap };
  }
  return { total, largest: largest && largest.gap !== 0 ? largest : null };
}
