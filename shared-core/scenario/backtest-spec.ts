import { z } from 'zod';
import { isoDate } from './iso-date.js';

/** Walk-forward settings of a scenario (`holdfast backtest`). */
export const rebalanceSchedules = ['monthly', 'quarterly', 'yearly', 'drift'] as const;

export const backtestSpecSchema = z.strictObject({
  /** Trailing estimation window, in return periods. */
  estimationWindow: z.number().int().min(3).default(250),
  expanding: z.boolean().default(false),
  rebalance: z.enum(rebalanceSchedules).default('monthly'),
  /** For `drift`: rebalance when any weight leaves target +/- this band. */
  driftBand: z.number().positive().max(1).default(0.05),
  /** One figure in basis points of traded value, or one per asset class (`default` for the rest). */
  costBps: z.union([z.number().min(0), z.record(z.string(), z.number().min(0))]).default(10),
  /** Annual cash rate for the Sharpe ratio. */
  cashRate: z.number().default(0),
  from: isoDate.optional(),
});
export type BacktestSpec = z.infer<typeof backtestSpecSchema>;

/** User-defined stress shocks saved with the scenario: a return shock to one asset or group. */
export const stressSpecSchema = z.strictObject({
  shocks: z
    .array(
      z.strictObject({
        name: z.string().min(1),
        /** An asset id or a group name of the scenario's constraints. */
        target: z.string().min(1),
        shock: z.number().gt(-1),
      }),
    )
    .default([]),
});
export type StressSpec = z.infer<typeof stressSpecSchema>;
