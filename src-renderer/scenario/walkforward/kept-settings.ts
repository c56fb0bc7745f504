import { backtestSpecSchema, type BacktestSpec } from '../../../shared-core/scenario/backtest-spec.js';
import type { Scenario } from '../../../shared-core/scenario/schema.js';

/**
 * The walk-forward settings a run on the defaults leaves in the draft, so that the saved revision
 * carries them and its memo prints the walk-forward (src-main/app/memo.ts prints it whenever the
 * revision has `backtest`). They are the schema's defaults the advisor sees in the brief; the
 * estimation window stays unset, chosen from the history as the run chose it.
 */
export function keptWalkForwardSettings(): Pick<BacktestSpec, 'rebalance' | 'costBps' | 'cashRate'> {
  const { rebalance, costBps, cashRate } = backtestSpecSchema.parse({});
  return { rebalance, costBps, cashRate };
}

/**
 * What a walk-forward's figures depend on: the scenario, with absent walk-forward settings read
 * as the defaults they stand for, so keeping those defaults in the draft does not date the run.
 */
export function walkForwardInputsKey(scenario: Scenario): string {
  const { backtest, ...rest } = scenario;
  return JSON.stringify([backtestSpecSchema.parse(backtest ?? {}), rest]);
}
