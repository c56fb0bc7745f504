import { diversificationRatio, portfolioVolatility } from '../analytics/risk.js';
import { annualised, estimateCovariance } from '../estimators/registry.js';
import { solveCandidateDetailed } from '../optimise/solve-candidate.js';
import type { QpWarmStart } from '../optimise/qp/types.js';
import type { Constraints } from '../scenario/schema.js';
import type { EstimateAndSolveFn, SolveOutcome } from './run-backtest.js';

/**
 * The real allocator of the walk-forward: estimate the candidate's covariance on the window
 * (estimators/registry), annualise it, and solve the candidate under the scenario's constraints
 * with the candidate's overrides (optimise/solve-candidate), warm-started from the previous
 * rebalance's active set. Turnover limits are measured against the drifted weights handed in as
 * `current`; coming from cash there is nothing to measure against, so a turnover limit is left
 * out of that first solve.
 */
export const estimateAndSolve: EstimateAndSolveFn = (request): SolveOutcome => {
  const { candidate, scenario, assets, returns, periodsPerYear, current } = request;
  const estimate = estimateCovariance(returns, candidate.estimator, {
    frequency: scenario.returns.frequency,
    periodsPerYear,
  });
  const covariance = annualised(estimate);
  const merged: Constraints = { ...scenario.constraints, ...candidate.constraints };
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
    ...(request.previous ? { warmStart: request.previous as QpWarmStart } : {}),
  });
  const weights = Float64Array.from(assets, (a) => result.weights[a] ?? 0);
  const ok = result.status === 'optimal';
  return {
    status: result.status,
    ...(result.message !== undefined ? { message: result.message } : {}),
    weights,
    covariance,
    forecastVolatility: ok ? portfolioVolatility(weights, covariance) : NaN,
    forecastDiversificationRatio: ok ? diversificationRatio(weights, covariance) : NaN,
    ...(warmStart ? { state: warmStart } : {}),
  };
};
