import { defineObjective } from '../define.js';

export const minVariance = defineObjective({
  method: 'min-variance',
  label: 'Minimum variance',
  idPart: 'minvar',
  options: (z) => z.strictObject({ method: z.literal('min-variance') }),
  initial: { method: 'min-variance' },
  describe: () => 'Minimum variance',
  memoWords: () => 'minimum variance',
  shadowPrice: { name: 'volatility', unit: 'annualised volatility' },
  optimality: {
    rule: 'At the minimum-variance portfolio an asset held between its limits has a beta to the portfolio equal to its threshold (1 when no limit binds); an asset left out has at least its threshold, one at its cap at most.',
    measure: 'Beta to portfolio',
    threshold: 'Threshold',
  },
  source: 'Markowitz (1952), "Portfolio selection", J. Finance 7: the minimum-variance portfolio',
  formula: "minimise w' Sigma w subject to the limits (unconstrained, w proportional to Sigma^-1 1).",
  whenToUse:
    'When the lowest volatility within the mandate is the aim. It concentrates in the lowest-volatility assets (short bonds, money market) unless caps and bands spread it.',
});
