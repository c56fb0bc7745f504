import { defineObjective } from '../define.js';

export const maxDecorrelation = defineObjective({
  method: 'max-decorrelation',
  label: 'Maximum decorrelation',
  idPart: 'maxdecor',
  options: (z) => z.strictObject({ method: z.literal('max-decorrelation') }),
  initial: { method: 'max-decorrelation' },
  describe: () => 'Maximum decorrelation',
  memoWords: () => 'maximum decorrelation',
  shadowPrice: {
    name: 'the volatility from correlations alone',
    unit: 'volatility from correlations alone (every asset at the same volatility, as a share of it)',
  },
  optimality: {
    rule: 'At the most decorrelated portfolio an asset held between its limits has a beta to the portfolio, measured on the correlation matrix, equal to its threshold (1 when no limit binds); an asset left out has at least its threshold.',
    measure: 'Beta on correlations',
    threshold: 'Threshold',
  },
  source: 'Christoffersen, Errunza, Jacobs and Jin (2012), Review of Financial Studies 25',
  formula: "minimise w' C w, C the correlation matrix: minimum variance as if every asset had the same volatility.",
  whenToUse:
    'When correlations are trusted more than volatilities, or assets of very different volatility should not be ranked by it.',
});
