import type { Matrix } from '../linalg/matrix.js';
import {
  diversificationRatio,
  effectiveBets,
  effectiveHoldings,
  portfolioVolatility,
  riskContributions,
} from './risk.js';

/**
 * The figures of given weights under an annualised covariance (in `assets` order): what the
 * memo prints for the current holdings and the comparison's current column shows, from one
 * function. Turnover is 0: the weights are the reference themselves.
 */
/** The shape of a solved candidate's metrics (optimise/result.ts `CandidateMetrics`). */
export interface WeightsMetrics {
  volatility: number;
  diversificationRatio: number;
  effectiveBets: number;
  effectiveHoldings: number;
  riskContributions: Record<string, number>;
  turnover: number;
}

export function metricsFor(
  weights: Readonly<Record<string, number>>,
  assets: readonly string[],
  covariance: Matrix,
): WeightsMetrics {
  const w = Float64Array.from(assets, (a) => weights[a] ?? 0);
  const rc = riskContributions(w, covariance);
  return {
    volatility: portfolioVolatility(w, covariance),
    diversificationRatio: diversificationRatio(w, covariance),
    effectiveBets: effectiveBets(w, covariance),
    effectiveHoldings: effectiveHoldings(w),
    riskContributions: Object.fromEntries(assets.map((a, i) => [a, rc[i]])),
    turnover: 0,
  };
}
