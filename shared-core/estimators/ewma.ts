import { InputError } from '../errors.js';
import { crossProduct } from '../linalg/cross-product.js';
import { zeros } from '../linalg/matrix.js';
import type { EstimatorSpec } from '../scenario/estimator-spec.js';
import { diagnose } from './diagnostics.js';
import { checkReturns } from './moments.js';
import { periodsPerYear } from './periods.js';
import type { Frequency } from '../scenario/frequency.js';
import type { Estimator } from './types.js';

/**
 * Default decay by frequency: 0.94 for daily and 0.97 for monthly data (RiskMetrics Technical
 * Document, J.P. Morgan/Reuters 1996). The document gives no weekly value; Holdfast uses the
 * monthly one for weekly data (our choice).
 */
export const DEFAULT_LAMBDA: Record<Frequency, number> = { daily: 0.94, weekly: 0.97, monthly: 0.97 };

/** lambda with half-life h: lambda^h = 1/2. */
export function lambdaFromHalfLife(halfLife: number): number {
  return 0.5 ** (1 / halfLife);
}

/**
 * Exponentially weighted covariance with zero mean and normalised weights over the window:
 * S = sum_t w_t r_t r_t', w_t proportional to lambda^(T-t), sum w_t = 1. Computed as the cross
 * product of the rows scaled by sqrt(w_t).
 */
export const ewmaCovariance: Estimator<Extract<EstimatorSpec, { method: 'ewma' }>> = (returns, spec, context) => {
  checkReturns(returns, 2, 'ewma');
  if (spec.lambda !== undefined && spec.halfLife !== undefined)
    throw new InputError('ewma: give lambda or halfLife, not both', { path: 'estimator' });
  const lambda =
    spec.lambda ??
    (spec.halfLife !== undefined ? lambdaFromHalfLife(spec.halfLife) : DEFAULT_LAMBDA[context.frequency]);
  if (!(lambda > 0 && lambda < 1)) throw new InputError(`ewma: lambda ${lambda} is not in (0, 1)`, { path: 'lambda' });
  const { rows: t, cols: n, data } = returns;
  const weights = new Float64Array(t);
  let total = 0;
  for (let k = t - 1, w = 1; k >= 0; k--, w *= lambda) {
    weights[k] = w;
    total += w;
  }
  let squares = 0;
  const scaled = zeros(t, n);
  for (let k = 0; k < t; k++) {
    weights[k] /= total;
    squares += weights[k] * weights[k];
    const root = Math.sqrt(weights[k]);
    for (let i = 0; i < n; i++) scaled.data[k * n + i] = data[k * n + i] * root;
  }
  const covariance = crossProduct(scaled);
  return {
    method: 'ewma',
    covariance,
    periodsPerYear: periodsPerYear(context),
    diagnostics: diagnose(
      covariance,
      t,
      1 / squares,
      null,
      { lambda, halfLife: Math.log(0.5) / Math.log(lambda) },
      { singular: n > t, context },
    ),
  };
};
