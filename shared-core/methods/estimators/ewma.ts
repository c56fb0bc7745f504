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
});
