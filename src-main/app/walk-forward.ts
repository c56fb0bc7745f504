import type { BacktestPhase } from '../../shared-core/walkforward/run-backtest.js';
import { walkForwardScenario, type WalkForwardOutcome } from '../../shared-core/run/walk-forward.js';
import { runScenarioInputs } from './run-scenario.js';
import { locate, type ScenarioInputs } from './scenario-inputs.js';

export type { WalkForwardOutcome } from '../../shared-core/run/walk-forward.js';

export interface WalkForwardRequest {
  /** Bootstrap draws of today's weights (weight bands); absent or 0: none. */
  stabilityDraws?: number;
  seed?: number;
  onProgress?: (phase: BacktestPhase, candidateId: string, done: number, total: number) => void;
  signal?: AbortSignal;
}

/**
 * Every candidate walked forward out of sample under its mandate: shared-core's walk-forward of
 * a scenario (the same function as the app's worker), checked against the comparison as `solve`
 * runs it, so bad input is refused with the same located message and an unmet mandate the same way.
 */
export async function walkForward(
  inputs: ScenarioInputs,
  request: WalkForwardRequest = {},
): Promise<WalkForwardOutcome> {
  const { signal } = request;
  const comparison = () => runScenarioInputs(inputs, { signal });
  try {
    return await walkForwardScenario(inputs.scenario, inputs.prices, {
      comparison,
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
