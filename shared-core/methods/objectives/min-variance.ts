import { defineObjective } from '../define.js';

export const minVariance = defineObjective({
  method: 'min-variance',
  label: 'Minimum variance',
  idPart: 'mv',
  options: (z) => z.strictObject({ method: z.literal('min-variance') }),
  initial: { method: 'min-variance' },
  describe: () => 'Minimum variance',
  memoWords: () => 'minimum variance',
  shadowPrice: { name: 'volatility', unit: 'annualised volatility' },
  source: 'Markowitz (1952), "Portfolio selection", J. Finance 7: the minimum-variance portfolio',
});
