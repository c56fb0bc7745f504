import { defineObjective } from '../define.js';

export const maxSharpe = defineObjective({
  method: 'max-sharpe',
  label: 'Maximum Sharpe ratio',
  idPart: 'ms',
  options: (z) => z.strictObject({ method: z.literal('max-sharpe') }),
  initial: { method: 'max-sharpe' },
  describe: () => 'Maximum Sharpe ratio',
  memoWords: () => 'maximum Sharpe ratio',
  shadowPrice: { name: 'the Sharpe ratio', unit: 'Sharpe ratio' },
  optimality: {
    rule: 'At the highest Sharpe ratio an asset held between its limits earns exactly the expected return its beta to the portfolio asks; one left out earns at most that.',
    measure: 'Expected return',
    threshold: 'Asked by its beta',
    percentDigits: 2,
  },
  source:
    'Sharpe (1966), "Mutual fund performance", J. Business 39; the tangency portfolio of Tobin (1958), Review of Economic Studies 25',
});
