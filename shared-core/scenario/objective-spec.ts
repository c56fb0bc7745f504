import { z } from 'zod';

/** Objective methods keep the published methods' usual names. */
export const objectiveMethods = [
  'max-diversification',
  'min-variance',
  'equal-risk-contribution',
  'max-decorrelation',
  'max-sharpe',
  'inverse-volatility',
  'equal-weight',
] as const;
export type ObjectiveMethod = (typeof objectiveMethods)[number];

export const objectiveSpecSchema = z.discriminatedUnion('method', [
  z.strictObject({ method: z.literal('max-diversification') }),
  z.strictObject({ method: z.literal('min-variance') }),
  z.strictObject({
    method: z.literal('equal-risk-contribution'),
    /** Risk budgets per asset id (normalised to sum 1); equal budgets when absent. */
    budgets: z.record(z.string(), z.number().positive()).optional(),
  }),
  z.strictObject({ method: z.literal('max-decorrelation') }),
  z.strictObject({ method: z.literal('max-sharpe') }),
  z.strictObject({ method: z.literal('inverse-volatility') }),
  z.strictObject({ method: z.literal('equal-weight') }),
]);
export type ObjectiveSpec = z.infer<typeof objectiveSpecSchema>;
