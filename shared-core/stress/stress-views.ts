import type { Matrix } from '../linalg/matrix.js';
import type { PriceTable } from '../prices/price-table.js';
import type { StressSpec } from '../scenario/backtest-spec.js';
import { propagateShock, portfolioMove } from './conditional-shock.js';
import { replay, worstWindows, type HistoricalWindow } from './historical.js';
import { exposureOf, resolveTarget, type AssetSet } from './targets.js';

/** The stress table of a scenario: historical windows and shocks, for every candidate's weights. */
export interface StressCandidate {
  id: string;
  /** Weights in `assets` order. */
  weights: Float64Array;
  /** The candidate's covariance estimate (any horizon), in `assets` order. */
  covariance: Matrix;
}

export interface HistoricalStressRow extends HistoricalWindow {
  /** Candidate id -> portfolio return over the period replayed. */
  portfolioReturns: Record<string, number>;
}

export interface ShockStressRow {
  name: string;
  target: string;
  members: string[];
  shock: number;
  /** Candidate id -> its portfolio return and every asset's conditional move under its estimate. */
  byCandidate: Record<string, { portfolioReturn: number; assetMoves: Record<string, number> }>;
}

export interface StressViews {
  historical: HistoricalStressRow[];
  shocks: ShockStressRow[];
  method: string;
}

export const SHOCK_METHOD =
  "conditional expectation under the estimated covariance, E[r | g'r = s] = Sigma g s / (g' Sigma g) (Anderson 2003, Theorem 2.5.1)";

export function stressViews(input: {
  prices: PriceTable;
  assets: readonly string[];
  candidates: readonly StressCandidate[];
  /** Bases for the historical windows (the universe first, then groups and asset classes). */
  bases: readonly AssetSet[];
  /** Every targetable set (assets, groups, asset classes) for the user's shocks. */
  sets: readonly AssetSet[];
  spec?: StressSpec;
  returnsMethod: 'log' | 'simple';
}): StressViews {
  const { prices, assets, candidates } = input;
  const historical = worstWindows(prices, input.bases).map((w) => ({
    ...w,
    portfolioReturns: Object.fromEntries(
      candidates.map((c) => [c.id, replay(prices, assets, c.weights, w.from, w.to)]),
    ),
  }));
  const shocks = (input.spec?.shocks ?? []).map((s, k): ShockStressRow => {
    const set = resolveTarget(s.target, input.sets, `stress.shocks[${k}].target`);
    const g = exposureOf(set, assets);
    const byCandidate: ShockStressRow['byCandidate'] = {};
    for (const c of candidates) {
      const { assetMoves } = propagateShock(c.covariance, g, s.shock, input.returnsMethod);
      byCandidate[c.id] = {
        portfolioReturn: portfolioMove(c.weights, assetMoves),
        assetMoves: Object.fromEntries(assets.map((a, i) => [a, assetMoves[i]])),
      };
    }
    return { name: s.name, target: s.target, members: set.members, shock: s.shock, byCandidate };
  });
  return { historical, shocks, method: SHOCK_METHOD };
}
