import { defineEstimator } from '../define.js';

export const denoised = defineEstimator({
  method: 'denoised',
  label: 'Denoised (eigenvalue clipping)',
  idPart: 'dn',
  options: (z) => z.strictObject({ method: z.literal('denoised') }),
  initial: { method: 'denoised' },
  describe: () => 'Denoised (eigenvalue clipping)',
  memoWords: () => 'random-matrix denoised covariance',
  memoShort: () => 'denoised',
  source: 'Laloux, Cizeau, Bouchaud and Potters (1999), Phys. Rev. Letters 83',
});
