import type { Matrix } from '../linalg/matrix.js';
import {
  diversificationRatio,
  effectiveBets,
  effectiveHoldings,
  portfolioVolatility,
  riskContributions,
} from './risk.js';

/**
 * The figures of a portfolio under an annualised covariance: a solved candidate's
 * (optimise/result.ts), the current holdings' in the memo and in the comparison's current column.
 */
export interface CandidateMetrics {
  /** Annualised volatility. */
  volatility: number;
  diversificationRatio: number;
  effectiveBets: number;
  effectiveHoldings: number;
  /** Euler risk contributions, summing to 1. */
  riskContributions: Record<string, number>;
  /** Sum of |w - current|; 0 without current holdings. */
  turnover: number;
}

/**
 * The figures of weights `w` in `assets` order, with the turnover already known. `effectiveBets`
 * may be given instead of computed (NaN when the caller fills it in later from a spectrum it
 * already holds).
 */
export function metricsOfWeights(
  w: Float64Array,
  assets: readonly string[],
  covariance: Matrix,
  known: { turnover: number; effectiveBets?: number },
): CandidateMetrics {
  const rc = riskContributions(w, covariance);
  return {
    volatility: portfolioVolatility(w, covariance),
    diversificationRatio: diversificationRatio(w, covariance),
    effectiveBets: known.effectiveBets ?? effectiveBets(w, covariance),
    effectiveHoldings: effectiveHoldings(w),
    riskContributions: Object.fromEntries(assets.map((a, i) => [a, rc[i]])),
    turnover: known.turnover,
  };
}

/**
 * The figures of given weights (by asset) under an annualised covariance in `assets` order, from
 * one function. Turnover is 0: the weights are the reference themselves.
 */
export function metricsFor(
  weights: Readonly<Record<string, number>>,
  assets: readonly string[],
  covariance: Matrix,
): CandidateMetrics {
  return metricsOfWeights(
    Float64Array.from(assets, (a) => weights[a] ?? 0),
    assets,
    covariance,
    { turnover: 0 },
  );
}
