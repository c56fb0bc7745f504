import { InputError } from '../../shared-core/errors.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import type { AssetInfo, Scenario } from '../../shared-core/scenario/schema.js';
import type { HouseholdRecord, Store } from '../store/store.js';
import { storedExchangeRates } from './exchange-rates.js';
import { valueHoldings } from './value-holdings.js';

export interface StoredScenarioInputs {
  scenario: Scenario;
  prices: PriceTable;
  /** The stored rates into the scenario's base currency, when an asset is priced in another. */
  fx?: PriceTable;
  /** `store.hfstore: household 'X', scenario 'Y', revision 3`: where the inputs came from. */
  label: string;
  revision: { number: number; hash: string };
  dataVersion: number;
}

/**
 * What `holdfast solve --store` and the app compute from: the newest saved revision of a
 * household's scenario and the stored prices of its assets (the document's `assets`, else its
 * universe's members). Two gaps of the document are filled from the store, never overriding it:
 * `assetInfo` from each asset's tags (class, region, currency, liquidity), and `current` from the
 * household's holdings as weights of their value in the base currency (converted with the latest
 * stored FX close on or before the holdings date).
 */
export function storedScenarioInputs(store: Store, householdName: string, scenarioName: string): StoredScenarioInputs {
  const household = store.getHousehold(householdName);
  if (!household) throw new InputError(`no household named '${householdName}' in the store`);
  const record = store.getScenario(household.id, scenarioName);
  if (!record) throw new InputError(`household '${householdName}' has no scenario named '${scenarioName}'`);
  const revision = store.getRevision(record.id);
  if (!revision) throw new InputError(`scenario '${scenarioName}' has only a draft; save a revision first`);
  const doc = revision.document;
  let assets: readonly string[];
  if (doc.assets) {
    doc.assets.forEach((a, i) => {
      if (!store.getAsset(a)) throw new InputError(`unknown asset '${a}' (not in the store)`, { path: `assets[${i}]` });
    });
    assets = doc.assets;
  } else if (record.universe) assets = store.getUniverse(record.universe)!.members.map((m) => m.assetId);
  else throw new InputError(`scenario '${scenarioName}' names no universe and its document lists no assets`);
  const prices = store.priceTable({ assets, from: doc.window?.from, to: doc.window?.to });

  const assetInfo: Record<string, AssetInfo> = { ...doc.assetInfo };
  for (const id of assets) {
    if (assetInfo[id]) continue;
    const a = store.getAsset(id)!;
    const info: AssetInfo = { name: a.displayName, liquidity: a.liquidity.tag };
    if (a.assetClass) info.assetClass = a.assetClass;
    if (a.region) info.region = a.region;
    if (a.currency) info.currency = a.currency;
    assetInfo[id] = info;
  }
  const scenario: Scenario = { ...doc, assetInfo };
  for (const key of Object.keys(doc.current ?? {}))
    if (!store.getAsset(key))
      throw new InputError(`unknown asset '${key}' (not in the store)`, { path: `current.${key}` });
  if (!doc.current) {
    const current = holdingWeights(store, household, doc.baseCurrency, new Set(assets));
    if (current) scenario.current = current;
  }
  const fx = storedExchangeRates(store, scenario.baseCurrency, prices.currencies ?? []);
  return {
    scenario,
    prices,
    ...(fx ? { fx } : {}),
    label: `${store.path}: household '${householdName}', scenario '${scenarioName}', revision ${revision.number}`,
    revision: { number: revision.number, hash: revision.hash },
    dataVersion: store.dataVersion(),
  };
}

/**
 * The holdings as weights of their value in the scenario's base currency (the one valuation,
 * value-holdings.ts); a holding that cannot be valued is an InputError at its JSON path.
 */
export function holdingWeights(
  store: Store,
  household: HouseholdRecord,
  base: string,
  universe: ReadonlySet<string>,
): Record<string, number> | undefined {
  const holdings = store.holdings(household.id);
  if (holdings.length === 0) return undefined;
  holdings.forEach((h, i) => {
    if (!universe.has(h.assetId))
      throw new InputError(`held asset '${h.assetId}' is not among the scenario's assets`, { path: `holdings[${i}]` });
  });
  const valued = valueHoldings(store, household, base, holdings);
  const unvalued = valued.positions.findIndex((p) => p.valueInBase === null);
  if (unvalued !== -1) {
    const h = holdings[unvalued];
    throw new InputError(
      `no stored ${h.currency}/${base} rate on or before ${h.asOf} to value this holding in ${base}`,
      {
        path: `holdings[${unvalued}].currency`,
      },
    );
  }
  const total = valued.positions.reduce((s, p) => s + (p.valueInBase as number), 0);
  if (!(total > 0)) throw new InputError('the holdings add up to no positive value', { path: 'holdings' });
  return Object.fromEntries(valued.positions.map((p) => [p.asset, (p.valueInBase as number) / total]));
}
