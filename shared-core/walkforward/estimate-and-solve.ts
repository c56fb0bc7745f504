import { diversificationRatio, portfolioVolatility } from '../analytics/risk.js';
import { annualised, estimateCovariance } from '../estimators/registry.js';
import type { CovarianceEstimate } from '../estimators/types.js';
import type { Frequency } from '../scenario/frequency.js';
import type { Matrix } from '../linalg/matrix.js';
import type { EstimatorSpec } from '../scenario/estimator-spec.js';
import { isSolved } from '../optimise/result.js';
import { solveCandidateDetailed } from '../optimise/solve-candidate.js';
import type { QpWarmStart } from '../optimise/qp/index.js';
import { mergedConstraints } from '../scenario/merged-constraints.js';
import type { Constraints } from '../scenario/schema.js';
import type { EstimateAndSolveFn, SolveOutcome } from './run-backtest.js';

/**
 * Estimates per return window and estimator: candidates that share an estimator (maximum
 * diversification and ERC on the same Ledoit-Wolf estimate) estimate once per rebalance. Keyed
 * by the window matrix itself, which the backtest runner shares across candidates; entries go
 * when the window does.
 */
const estimates = new WeakMap<Matrix, Map<string, { estimate: CovarianceEstimate; covariance: Matrix }>>();

function estimated(returns: Matrix, spec: EstimatorSpec, frequency: Frequency, periodsPerYear: number) {
  let byKey = estimates.get(returns);
  if (!byKey) estimates.set(returns, (byKey = new Map()));
  const key = `${JSON.stringify(spec)}|${frequency}|${periodsPerYear}`;
  let hit = byKey.get(key);
  if (!hit) {
    const estimate = estimateCovariance(returns, spec, { frequency, periodsPerYear });
    byKey.set(key, (hit = { estimate, covariance: annualised(estimate) }));
  }
  return hit;
}

/**
 * The real allocator of the walk-forward: estimate the candidate's covariance on the window
 * (estimators/registry), annualise it, and solve the candidate (optimise/solve-candidate) under
 * its mandate: the scenario's constraints with the candidate's own, merged as the comparison
 * merges them (scenario/merged-constraints). Warm-started from the previous rebalance's active set. Turnover limits are measured against the drifted weights handed in as
 * `current`; coming from cash there is nothing to measure against, so a turnover limit is left
 * out of that first solve.
 */
export const estimateAndSolve: EstimateAndSolveFn = (request): SolveOutcome => {
  const { candidate, scenario, assets, returns, periodsPerYear, current } = request;
  const { estimate, covariance } = estimated(returns, candidate.estimator, scenario.returns.frequency, periodsPerYear);
  const merged: Constraints = { ...mergedConstraints(scenario.constraints, candidate.constraints) };
  if (current === null) delete merged.maxTurnover;
  const { result, warmStart } = solveCandidateDetailed({
    id: candidate.id,
    assets,
    covariance,
    objective: candidate.objective,
    constraints: merged,
    ...(current ? { current: Object.fromEntries(assets.map((a, i) => [a, current[i]])) } : {}),
    ...(scenario.expectedReturns ? { expectedReturns: scenario.expectedReturns } : {}),
    ...(scenario.assetInfo ? { assetInfo: scenario.assetInfo } : {}),
    conditionNumber: estimate.diagnostics.conditionNumber,
    observations: estimate.diagnostics.observations,
    estimator: candidate.estimator.method,
    detail: 'weights',
    ...(request.previous ? { warmStart: request.previous as QpWarmStart } : {}),
  });
  const weights = Float64Array.from(assets, (a) => (isSolved(result) ? result.weights[a] : undefined) ?? 0);
  const ok = result.status === 'optimal';
  return {
    status: result.status,
    ...(result.status !== 'optimal' ? { message: result.message } : {}),
    weights,
    covariance,
    forecastVolatility: ok ? portfolioVolatility(weights, covariance) : NaN,
    forecastDiversificationRatio: ok ? diversificationRatio(weights, covariance) : NaN,
    ...(warmStart ? { state: warmStart } : {}),
  };
};
