import type { EstimatorSpec } from '../scenario/estimator-spec.js';
import { diagnose } from './diagnostics.js';
import { centredScatter, checkReturns } from './moments.js';
import { periodsPerYear } from './periods.js';
import type { Estimator } from './types.js';

/** The unbiased sample covariance, divisor T - 1. Of rank at most T - 1, so singular when N >= T. */
export const sampleCovariance: Estimator<Extract<EstimatorSpec, { method: 'sample' }>> = (returns, _spec, context) => {
  checkReturns(returns, 2, 'sample');
  const t = returns.rows;
  const covariance = centredScatter(returns, t - 1, context).s;
  return {
    method: 'sample',
    covariance,
    periodsPerYear: periodsPerYear(context),
    diagnostics: diagnose(covariance, t, t, null, {}, { singular: returns.cols >= t, context }),
  };
};
