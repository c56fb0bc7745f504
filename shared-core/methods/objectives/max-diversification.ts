import { defineObjective } from '../define.js';

export const maxDiversification = defineObjective({
  method: 'max-diversification',
  label: 'Maximum diversification',
  idPart: 'md',
  options: (z) => z.strictObject({ method: z.literal('max-diversification') }),
  initial: { method: 'max-diversification' },
  describe: () => 'Maximum diversification',
  memoWords: () => 'maximum diversification',
  shadowPrice: { name: 'DR', unit: 'diversification ratio' },
  source: 'Choueifaty and Coignard (2008), "Toward maximum diversification", J. Portfolio Management 35(1)',
});
