import { InputError } from '../../shared-core/errors.js';
import { prepareKernelTeamForEstimates } from '../../shared-core/estimators/prepare-kernel-team.js';
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
  // The current weights are the turnover reference and the memo's "from". A held asset the
  // scenario leaves out is sold (the mandate counts it in the turnover); an asset with no prices
  // at all is a mistake that would otherwise pass without a word. The store form checks its
  // `current` against the store's assets (stored-scenario.ts).
  if (!inputs.fromStore) {
    const known = new Set([...inputs.prices.assets, ...(inputs.scenario.assets ?? [])]);
    for (const key of Object.keys(inputs.scenario.current ?? {}))
      if (!known.has(key))
        throw new InputError(`unknown asset '${key}' (not in the price file)`, {
          file: inputs.names.scenario,
          path: `current.${key}`,
        });
  }
  prepareKernelTeamForEstimates(inputs.prices.assets.length, inputs.prices.dates.length - 1);
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
