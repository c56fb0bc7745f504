import type { CandidateResult } from '../../shared-core/optimise/result.js';
import { estimateAndSolve } from '../../shared-core/walkforward/estimate-and-solve.js';
import { runBacktest, type BacktestPhase, type BacktestRun } from '../../shared-core/walkforward/run-backtest.js';
import { runScenarioInputs } from './run-scenario.js';
import { locate, type ScenarioInputs } from './scenario-inputs.js';

export interface WalkForwardRequest {
  /** Bootstrap draws of today's weights (weight bands); absent or 0: none. */
  stabilityDraws?: number;
  seed?: number;
  onProgress?: (phase: BacktestPhase, candidateId: string, done: number, total: number) => void;
  signal?: AbortSignal;
}

/**
 * What a walk-forward gives: the run, or, when a candidate's mandate cannot be met (or its solve
 * fails) on the whole window, those candidates as the comparison solved them, and no walk: a
 * mandate no rebalance can meet would only show cash.
 */
export type WalkForwardOutcome =
  { status: 'done'; run: BacktestRun } | { status: 'not-solved'; candidates: CandidateResult[] };

/**
 * Every candidate walked forward out of sample under its mandate (the walk-forward of
 * shared-core, each rebalance estimated and solved as the comparison solves it), with costs,
 * stress views and, on request, weight stability. The scenario is first run as `solve` runs it,
 * so bad input is refused with the same located message and an unmet mandate the same way.
 */
export async function walkForward(
  inputs: ScenarioInputs,
  request: WalkForwardRequest = {},
): Promise<WalkForwardOutcome> {
  const { signal } = request;
  const checked = runScenarioInputs(inputs, { signal });
  const unsolved = checked.candidates.filter((c) => c.status !== 'optimal');
  if (unsolved.length > 0) return { status: 'not-solved', candidates: unsolved };
  try {
    const run = await runBacktest(inputs.scenario, inputs.prices, {
      estimateAndSolve,
      ...(inputs.fx ? { fx: inputs.fx } : {}),
      ...(request.onProgress ? { onProgress: request.onProgress } : {}),
      ...(signal ? { shouldCancel: () => signal.aborted } : {}),
      pause: () => new Promise((resolve) => setImmediate(resolve)),
      ...(request.stabilityDraws ? { stabilityDraws: request.stabilityDraws } : {}),
      ...(request.seed !== undefined ? { seed: request.seed } : {}),
    });
    return { status: 'done', run };
  } catch (error) {
    throw locate(inputs, error);
  }
}
