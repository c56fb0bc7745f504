import { defineObjective } from '../define.js';

export const maxDiversification = defineObjective({
  method: 'max-diversification',
  label: 'Maximum diversification',
  idPart: 'maxdiv',
  options: (z) => z.strictObject({ method: z.literal('max-diversification') }),
  initial: { method: 'max-diversification' },
  describe: () => 'Maximum diversification',
  memoWords: () => 'maximum diversification',
  shadowPrice: { name: 'DR', unit: 'diversification ratio' },
  optimality: {
    rule: 'At the most diversified portfolio an asset held between its limits has a correlation with the portfolio equal to its threshold (1/DR when no limit binds; binding caps and bands move each asset\u2019s own); an asset left out has at least its threshold, one at its cap at most (Choueifaty, Froidure and Reynier 2013).',
    measure: 'Correlation with portfolio',
    threshold: 'Threshold',
  },
  source: 'Choueifaty and Coignard (2008), "Toward maximum diversification", J. Portfolio Management 35(1)',
  formula:
    "maximise DR(w) = w'sigma / sqrt(w' Sigma w), sigma the assets' volatilities; solved as one quadratic programme in y = k w: minimise y' Sigma y subject to sigma'y = 1 and every limit written homogeneously (Charnes and Cooper 1962).",
  whenToUse:
    'When the aim is to spread risk over independent sources without a view on returns. It tends to hold the least correlated assets and can leave out whole groups unless bands keep them in.',
});
