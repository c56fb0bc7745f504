import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../shared-core/errors.js';
import { exportHousehold, importHousehold } from '../../../src-main/io/household-file.js';
import { canonicalJson, sha256Hex } from '../../../src-main/store/canonical-json.js';
import { openStore, type Store } from '../../../src-main/store/store.js';
import { useTempDir } from '../store/temp-dir.js';

const tempDir = useTempDir();

const scenario = (maxTurnover?: number) => ({
  format: 'holdfast-scenario@1',
  name: 'Review',
  baseCurrency: 'EUR',
  ...(maxTurnover !== undefined ? { constraints: { maxTurnover } } : {}),
  candidates: [{ id: 'erc', estimator: { method: 'sample' }, objective: { method: 'equal-risk-contribution' } }],
});

function sourceStore(): Store {
  const store = openStore(join(tempDir(), 'a.hfstore'));
  store.commitPrices({
    source: 'a.csv',
    assets: [
      { id: 'EQ1', displayName: 'Invented equity', currency: 'EUR', assetClass: 'Equity' },
      { id: 'PE1', currency: 'EUR', liquidity: { tag: 'illiquid', lockUpDays: 365 } },
    ],
    prices: [
      { assetId: 'EQ1', dates: ['2025-01-02', '2025-01-03'], closes: [100, 101] },
      { assetId: 'PE1', dates: ['2025-01-03'], closes: [10] },
    ],
    universe: { name: 'Core', tags: { EQ1: ['Equity'], PE1: ['Private'] } },
  });
  const h = store.createHousehold({ name: 'Invented household B', baseCurrency: 'EUR', notes: 'demo' });
  store.setHoldings(h.id, [{ assetId: 'EQ1', amount: 1000, currency: 'EUR', asOf: '2025-01-03' }]);
  const s = store.createScenario({ householdId: h.id, name: 'Review', universe: 'Core' });
  store.saveRevision(s.id, scenario(), { author: 'AB' });
  const r2 = store.saveRevision(s.id, scenario(0.2), { author: 'CD', note: 'cap turnover' });
  store.saveDraft(s.id, '{"format": "holdfast-scenario@1"');
  store.saveMemo({
    scenarioId: s.id,
    revisionHash: r2.hash,
    dataVersion: 1,
    pdf: new TextEncoder().encode('%PDF memo'),
  });
  return store;
}

describe('household file holdfast-household@1', () => {
  it('carries a household with holdings, revisions, draft, memos, assets, universe and prices to another store', () => {
    const a = sourceStore();
    const text = exportHousehold(a, 'Invented household B');
    const b = openStore(join(tempDir(), 'b.hfstore'));
    const result = importHousehold(b, text, 'hh.json');
    expect(result).toMatchObject({
      household: 'Invented household B',
      scenarios: 1,
      revisions: 2,
      assetsAdded: 2,
      pricesAdded: 3,
    });
    const ha = a.getHousehold('Invented household B')!;
    const hb = b.getHousehold('Invented household B')!;
    expect(b.holdings(hb.id)).toEqual(a.holdings(ha.id));
    const sa = a.getScenario(ha.id, 'Review')!;
    const sb = b.getScenario(hb.id, 'Review')!;
    expect(b.listRevisions(sb.id)).toEqual(a.listRevisions(sa.id).map((r) => ({ ...r, scenarioId: sb.id })));
    expect(b.getDraft(sb.id)?.text).toBe(a.getDraft(sa.id)?.text);
    expect(b.listMemos(sb.id).map((m) => m.sha256)).toEqual(a.listMemos(sa.id).map((m) => m.sha256));
    expect(b.getAsset('PE1')).toEqual(a.getAsset('PE1'));
    expect(b.getUniverse('Core')!.members).toEqual(a.getUniverse('Core')!.members);
    expect(b.priceTable({ universe: 'Core' })).toEqual(a.priceTable({ universe: 'Core' }));
    a.close();
    b.close();
  });

  it("carries the household's mandate, reads a file written before the mandate, and places a bad cap", () => {
    const a = sourceStore();
    const before = exportHousehold(a, 'Invented household B');
    expect(JSON.parse(before).household).not.toHaveProperty('mandate');
    const ha = a.getHousehold('Invented household B')!;
    a.updateHousehold(ha.id, { mandate: { assetCap: 0.15, illiquidMax: 0.05 } });
    const text = exportHousehold(a, 'Invented household B');
    const b = openStore(join(tempDir(), 'b.hfstore'));
    importHousehold(b, text, 'hh.json');
    expect(b.getHousehold('Invented household B')!.mandate).toEqual({ assetCap: 0.15, illiquidMax: 0.05 });
    const c = openStore(join(tempDir(), 'c.hfstore'));
    importHousehold(c, before, 'old.json');
    expect(c.getHousehold('Invented household B')!.mandate).toBeUndefined();
    const bad = JSON.parse(text);
    bad.household.mandate.assetCap = 1.5;
    const d = openStore(join(tempDir(), 'd.hfstore'));
    expect(() => importHousehold(d, JSON.stringify(bad), 'hh.json')).toThrow(
      expect.objectContaining({
        location: expect.objectContaining({ file: 'hh.json', path: 'household.mandate.assetCap' }),
        message: expect.stringContaining('the cap per asset must be at most 100 %'),
      }),
    );
    expect(d.listHouseholds()).toEqual([]);
    for (const s of [a, b, c, d]) s.close();
  });

  it('keeps the importing store’s prices where they differ, and reports each', () => {
    const a = sourceStore();
    const text = exportHousehold(a, 'Invented household B');
    const b = openStore(join(tempDir(), 'b.hfstore'));
    b.commitPrices({
      source: 'b.csv',
      assets: [{ id: 'EQ1' }],
      prices: [{ assetId: 'EQ1', dates: ['2025-01-03'], closes: [99] }],
    });
    const result = importHousehold(b, text, 'hh.json');
    expect(result.pricesKept).toEqual([{ assetId: 'EQ1', date: '2025-01-03', stored: 99, inFile: 101 }]);
    expect(Array.from(b.priceSeries('EQ1')!.closes)).toEqual([100, 99]);
    a.close();
    b.close();
  });

  it('refuses an edited file by its checksum, a clash of names, and schema errors by JSON path, writing nothing', () => {
    const a = sourceStore();
    const text = exportHousehold(a, 'Invented household B');
    const b = openStore(join(tempDir(), 'b.hfstore'));
    const edited = text.replace('"amount": 1000', '"amount": 2000');
    expect(edited).not.toBe(text);
    expect(() => importHousehold(b, edited, 'hh.json')).toThrow(
      expect.objectContaining({ location: { file: 'hh.json', path: 'checksum' } }),
    );
    const doc = JSON.parse(text);
    doc.holdings[0].asOf = '2025-13-01';
    try {
      importHousehold(b, JSON.stringify(doc), 'hh.json');
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(InputError);
      expect((error as InputError).location).toEqual({ file: 'hh.json', path: 'holdings[0].asOf' });
    }
    // A close is held to the price file's rule (shared-core/prices/price-value.ts).
    for (const close of [1e308, 1e-320, 0]) {
      const bad = JSON.parse(text);
      bad.prices.EQ1.closes[1] = close;
      expect(() => importHousehold(b, JSON.stringify(bad), 'hh.json'), String(close)).toThrow(
        expect.objectContaining({
          location: { file: 'hh.json', path: 'prices.EQ1.closes[1]' },
          message: expect.stringMatching(close > 0 ? /between 1e-150 and 1e150/ : /above zero/),
        }),
      );
    }
    expect(() => importHousehold(a, text, 'hh.json')).toThrow(/household named 'Invented household B' already/);
    expect(b.listHouseholds()).toEqual([]);
    expect(b.listAssets()).toEqual([]);
    a.close();
    b.close();
  });

  it('rolls the whole import back when a revision hash fails part-way (all or nothing)', () => {
    const a = sourceStore();
    const doc = JSON.parse(exportHousehold(a, 'Invented household B'));
    doc.scenarios[0].revisions[1].hash = '0'.repeat(64);
    delete doc.checksum;
    doc.checksum = sha256Hex(canonicalJson(doc));
    const b = openStore(join(tempDir(), 'b.hfstore'));
    expect(() => importHousehold(b, JSON.stringify(doc), 'hh.json')).toThrow(
      expect.objectContaining({ location: { file: 'hh.json', path: 'scenarios[0].revisions[1].hash' } }),
    );
    expect(b.listHouseholds()).toEqual([]);
    expect(b.listAssets()).toEqual([]);
    expect(b.listBatches()).toEqual([]);
    a.close();
    b.close();
  });
});
