import type { Asset, Holdings } from '../../shared-core/contract/service-api.js';
import type { AssetInfo, Scenario } from '../../shared-core/scenario/schema.js';
import { assetInfoOf } from './editor-state.js';

/**
 * Fills the two gaps of a document that the store fills for `holdfast solve --store`
 * (src-main/app/stored-scenario.ts), never overriding the document: each asset's tags where
 * `assetInfo` lacks it, and `current` from the holdings' base-currency weights when the document
 * has none. The page computes from the same inputs as the command line, so their weights agree.
 */
export function fillStoreGaps(scenario: Scenario, catalogue: readonly Asset[], holdings: Holdings | null): Scenario {
  const assets = scenario.assets ?? [];
  const byId = new Map(catalogue.map((a) => [a.id, a]));
  let assetInfo: Record<string, AssetInfo> | undefined = scenario.assetInfo;
  for (const id of assets) {
    if (assetInfo?.[id] || !byId.has(id)) continue;
    assetInfo = { ...assetInfo, [id]: assetInfoOf(byId.get(id) as Asset) };
  }
  let current = scenario.current;
  if (!current && holdings && holdings.positions.length > 0 && holdings.positions.every((p) => p.weight !== null)) {
    const inScenario = new Set(assets);
    if (holdings.positions.every((p) => inScenario.has(p.asset)))
      current = Object.fromEntries(holdings.positions.map((p) => [p.asset, p.weight as number]));
  }
  if (assetInfo === scenario.assetInfo && current === scenario.current) return scenario;
  return { ...scenario, ...(assetInfo ? { assetInfo } : {}), ...(current ? { current } : {}) };
}
