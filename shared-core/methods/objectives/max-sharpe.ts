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
  source:
    'Sharpe (1966), "Mutual fund performance", J. Business 39; the tangency portfolio of Tobin (1958), Review of Economic Studies 25',
});
