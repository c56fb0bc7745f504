import { symmetricEigen } from '../linalg/symmetric-eigen.js';
import type { EstimatorSpec } from '../scenario/estimator-spec.js';
import { diagnose } from './diagnostics.js';
import { centredScatter, checkReturns, checkVariances } from './moments.js';
import { periodsPerYear } from './periods.js';
import type { Estimator } from './types.js';

/**
 * Random-matrix denoising of the sample correlation (Laloux, Cizeau, Bouchaud and Potters 1999,
 * "Noise dressing of financial correlation matrices", Phys. Rev. Letters 83): eigenvalues below
 * the Marchenko-Pastur upper edge (1 + sqrt(N/T))^2 of a unit-variance correlation matrix are
 * noise; they are replaced by their mean, which keeps the trace. The unit diagonal is then
 * restored (common practice) and the result rescaled by the sample standard deviations, so
 * every asset keeps its sample variance.
 */
export const denoisedCovariance: Estimator<Extract<EstimatorSpec, { method: 'denoised' }>> = (
  returns,
  _spec,
  context,
) => {
  checkReturns(returns, 2, 'denoised');
  const t = returns.rows;
  const n = returns.cols;
  const s = centredScatter(returns, t - 1, context).s;
  const sd = checkVariances(s, 'denoised').map(Math.sqrt);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s.data[i * n + j] /= sd[i] * sd[j];
  const { values, vectors } = symmetricEigen(s);
  const edge = (1 + Math.sqrt(n / t)) ** 2;
  let clipped = 0;
  let noise = 0;
  for (const v of values)
    if (v < edge) {
      clipped++;
      noise += v;
    }
  const lambda = values.map((v) => (v < edge ? noise / clipped : v));
  // C = V diag(lambda) V', built in place of the correlation matrix.
  const c = s;
  const e = vectors.data;
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      let sum = 0;
      for (let k = 0; k < n; k++) sum += e[i * n + k] * lambda[k] * e[j * n + k];
      c.data[i * n + j] = c.data[j * n + i] = sum;
    }
  const diag = Float64Array.from({ length: n }, (_, i) => Math.sqrt(c.data[i * n + i]));
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) c.data[i * n + j] *= (sd[i] * sd[j]) / (diag[i] * diag[j]);
  return {
    method: 'denoised',
    covariance: c,
    periodsPerYear: periodsPerYear(context),
    diagnostics: diagnose(c, t, t, null, { eigenvaluesClipped: clipped, marchenkoPasturEdge: edge }, { context }),
  };
};
