import type { Matrix } from '../linalg/matrix.js';
import type { CandidateMetrics } from '../optimise/result.js';
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
export function metricsFor(
  weights: Readonly<Record<string, number>>,
  assets: readonly string[],
  covariance: Matrix,
): CandidateMetrics {
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
