import { estimateAndSolve } from '../../shared-core/walkforward/estimate-and-solve.js';
import { runBacktest, type BacktestPhase, type BacktestRun } from '../../shared-core/walkforward/run-backtest.js';
import { locate, type ScenarioInputs } from './scenario-inputs.js';

export interface WalkForwardRequest {
  /** Bootstrap draws of today's weights (weight bands); absent or 0: none. */
  stabilityDraws?: number;
  seed?: number;
  onProgress?: (phase: BacktestPhase, candidateId: string, done: number, total: number) => void;
  signal?: AbortSignal;
}

/**
 * Every candidate walked forward out of sample under its mandate (the walk-forward of
 * shared-core, each rebalance estimated and solved as the comparison solves it), with costs,
 * stress views and, on request, weight stability. Input errors are placed as `solve` places them.
 */
export async function walkForward(inputs: ScenarioInputs, request: WalkForwardRequest = {}): Promise<BacktestRun> {
  const { signal } = request;
  try {
    return await runBacktest(inputs.scenario, inputs.prices, {
      estimateAndSolve,
      ...(inputs.fx ? { fx: inputs.fx } : {}),
      ...(request.onProgress ? { onProgress: request.onProgress } : {}),
      ...(signal ? { shouldCancel: () => signal.aborted } : {}),
      pause: () => new Promise((resolve) => setImmediate(resolve)),
      ...(request.stabilityDraws ? { stabilityDraws: request.stabilityDraws } : {}),
      ...(request.seed !== undefined ? { seed: request.seed } : {}),
    });
  } catch (error) {
    throw locate(inputs, error);
  }
}
