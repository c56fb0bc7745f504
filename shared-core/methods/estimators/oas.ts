import { defineEstimator } from '../define.js';

export const oas = defineEstimator({
  method: 'oas',
  label: 'Oracle approximating shrinkage',
  idPart: 'oas',
  options: (z) => z.strictObject({ method: z.literal('oas') }),
  initial: { method: 'oas' },
  describe: () => 'Oracle approximating shrinkage',
  memoWords: () => 'oracle approximating shrinkage (OAS)',
  memoShort: () => 'OAS',
  source: 'Chen, Wiesel, Eldar and Hero (2010), IEEE Trans. Signal Processing 58(10)',
  formula:
    'Sigma = delta mu I + (1 - delta) S, S the 1/T covariance of de-meaned returns, mu = trace(S)/N, delta = min(1, (alpha + mu^2) / ((T + 1)(alpha - mu^2/N))), alpha the mean of the squared entries of S.',
  whenToUse:
    'Like Ledoit-Wolf towards a scaled identity, with an intensity derived for Gaussian returns that is often better when the window is very short against the number of assets.',
});
