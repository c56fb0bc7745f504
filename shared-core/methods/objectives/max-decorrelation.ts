import { defineObjective } from '../define.js';

export const maxDecorrelation = defineObjective({
  method: 'max-decorrelation',
  label: 'Maximum decorrelation',
  idPart: 'mdc',
  options: (z) => z.strictObject({ method: z.literal('max-decorrelation') }),
  initial: { method: 'max-decorrelation' },
  describe: () => 'Maximum decorrelation',
  memoWords: () => 'maximum decorrelation',
  shadowPrice: {
    name: 'the volatility from correlations alone',
    unit: 'volatility from correlations alone (every asset at the same volatility, as a share of it)',
  },
  source: 'Christoffersen, Errunza, Jacobs and Jin (2012), Review of Financial Studies 25',
});
