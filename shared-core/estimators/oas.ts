import type { EstimatorSpec } from '../scenario/estimator-spec.js';
import { diagnose } from './diagnostics.js';
import { centredScatter, checkReturns, sumOfSquares, trace } from './moments.js';
import { periodsPerYear } from './periods.js';
import type { Estimator } from './types.js';

/**
 * Oracle Approximating Shrinkage towards mu I (Chen, Wiesel, Eldar and Hero 2010, IEEE Trans.
 * Signal Processing 58(10)), in the arithmetic of scikit-learn's `oas` (1.2): with S the 1/T
 * covariance of de-meaned data, mu = trace(S)/N and alpha = mean(S o S),
 * delta = min(1, (alpha + mu^2) / ((T + 1)(alpha - mu^2 / N))).
 */
export const oasCovariance: Estimator<Extract<EstimatorSpec, { method: 'oas' }>> = (returns, _spec, context) => {
  checkReturns(returns, 2, 'oas');
  const t = returns.rows;
  const n = returns.cols;
  const s = centredScatter(returns, t, context).s;
  const mu = trace(s) / n;
  const alpha = sumOfSquares(s) / (n * n);
  const num = alpha + mu * mu;
  const den = (t + 1) * (alpha - (mu * mu) / n);
  const delta = n === 1 ? 0 : den === 0 ? 1 : Math.min(num / den, 1);
  for (let k = 0; k < s.data.length; k++) s.data[k] *= 1 - delta;
  for (let i = 0; i < n; i++) s.data[i * n + i] += delta * mu;
  return {
    method: 'oas',
    covariance: s,
    periodsPerYear: periodsPerYear(context),
    // With N >= T, S is rank-deficient and the smallest eigenvalue of the shrunk matrix is delta mu.
    diagnostics: diagnose(s, t, t, delta, {}, { knownSmallest: n >= t ? delta * mu : undefined, context }),
  };
};
