import { defineEstimator } from '../define.js';

export const sample = defineEstimator({
  method: 'sample',
  label: 'Sample',
  idPart: 'sample',
  options: (z) => z.strictObject({ method: z.literal('sample') }),
  initial: { method: 'sample' },
  describe: () => 'Sample',
  memoWords: () => 'sample covariance',
  memoShort: () => 'sample',
  source: 'common practice: the unbiased sample covariance, divisor T - 1',
  formula: "S = 1/(T-1) sum_t (r_t - rbar)(r_t - rbar)', from the T returns r_t of the window and their mean rbar.",
  whenToUse:
    'Many more return periods than assets (T several times N) and a calm, stable history. It is singular when N >= T, and its extreme eigenvalues are too extreme when T is not much larger than N, which optimisers exploit: prefer a shrinkage estimator then.',
});
