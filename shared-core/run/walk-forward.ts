import type { CandidateResult } from '../optimise/result.js';
import type { PriceTable } from '../prices/price-table.js';
import type { Scenario } from '../scenario/schema.js';
import { estimateAndSolve } from '../walkforward/estimate-and-solve.js';
import { runBacktest, type BacktestOptions, type BacktestRun } from '../walkforward/run-backtest.js';
import { runScenario, type RunScenarioOptions, type ScenarioRun } from './run-scenario.js';

/**
 * What a walk-forward gives: the run, or, when a candidate's mandate cannot be met (or its solve
 * fails) on the whole window, those candidates as the comparison solved them, and no walk: a
 * mandate no rebalance can meet would only show cash.
 */
export type WalkForwardOutcome =
  { status: 'done'; run: BacktestRun } | { status: 'not-solved'; candidates: CandidateResult[] };

export interface WalkForwardOptions extends Omit<BacktestOptions, 'estimateAndSolve'> {
  /** Places an asset and date in the price file, for the comparison's error messages. */
  locate?: RunScenarioOptions['locate'];
  /**
   * The comparison the walk is checked against; by default the scenario is run here as the
   * comparison runs it. The command line passes its own, which also names the input files.
   */
  comparison?: () => ScenarioRun;
}

/**
 * Every candidate walked forward out of sample (shared-core's backtest, each rebalance estimated
 * and solved as the comparison solves it), after the scenario is first run as the comparison
 * runs it, so bad input is refused with the comparison's message and an unmet mandate is told
 * as the comparison tells it. The app's worker and the command line's use case both call this.
 */
export async function walkForwardScenario(
  scenario: Scenario,
  prices: PriceTable,
  options: WalkForwardOptions = {},
): Promise<WalkForwardOutcome> {
  const { locate, comparison, ...backtest } = options;
  const checked = comparison
    ? comparison()
    : runScenario(scenario, prices, {
        ...(locate ? { locate } : {}),
        ...(options.fx ? { fx: options.fx } : {}),
        ...(options.shouldCancel ? { shouldCancel: options.shouldCancel } : {}),
      });
  const unsolved = checked.candidates.filter((c) => c.status !== 'optimal');
  if (unsolved.length > 0) return { status: 'not-solved', candidates: unsolved };
  return { status: 'done', run: await runBacktest(scenario, prices, { ...backtest, estimateAndSolve }) };
}

/** Why a walk-forward did not run, one clause per candidate the comparison could not solve. */
export function notWalkedWords(candidates: readonly CandidateResult[]): string {
  return candidates
    .map((c) => `candidate '${c.id}' is ${c.status}${'message' in c && c.message ? ` (${c.message})` : ''}`)
    .join('; ');
}
