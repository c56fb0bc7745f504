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
});
