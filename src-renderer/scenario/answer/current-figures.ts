import { metricsFor } from '../../../shared-core/analytics/weights-metrics.js';
import type { CandidateMetrics } from '../../../shared-core/optimise/result.js';
import type { Comparison } from '../../worker/comparison.js';

export type CurrentFigures = { metrics: CandidateMetrics; basis: string } | { metrics: null; reason: string };

/**
 * The current weights' volatility, diversification ratio and the rest, under the estimate of
 * the recommended candidate (else the first solved one): the figures the memo prints beside the
 * recommendation, from the same function (metricsFor). The estimate's annualised covariance is
 * rebuilt from its volatilities and correlations, Σ = D R D.
 */
export function currentFigures(
  comparison: Comparison,
  current: Readonly<Record<string, number>> | undefined,
  recommended: string | undefined,
): CurrentFigures {
  if (!current || !Object.values(current).some((w) => w !== 0)) return { metrics: null, reason: 'no current weights' };
  const inScope = new Set(comparison.assets);
  const outside = Object.entries(current).filter(([a, w]) => w !== 0 && !inScope.has(a));
  if (outside.length > 0)
    return {
      metrics: null,
      reason: `${outside.map(([a]) => a).join(', ')} ${outside.length === 1 ? 'is' : 'are'} held but not among the chosen assets`,
    };
  const solved = comparison.candidates.filter((c) => c.status === 'optimal');
  const basisCandidate = solved.find((c) => c.id === recommended) ?? solved[0];
  if (!basisCandidate) return { metrics: null, reason: 'no candidate solved, so no estimate to measure them with' };
  const estimate = comparison.estimates.find((e) => e.key === comparison.estimateOf[basisCandidate.id]);
  if (!estimate) return { metrics: null, reason: 'no estimate' };
  const n = comparison.assets.length;
  const data = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++)
      data[i * n + j] = estimate.correlation[i * n + j] * estimate.volatilities[i] * estimate.volatilities[j];
  return {
    metrics: metricsFor(current, comparison.assets, { rows: n, cols: n, data }),
    basis: `under the ${estimate.label} estimate of ${basisCandidate.id}`,
  };
}
