import { defineEstimator } from '../define.js';

export const robust = defineEstimator({
  method: 'robust',
  label: 'Robust (M-estimator)',
  idPart: 'rob',
  options: (z) => z.strictObject({ method: z.literal('robust') }),
  initial: { method: 'robust' },
  describe: () => 'Robust (M-estimator)',
  memoWords: () => 'robust covariance',
  memoShort: () => 'robust',
  source: 'Tyler (1987), Annals of Statistics 15, with median centring and MAD scales (Hampel 1974, JASA 69)',
});
