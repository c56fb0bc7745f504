import { defineEstimator } from '../define.js';

export const oas = defineEstimator({
  method: 'oas',
  label: 'Oracle approximating shrinkage',
  idPart: 'oas',
  options: (z) => z.strictObject({ method: z.literal('oas') }),
  initial: { method: 'oas' },
  describe: () => 'Oracle approximating shrinkage',
  memoWords: () => 'oracle approximating shrinkage (OAS)',
  memoShort: () => 'OAS',
  source: 'Chen, Wiesel, Eldar and Hero (2010), IEEE Trans. Signal Processing 58(10)',
});
