import { defineObjective } from '../define.js';

export const inverseVolatility = defineObjective({
  method: 'inverse-volatility',
  label: 'Inverse volatility',
  idPart: 'invvol',
  options: (z) => z.strictObject({ method: z.literal('inverse-volatility') }),
  initial: { method: 'inverse-volatility' },
  describe: () => 'Inverse volatility',
  memoWords: () => 'inverse volatility',
  shadowPrice: {
    name: 'the distance from the inverse-volatility weights',
    unit: 'distance from the inverse-volatility weights (square root of the summed squared weight differences)',
  },
  source: 'common practice: weights proportional to 1 / volatility',
  formula:
    'w_i proportional to 1 / sigma_i; where that breaks a limit, the nearest weights (least squares) that meet every limit.',
  whenToUse: 'A simple, transparent rule that ignores correlations; a benchmark beside the optimised candidates.',
});
