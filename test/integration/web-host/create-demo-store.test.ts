import { existsSync, mkdtempSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DEMO_SCENARIO_NAME, DEMO_UNIVERSE_NAME, generateDemo } from '../../../shared-core/demo/index.js';
import { createDemoStore } from '../../../src-main/demo/create-demo-store.js';
import { openStore } from '../../../src-main/store/store.js';

describe('demo store', () => {
  it('holds the invented household, its holdings, the universe with tags, the prices, the FX series and the scenario', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-demo-store-'));
    const made = await createDemoStore(join(dir, 'demo.sqlite'));
    expect(readdirSync(dir)).toEqual(['demo.sqlite']);
    const demo = generateDemo();
    const store = openStore(made.path, { create: false });
    try {
      expect(store.check()).toEqual([]);
      const household = store.getHousehold(made.householdId)!;
      expect(household.name).toBe(demo.household.name);
      expect(household.baseCurrency).toBe('EUR');
      const holdings = store.holdings(made.householdId);
      expect(holdings).toHaveLength(demo.holdings.length);
      expect(holdings.find((h) => h.assetId === 'LMI-US')).toMatchObject({ currency: 'USD', amount: 11_000_000 });

      const universe = store.getUniverse(DEMO_UNIVERSE_NAME)!;
      expect(universe.members.map((m) => m.assetId)).toEqual(demo.universe.assets);
      expect(universe.members.find((m) => m.assetId === 'GOV-EUR')!.tags).toContain('bonds');
      expect(store.getAsset('LMI-US')).toMatchObject({ currency: 'USD', assetClass: 'single-stock' });
      expect(store.getAsset('HF-CREDIT')!.liquidity).toEqual({ tag: 'illiquid', lockUpDays: 730 });
      expect(store.fxAsset('USD', 'EUR')?.id).toBe('USD');

      // The stored prices are the generated ones, point for point (the real import, not a shortcut).
      const stored = store.priceSeries('EQ-GLB')!;
      const column = demo.prices.closes[demo.prices.assets.indexOf('EQ-GLB')];
      const expected = demo.prices.dates.filter((_, t) => !Number.isNaN(column[t]));
      expect(stored.dates).toEqual(expected);
      expect(stored.closes[stored.closes.length - 1]).toBe(column[column.length - 1]);
      expect(store.listBatches()).toHaveLength(2);

      const scenario = store.getScenario(made.householdId, DEMO_SCENARIO_NAME)!;
      expect(scenario.id).toBe(made.scenarioId);
      const revision = store.getRevision(scenario.id)!;
      expect(revision.number).toBe(1);
      expect(revision.document.candidates).toHaveLength(6);
    } finally {
      store.close();
    }
  });

  it('refuses to touch an existing file', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-demo-store-'));
    const path = join(dir, 'mine.sqlite');
    writeFileSync(path, 'not mine to replace');
    await expect(createDemoStore(path)).rejects.toThrow(/already exists/);
    expect(readdirSync(dir)).toEqual(['mine.sqlite']);
    expect(existsSync(path)).toBe(true);
  });
});
