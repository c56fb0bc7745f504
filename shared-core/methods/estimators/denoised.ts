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
  formula:
    "Eigenvalues of the sample correlation matrix below the Marchenko-Pastur edge (1 + sqrt(N/T))^2 are replaced by their mean (trace kept), the unit diagonal restored, and the result rescaled by each asset's sample standard deviation.",
  whenToUse:
    'Many assets against the window, when most correlation structure below a few market factors is noise. Each asset keeps its sample variance; only the correlations are cleaned.',
});
