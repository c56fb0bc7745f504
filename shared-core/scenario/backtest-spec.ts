import { z } from 'zod';
import type { Frequency } from './frequency.js';
import { isoDate } from './iso-date.js';

/** Walk-forward settings of a scenario (`holdfast backtest`). */
export const rebalanceSchedules = ['monthly', 'quarterly', 'yearly', 'drift'] as const;

export const backtestSpecSchema = z.strictObject({
  /**
   * Trailing estimation window, in return periods. Absent: what the history allows
   * (`defaultEstimationWindow`), so a walk-forward runs on its defaults whatever the data.
   */
  estimationWindow: z.number().int().min(3).optional(),
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

/**
 * The usual estimation window per frequency: three years of monthly returns, two of weekly, one
 * trading year of daily (common practice, from memory; not from a cited source).
 */
export const USUAL_ESTIMATION_WINDOW: Readonly<Record<Frequency, number>> = { daily: 252, weekly: 104, monthly: 36 };

/** The shortest window the walk-forward accepts (the schema's minimum). */
export const MIN_ESTIMATION_WINDOW = 3;

/**
 * The walk-forward's estimation window when the scenario gives none: the usual window for the
 * frequency, but never more than half of the `returns` the history holds, so at least as many
 * periods are walked forward out of sample as are used to estimate the first rebalance.
 */
export function defaultEstimationWindow(frequency: Frequency, returns: number): number {
  return Math.max(MIN_ESTIMATION_WINDOW, Math.min(USUAL_ESTIMATION_WINDOW[frequency], Math.floor(returns / 2)));
}

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
