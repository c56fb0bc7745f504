import { InputError } from '../../shared-core/errors.js';
import { runScenario, type ScenarioRun } from '../../shared-core/run/run-scenario.js';
import { locate, type ScenarioInputs } from './scenario-inputs.js';

export interface RunOptions {
  /** Aborting stops the run between steps with CancelledError (nothing partial). */
  signal?: AbortSignal;
}

/**
 * Every candidate of a scenario (shared-core's run: returns once, each estimate once, every
 * candidate under its mandate). Input errors name the file they come from: price cells by line
 * and column, the scenario by JSON path. `solve`, the memo and the walk-forward's checks share it.
 */
export function runScenarioInputs(inputs: ScenarioInputs, options: RunOptions = {}): ScenarioRun {
  const { signal } = options;
  // The current weights are the turnover reference and the memo's "from": an asset outside the
  // scenario would be dropped from both without a word.
  const known = new Set(inputs.scenario.assets ?? inputs.prices.assets);
  for (const key of Object.keys(inputs.scenario.current ?? {}))
    if (!known.has(key))
      throw new InputError(`unknown asset '${key}' (not among the scenario's assets)`, {
        file: inputs.names.scenario,
        path: `current.${key}`,
      });
  try {
    return runScenario(inputs.scenario, inputs.prices, {
      ...(inputs.locate ? { locate: inputs.locate } : {}),
      ...(inputs.fx ? { fx: inputs.fx } : {}),
      ...(signal ? { shouldCancel: () => signal.aborted } : {}),
    });
  } catch (error) {
    throw locate(inputs, error);
  }
}
