import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { storedScenarioInputs } from '../../../src-main/app/stored-scenario.js';
import { openStore, type Store } from '../../../src-main/store/store.js';
import { useTempDir } from './temp-dir.js';

const tempDir = useTempDir();

const doc = (extra: Record<string, unknown> = {}) => ({
  format: 'holdfast-scenario@1',
  name: 'Review',
  baseCurrency: 'EUR',
  candidates: [{ id: 'mv', estimator: { method: 'sample' }, objective: { method: 'min-variance' } }],
  ...extra,
});

function store(): { store: Store; scenarioId: number; householdId: number } {
  const s = openStore(join(tempDir(), 's.hfstore'));
  s.commitPrices({
    source: 'p.csv',
    assets: [
      { id: 'EQ1', currency: 'EUR', assetClass: 'Equity', region: 'Europe' },
      { id: 'US1', currency: 'USD', liquidity: { tag: 'illiquid', lockUpDays: 90 } },
      { id: 'EURUSD', currency: 'USD', fx: { base: 'EUR', quote: 'USD' } },
    ],
    prices: [
      { assetId: 'EQ1', dates: ['2025-01-02', '2025-01-03', '2025-01-06'], closes: [100, 101, 102] },
      { assetId: 'US1', dates: ['2025-01-02', '2025-01-03', '2025-01-06'], closes: [10, 10.1, 10.2] },
      { assetId: 'EURUSD', dates: ['2025-01-02', '2025-01-03'], closes: [1.25, 1.3] },
    ],
    universe: { name: 'Core' },
  });
  s.saveUniverse('Core', [
    { assetId: 'EQ1', tags: [] },
    { assetId: 'US1', tags: [] },
  ]);
  const h = s.createHousehold({ name: 'H', baseCurrency: 'EUR' });
  const sc = s.createScenario({ householdId: h.id, name: 'Review', universe: 'Core' });
  return { store: s, scenarioId: sc.id, householdId: h.id };
}

describe('solve inputs from the store', () => {
  it('uses the newest revision and the universe prices, filling asset tags and current weights from holdings', () => {
    const { store: s, scenarioId, householdId } = store();
    s.saveRevision(scenarioId, doc(), { author: 'AB' });
    s.saveRevision(scenarioId, doc({ window: { from: '2025-01-03' } }), { author: 'AB' });
    // 1000 EUR and 1300 USD; USD per EUR on 2025-01-03 is 1.3, so 1300 USD = 1000 EUR: half each.
    s.setHoldings(householdId, [
      { assetId: 'EQ1', amount: 1000, currency: 'EUR', asOf: '2025-01-03' },
      { assetId: 'US1', amount: 1300, currency: 'USD', asOf: '2025-01-05' },
    ]);
    const inputs = storedScenarioInputs(s, 'H', 'Review');
    expect(inputs.revision.number).toBe(2);
    expect(inputs.prices.assets).toEqual(['EQ1', 'US1']);
    expect(inputs.prices.dates).toEqual(['2025-01-03', '2025-01-06']);
    expect(inputs.scenario.current!.EQ1).toBeCloseTo(0.5, 14);
    expect(inputs.scenario.current!.US1).toBeCloseTo(0.5, 14);
    // The asset was stored as 'Equity'; the store keeps asset classes in their one spelling.
    expect(inputs.scenario.assetInfo).toEqual({
      EQ1: { name: 'EQ1', liquidity: 'daily', assetClass: 'equity', region: 'Europe', currency: 'EUR' },
      US1: { name: 'US1', liquidity: 'illiquid', currency: 'USD' },
    });
    s.close();
  });

  it('never overrides what the document says, and names what is missing', () => {
    const { store: s, scenarioId, householdId } = store();
    expect(() => storedScenarioInputs(s, 'H', 'Review')).toThrow(/only a draft/);
    expect(() => storedScenarioInputs(s, 'X', 'Review')).toThrow(/no household named 'X'/);
    s.saveRevision(scenarioId, doc({ assets: ['EQ1'], current: { EQ1: 1 } }), { author: 'AB' });
    s.setHoldings(householdId, [{ assetId: 'US1', amount: 5, currency: 'USD', asOf: '2025-01-01' }]);
    const inputs = storedScenarioInputs(s, 'H', 'Review');
    expect(inputs.prices.assets).toEqual(['EQ1']);
    expect(inputs.scenario.current).toEqual({ EQ1: 1 });
    s.saveRevision(scenarioId, doc(), { author: 'AB' });
    // The USD holding is dated before the first stored EUR/USD rate.
    expect(() => storedScenarioInputs(s, 'H', 'Review')).toThrow(
      expect.objectContaining({ location: { path: 'holdings[0].currency' } }),
    );
    s.close();
  });
});
