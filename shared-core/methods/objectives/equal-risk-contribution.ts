import { defineObjective } from '../define.js';

const label = 'Equal risk contribution';

export const equalRiskContribution = defineObjective({
  method: 'equal-risk-contribution',
  label,
  idPart: 'erc',
  options: (z) =>
    z.strictObject({
      method: z.literal('equal-risk-contribution'),
      /** Risk budgets per asset id (normalised to sum 1); equal budgets when absent. */
      budgets: z.record(z.string(), z.number().positive()).optional(),
    }),
  initial: { method: 'equal-risk-contribution' },
  describe: (spec) => (spec.budgets ? `${label}, own budgets` : label),
  memoWords: (spec) => (spec.budgets ? 'risk budgets (set by the advisor)' : 'equal risk contribution'),
  // The risk-budgeting objective itself means nothing to a client: its limits are priced by what
  // they do to the largest gap between an asset's share of risk and its budget.
  shadowPrice: {
    name: 'the largest gap between a risk contribution and its budget',
    unit: 'largest gap between a risk contribution and its budget (share of risk)',
  },
  optimality: {
    rule: 'Each asset\u2019s share of the portfolio\u2019s risk is set to its budget unless a limit holds it elsewhere.',
    measure: 'Share of risk',
    threshold: 'Budget',
    percentDigits: 1,
  },
  source:
    'Maillard, Roncalli and Teiletche (2010), J. Portfolio Management 36(4); solved as in Spinu (2013), SSRN "An algorithm for computing risk parity weights"',
  formula:
    "w_i (Sigma w)_i / (w' Sigma w) = b_i for every asset, budgets b summing to 1 (equal when absent); solved from y = argmin 1/2 y' Sigma y - sum_i b_i ln y_i, w = y / sum y.",
  whenToUse:
    'When every asset (or each budgeted asset) should carry its share of risk; volatility lies between minimum variance and equal weight. Every asset is held, so it does not prune a universe.',
});
