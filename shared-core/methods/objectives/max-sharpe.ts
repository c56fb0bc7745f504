import { defineObjective } from '../define.js';

const label = 'Maximum Sharpe ratio';

export const maxSharpe = defineObjective({
  method: 'max-sharpe',
  label,
  idPart: 'maxsharpe',
  // The scenario's expectedReturns over the risk-free rate, both annualised: the portfolio
  // maximises (w'mu - rf) / sqrt(w'Sigma w). Without a rate it is 0.
  options: (z) =>
    z.strictObject({
      method: z.literal('max-sharpe'),
      /** Annualised, as a fraction (0.02 for 2 %), like the expected returns. */
      riskFreeRate: z.number().gt(-1).lt(1).optional(),
    }),
  initial: { method: 'max-sharpe' },
  describe: (spec, { percent }) =>
    spec.riskFreeRate !== undefined ? `${label}, risk-free rate ${percent(spec.riskFreeRate)}` : label,
  memoWords: (spec, { percent }) =>
    spec.riskFreeRate !== undefined
      ? `maximum Sharpe ratio (risk-free rate ${percent(spec.riskFreeRate)})`
      : 'maximum Sharpe ratio',
  shadowPrice: { name: 'the Sharpe ratio', unit: 'Sharpe ratio' },
  optimality: {
    rule: 'At the highest Sharpe ratio an asset held between its limits earns exactly the expected return its beta to the portfolio asks; one left out earns at most that.',
    measure: 'Expected return',
    threshold: 'Asked by its beta',
    percentDigits: 2,
  },
  source:
    'Sharpe (1966), "Mutual fund performance", J. Business 39; the tangency portfolio of Tobin (1958), Review of Economic Studies 25',
  formula:
    "maximise (w' mu - rf) / sqrt(w' Sigma w), mu the scenario's annualised expectedReturns and rf the risk-free rate (0 when absent).",
  whenToUse:
    "Only with expected returns the adviser can defend: the weights follow small changes in mu closely. Every asset needs an entry in the scenario's expectedReturns, or the candidate fails with a message naming the missing ones.",
});
