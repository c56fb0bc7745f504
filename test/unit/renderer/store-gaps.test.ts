import { describe, expect, it } from 'vitest';
import type { Asset, Holdings } from '../../../shared-core/contract/service-api.js';
import { parseScenario, type Scenario } from '../../../shared-core/scenario/schema.js';
import { fillStoreGaps } from '../../../src-renderer/scenario/store-gaps.js';

const parsed = parseScenario({
  format: 'holdfast-scenario@1',
  name: 'T',
  baseCurrency: 'EUR',
  assets: ['A', 'B'],
  assetInfo: { A: { liquidity: 'daily' } },
  candidates: [{ id: 'x', estimator: { method: 'sample' }, objective: { method: 'min-variance' } }],
});
if (!parsed.ok) throw new Error('fixture does not parse');
const scenario: Scenario = parsed.scenario;
const asset: Asset = {
  id: 'B',
  name: 'Fund B',
  assetClass: 'equity',
  region: '',
  currency: 'USD',
  liquidity: 'illiquid',
  lockUpDays: 720,
  notes: '',
  fx: null,
};
const holdings: Holdings = {
  householdId: '1',
  baseCurrency: 'EUR',
  asOf: '2025-12-31',
  positions: [
    { asset: 'A', amount: 75, currency: 'EUR', valueInBase: 75, weight: 0.75 },
    { asset: 'B', amount: 30, currency: 'USD', valueInBase: 25, weight: 0.25 },
  ],
  total: 100,
  rates: [],
};

// The same rule as the store-backed solve (src-main/app/stored-scenario.ts): fill, never override.
describe('the gaps the store fills', () => {
  it('adds missing asset tags and current weights from the valued holdings', () => {
    const out = fillStoreGaps(scenario, [asset], holdings);
    expect(out.assetInfo).toEqual({
      A: { liquidity: 'daily' },
      B: { name: 'Fund B', liquidity: 'illiquid', assetClass: 'equity', currency: 'USD' },
    });
    expect(out.current).toEqual({ A: 0.75, B: 0.25 });
  });

  it("keeps the document's own current weights and tags", () => {
    const own = { ...scenario, current: { A: 1 }, assetInfo: { A: { liquidity: 'daily' as const }, B: {} } };
    expect(fillStoreGaps(own, [asset], holdings)).toBe(own);
  });

  it('leaves current absent when a holding cannot be valued in the base currency', () => {
    const unvalued = { ...holdings, positions: [{ ...holdings.positions[0], weight: null }], total: null };
    expect(fillStoreGaps(scenario, [], unvalued).current).toBeUndefined();
  });
});
