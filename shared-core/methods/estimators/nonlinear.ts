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
});
