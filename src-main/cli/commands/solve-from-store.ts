import { InputError } from '../../../shared-core/errors.js';
import { storedScenarioInputs } from '../../app/stored-scenario.js';
import type { SolveInputs } from './solve.js';
import { existingStore } from './store-access.js';

/**
 * The store form of `holdfast solve`: `--store FILE --household NAME --scenario NAME` gives the
 * same inputs as the file form (the newest saved revision and the stored prices of its assets).
 * Errors are InputErrors naming the store file, so the command exits 2 with nothing on stdout.
 */
export function readSolveStore(cwd: string, storeName: string, household: string, scenario: string): SolveInputs {
  const store = existingStore(cwd, storeName);
  try {
    const inputs = storedScenarioInputs(store, household, scenario);
    return {
      ...(inputs.fx ? { fx: inputs.fx } : {}),
      scenario: inputs.scenario,
      prices: inputs.prices,
      pricesName: storeName,
      scenarioName: `${storeName} (household '${household}', scenario '${scenario}', revision ${inputs.revision.number})`,
      fromStore: true,
    };
  } catch (error) {
    if (error instanceof InputError && error.location.file === undefined) throw error.inFile(storeName);
    throw error;
  } finally {
    store.close();
  }
}
