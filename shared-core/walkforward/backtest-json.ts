import type { WeightStability } from '../stability/weight-bands.js';
import type { StressViews } from '../stress/stress-views.js';
import type { WalkForwardMetrics } from './metrics.js';
import type { BacktestRun } from './run-backtest.js';
import type { CandidateComparison } from './significance.js';

/**
 * The `holdfast backtest --json` document (keys of the issue: `candidates[].id`, `rebalances`
 * with `date`, `weights`, `turnover`, `returns` with `date` and `value`, `metrics`), with the
 * comparisons, stress table and settings beside them. Non-finite figures become null.
 */
export interface BacktestJson {
  settings: BacktestRun['settings'];
  reference: string;
  candidates: {
    id: string;
    label?: string;
    rebalances: {
      date: string;
      status: string;
      message?: string;
      weights: Record<string, number>;
      turnover: number;
      cost: number;
      forecastVolatility: number | null;
    }[];
    returns: { date: string; value: number }[];
    metrics: WalkForwardMetrics;
    today: {
      status: string;
      message?: string;
      weights: Record<string, number>;
      volatility: number | null;
      diversificationRatio: number | null;
    };
    stability?: WeightStability;
  }[];
  comparisons: CandidateComparison[];
  stress: StressViews;
  warnings: string[];
  cautions: string;
}

export const BACKTEST_CAUTIONS =
  'Walk-forward results replay past data with estimates made at the time; past performance does not ' +
  'guarantee future results. Costs are modelled, not quoted. Output is decision support, not advice, ' +
  'until a licensed adviser reviews it under the local rules.';

const byAsset = (assets: readonly string[], w: ArrayLike<number>): Record<string, number> =>
  Object.fromEntries(assets.map((a, i) => [a, w[i]]));

export function backtestJson(run: BacktestRun): BacktestJson {
  return {
    settings: run.settings,
    reference: run.reference,
    candidates: run.candidates.map((c) => ({
      id: c.id,
      ...(c.label !== undefined ? { label: c.label } : {}),
      rebalances: c.walkForward.rebalances.map((r) => ({
        date: r.date,
        status: r.status,
        ...(r.message !== undefined ? { message: r.message } : {}),
        weights: byAsset(run.assets, r.weights),
        turnover: r.turnover,
        cost: r.costFraction,
        forecastVolatility: r.forecastVolatility,
      })),
      returns: c.walkForward.dates.map((date, t) => ({ date, value: c.walkForward.returns[t] })),
      metrics: c.metrics,
      today: {
        status: c.today.status,
        ...(c.today.message !== undefined ? { message: c.today.message } : {}),
        weights: byAsset(run.assets, c.today.weights),
        volatility: c.today.status === 'optimal' ? c.today.forecastVolatility : null,
        diversificationRatio: c.today.status === 'optimal' ? c.today.forecastDiversificationRatio : null,
      },
      ...(c.stability ? { stability: c.stability } : {}),
    })),
    comparisons: run.comparisons,
    stress: run.stress,
    warnings: run.warnings,
    cautions: BACKTEST_CAUTIONS,
  };
}

/** JSON text with NaN and infinities as null (JSON has no such numbers). */
export function backtestJsonText(run: BacktestRun): string {
  return JSON.stringify(backtestJson(run), (_k, v: unknown) =>
    typeof v === 'number' && !Number.isFinite(v) ? null : v,
  );
}
