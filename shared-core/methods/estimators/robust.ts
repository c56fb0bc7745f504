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
  formula:
    "Each asset centred at its median and scaled by its MAD; Tyler's shape V solves V = (N/T) sum_t z_t z_t' / (z_t' V^-1 z_t) with trace N; covariance = diag(MAD) corr(V) diag(MAD).",
  whenToUse:
    'Heavy tails, outliers or bad prints in the history: a few extreme periods cannot dominate. It needs more periods than assets.',
});
