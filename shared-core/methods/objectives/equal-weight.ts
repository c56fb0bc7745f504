import { defineObjective } from '../define.js';

export const equalWeight = defineObjective({
  method: 'equal-weight',
  label: 'Equal weight',
  idPart: 'equal',
  options: (z) => z.strictObject({ method: z.literal('equal-weight') }),
  initial: { method: 'equal-weight' },
  describe: () => 'Equal weight',
  memoWords: () => 'equal weights',
  shadowPrice: {
    name: 'the distance from the equal weights',
    unit: 'distance from the equal weights (square root of the summed squared weight differences)',
  },
  source:
    'common practice: weight 1 / N each (DeMiguel, Garlappi and Uppal 2009, Review of Financial Studies 22, as a benchmark)',
  formula: 'w_i = 1 / N; where that breaks a limit, the nearest weights (least squares) that meet every limit.',
  whenToUse:
    'The benchmark any optimised candidate should beat out of sample (DeMiguel, Garlappi and Uppal 2009); needs no estimate at all.',
});
