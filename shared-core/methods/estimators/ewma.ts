import { defineEstimator } from '../define.js';

const label = 'Exponentially weighted';

export const ewma = defineEstimator({
  method: 'ewma',
  label,
  idPart: 'ewma',
  // The decay lambda in (0, 1), or the half-life in periods that gives it (lambda^h = 1/2).
  options: (z) =>
    z
      .strictObject({
        method: z.literal('ewma'),
        lambda: z.number().gt(0).lt(1).optional(),
        halfLife: z.number().positive().optional(),
      })
      .refine((e) => e.lambda === undefined || e.halfLife === undefined, {
        message: 'give lambda or halfLife, not both',
      }),
  initial: { method: 'ewma', lambda: 0.97 },
  describe: (spec) =>
    spec.halfLife !== undefined
      ? `${label}, half-life ${spec.halfLife}`
      : spec.lambda !== undefined
        ? `${label}, lambda ${spec.lambda}`
        : label,
  memoWords: (spec) =>
    spec.halfLife !== undefined
      ? `exponentially weighted (half-life ${spec.halfLife} periods)`
      : spec.lambda !== undefined
        ? `exponentially weighted (lambda ${spec.lambda})`
        : 'exponentially weighted (default lambda)',
  memoShort: (spec) =>
    spec.halfLife !== undefined
      ? `EWMA, half-life ${spec.halfLife}`
      : spec.lambda !== undefined
        ? `EWMA, lambda ${spec.lambda}`
        : 'EWMA',
  source: 'RiskMetrics Technical Document (J.P. Morgan/Reuters, 1996)',
  formula:
    "S = sum_t w_t r_t r_t', zero mean, w_t proportional to lambda^(T-t) and summing to 1; lambda from the half-life h by lambda^h = 1/2. Default lambda 0.94 for daily returns, 0.97 for weekly and monthly.",
  whenToUse:
    'When recent periods should count more than old ones, for instance after a change of regime. A short half-life follows the market quickly but is noisy and raises turnover; it needs enough periods for the weights it gives (about three half-lives at least).',
});
