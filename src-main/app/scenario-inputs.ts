import { InputError } from '../../shared-core/errors.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { parseScenarioText, type Scenario } from '../../shared-core/scenario/schema.js';
import { readInputFile } from '../io/read-input-file.js';
import { readNamedPriceTable, type PriceTableFile } from '../io/read-price-table.js';
import type { Store } from '../store/store.js';
import { storedScenarioInputs, type StoredScenarioInputs } from './stored-scenario.js';

/**
 * What every use case computes from: a scenario, its prices (each asset's currency known where
 * it matters) and the exchange rates into the scenario's base currency, however they were
 * obtained. The names say where an error points: a JSON path into `scenario`, a line and column
 * (or anything else about the prices) into `prices`.
 */
export interface ScenarioInputs {
  scenario: Scenario;
  prices: PriceTable;
  /** Rates into the scenario's base currency, one column per currency, when an asset is priced in another. */
  fx?: PriceTable;
  names: { scenario: string; prices: string; fx?: string };
  /** Prices read from the store: no line or column to point at. */
  fromStore: boolean;
  /** The price file's line and column of an asset's price on a date (the file form). */
  locate?: PriceTableFile['locate'];
}

export interface ScenarioFiles {
  prices: string;
  scenario: string;
  /** Exchange rates, one column per currency, units of the base per one unit of it. */
  fx?: string;
}

/**
 * The file form: a scenario document, a price file and optionally a rate file, read with the
 * import's reader and validation. Each asset's price currency comes from the scenario's
 * `assetInfo` (a wide price file has no place for it). The first error is thrown naming its
 * file; `report` hears the scenario's other errors first; flagged price moves go to `warn`.
 */
export function scenarioFromFiles(
  cwd: string,
  files: ScenarioFiles,
  report: (error: InputError) => void = () => {},
  warn?: (line: string) => void,
): ScenarioInputs {
  const scenarioFile = readInputFile(cwd, files.scenario);
  const parsed = parseScenarioText(scenarioFile.text);
  if (!parsed.ok) {
    const [first, ...rest] = parsed.errors.map((e) => e.inFile(scenarioFile.path));
    rest.forEach(report);
    throw first;
  }
  const scenario = parsed.scenario;
  const prices = readNamedPriceTable(cwd, files.prices, warn);
  const read = { names: { scenario: scenarioFile.path, prices: prices.path }, fromStore: false, locate: prices.locate };
  if (files.fx === undefined) return { scenario, prices: prices.table, ...read };
  const fx = readNamedPriceTable(cwd, files.fx, warn);
  return {
    scenario,
    prices: { ...prices.table, currencies: prices.table.assets.map((a) => scenario.assetInfo?.[a]?.currency) },
    fx: fx.table,
    ...read,
    names: { ...read.names, fx: fx.path },
  };
}

/**
 * The store form: the newest saved revision of a household's scenario, the stored prices of its
 * assets and the stored rates into the scenario's base currency (stored-scenario.ts). Errors
 * name the store file.
 */
export function scenarioFromStore(
  store: Store,
  storeName: string,
  household: string,
  scenario: string,
): ScenarioInputs & { stored: StoredScenarioInputs } {
  let stored: StoredScenarioInputs;
  try {
    stored = storedScenarioInputs(store, household, scenario);
  } catch (error) {
    if (error instanceof InputError && error.location.file === undefined) throw error.inFile(storeName);
    throw error;
  }
  return {
    scenario: stored.scenario,
    prices: stored.prices,
    ...(stored.fx ? { fx: stored.fx } : {}),
    names: {
      scenario: `${storeName} (household '${household}', scenario '${scenario}', revision ${stored.revision.number})`,
      prices: storeName,
    },
    fromStore: true,
    stored,
  };
}

/** True when some asset is priced in another currency than the scenario's base (and so converted). */
export function convertsCurrency(inputs: Pick<ScenarioInputs, 'scenario' | 'prices'>): boolean {
  return (inputs.prices.currencies ?? []).some((c) => c !== undefined && c !== inputs.scenario.baseCurrency);
}

/** An input error of a run, placed in the input it is about: a JSON path in the scenario, the rest in the prices. */
export function locate(inputs: Pick<ScenarioInputs, 'names'>, error: unknown): unknown {
  if (!(error instanceof InputError) || error.location.file !== undefined) return error;
  return error.inFile(error.location.path !== undefined ? inputs.names.scenario : inputs.names.prices);
}
