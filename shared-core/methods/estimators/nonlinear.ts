import { defineEstimator } from '../define.js';

export const nonlinear = defineEstimator({
  method: 'nonlinear',
  label: 'Nonlinear shrinkage',
  idPart: 'nls',
  options: (z) => z.strictObject({ method: z.literal('nonlinear') }),
  initial: { method: 'nonlinear' },
  describe: () => 'Nonlinear shrinkage',
  memoWords: () => 'analytical nonlinear shrinkage of the eigenvalues (Ledoit and Wolf 2020)',
  memoShort: () => 'nonlinear shrinkage',
  source: 'Ledoit and Wolf (2020), Annals of Statistics 48',
  formula:
    'Keeps the sample eigenvectors and replaces each sample eigenvalue lambda_i by d_i = lambda_i / ((pi c lambda_i f(lambda_i))^2 + (1 - c - pi c lambda_i Hf(lambda_i))^2), c = N/(T-1), f a kernel estimate of the eigenvalue density and Hf its Hilbert transform.',
  whenToUse:
    'Large universes against the window (N a sizeable fraction of T, or larger), where one shrinkage intensity for all eigenvalues is too crude. It needs at least three periods and is the most data-hungry to explain to a client.',
});
