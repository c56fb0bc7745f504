import { describe, expect, it } from 'vitest';
import { seedPrices, useService, weekdays } from './service-fixture.js';

const service = useService();

describe('service: households and their holdings', () => {
  it('creates, lists, reads and edits a household, trimming what was typed', async () => {
    const h = service();
    const created = await h.call('households.create', {
      name: '  Invented family A ',
      baseCurrency: 'EUR',
      reference: 'X-1',
    });
    expect(created).toMatchObject({ name: 'Invented family A', baseCurrency: 'EUR', reference: 'X-1', notes: '' });
    expect(created.scenarioCount).toBe(0);
    expect(created.holdingsAsOf).toBeNull();
    await h.call('households.create', { name: 'Another invented family', baseCurrency: 'CHF' });
    const list = await h.call('households.list', {});
    expect(list.map((x) => x.name)).toEqual(['Another invented family', 'Invented family A']);
    const edited = await h.call('households.update', {
      householdId: created.id,
      fields: { name: 'Invented family A', baseCurrency: 'USD', notes: 'moved abroad (invented)' },
    });
    expect(edited).toMatchObject({ id: created.id, baseCurrency: 'USD', notes: 'moved abroad (invented)' });
    expect((await h.call('households.get', { householdId: created.id })).baseCurrency).toBe('USD');
    expect(edited.createdAt).not.toBeNull();
    expect(edited.updatedAt! > edited.createdAt!).toBe(true);
  });

  it('refuses a bad currency, an empty name and a repeated name, naming the field', async () => {
    const h = service();
    const badCurrency = await h.reply('households.create', { name: 'Invented B', baseCurrency: 'euro' });
    expect(badCurrency).toMatchObject({ ok: false, error: { code: 'bad-request', where: 'baseCurrency' } });
    const noName = await h.reply('households.create', { name: '   ', baseCurrency: 'EUR' });
    expect(noName).toMatchObject({ ok: false, error: { code: 'bad-request', where: 'name' } });
    await h.call('households.create', { name: 'Invented B', baseCurrency: 'EUR' });
    const again = await h.reply('households.create', { name: 'invented b', baseCurrency: 'EUR' });
    expect(again).toMatchObject({ ok: false, error: { code: 'conflict', where: 'name' } });
    expect(await h.call('households.list', {})).toHaveLength(1);
  });

  it("keeps a mandate with the household, and refuses a cap above 100 % in the field's own words", async () => {
    const h = service();
    const plain = await h.call('households.create', { name: 'Invented M', baseCurrency: 'EUR' });
    expect(plain.mandate).toEqual({ assetCap: null, illiquidMax: null });
    const edited = await h.call('households.update', {
      householdId: plain.id,
      fields: { name: 'Invented M', baseCurrency: 'EUR', mandate: { assetCap: 0.15, illiquidMax: 0.05 } },
    });
    expect(edited.mandate).toEqual({ assetCap: 0.15, illiquidMax: 0.05 });
    expect((await h.call('households.get', { householdId: plain.id })).mandate).toEqual(edited.mandate);
    const tooHigh = await h.reply('households.create', {
      name: 'Invented N',
      baseCurrency: 'EUR',
      mandate: { assetCap: 1.5, illiquidMax: null },
    });
    expect(tooHigh).toMatchObject({
      ok: false,
      error: { code: 'bad-request', message: expect.stringContaining('the cap per asset must be at most 100 %') },
    });
    expect(JSON.stringify(tooHigh)).not.toMatch(/\b1\.5\b|\[0, /);
    // Cleared again: both limits off, so a new scenario starts from the stated defaults.
    const cleared = await h.call('households.update', {
      householdId: plain.id,
      fields: { name: 'Invented M', baseCurrency: 'EUR' },
    });
    expect(cleared.mandate).toEqual({ assetCap: null, illiquidMax: null });
  });

  it('answers not-found for a household id that does not exist', async () => {
    const h = service();
    expect(await h.reply('households.get', { householdId: '99' })).toMatchObject({
      ok: false,
      error: { code: 'not-found', message: "no household with id '99'" },
    });
    expect(await h.reply('holdings.get', { householdId: 'abc' })).toMatchObject({
      ok: false,
      error: { code: 'not-found' },
    });
  });

  it('keeps holdings as amounts in currency as of a date, and values them in the base currency', async () => {
    const h = service();
    const dates = weekdays('2025-12-01', 23); // to 2025-12-31
    // Invented exchange rate: 0.9 EUR per USD, then 0.8 from 2025-12-22 on.
    seedPrices(h.store, 'Invented core', {
      EQ: { dates, currency: 'EUR' },
      US: { dates, currency: 'USD' },
      'FX-USDEUR': {
        dates,
        closes: dates.map((d) => (d >= '2025-12-22' ? 0.8 : 0.9)),
        fx: { base: 'USD', quote: 'EUR' },
      },
    });
    const hh = await h.call('households.create', { name: 'Invented C', baseCurrency: 'EUR' });
    const set = await h.call('holdings.set', {
      householdId: hh.id,
      asOf: '2025-12-19',
      positions: [
        { asset: 'EQ', amount: 1_000_000, currency: 'EUR' },
        { asset: 'US', amount: 500_000, currency: 'USD' },
      ],
    });
    // 500,000 USD x 0.9 EUR/USD (the last rate on or before 19 December) = 450,000 EUR.
    expect(set.asOf).toBe('2025-12-19');
    expect(set.positions.find((p) => p.asset === 'US')).toMatchObject({
      amount: 500_000,
      currency: 'USD',
      valueInBase: 450_000,
    });
    expect(set.total).toBeCloseTo(1_450_000, 6);
    expect(set.positions.reduce((s, p) => s + (p.weight ?? 0), 0)).toBeCloseTo(1, 12);
    expect(set.rates).toEqual(['USD to EUR 0.900000 on 2025-12-19, series FX-USDEUR']);
    const later = await h.call('holdings.set', {
      householdId: hh.id,
      asOf: '2025-12-31',
      positions: [{ asset: 'US', amount: 500_000, currency: 'USD' }],
    });
    expect(later.total).toBeCloseTo(400_000, 6);
    expect((await h.call('holdings.get', { householdId: hh.id })).positions).toHaveLength(1);
    expect((await h.call('households.get', { householdId: hh.id })).holdingsTotal).toBeCloseTo(400_000, 6);
  });

  it('leaves the total empty rather than guessing when no exchange rate is stored', async () => {
    const h = service();
    seedPrices(h.store, 'Invented core', { GB: { dates: weekdays('2025-01-06', 5), currency: 'GBP' } });
    const hh = await h.call('households.create', { name: 'Invented D', baseCurrency: 'EUR' });
    const set = await h.call('holdings.set', {
      householdId: hh.id,
      asOf: '2025-01-10',
      positions: [{ asset: 'GB', amount: 10_000, currency: 'GBP' }],
    });
    expect(set.total).toBeNull();
    expect(set.positions[0]).toMatchObject({ valueInBase: null, weight: null });
    expect(set.rates).toEqual(['GBP to EUR: no exchange rate on file']);
  });

  it('refuses holdings of an unknown asset, a repeated asset or a negative amount and keeps the old ones', async () => {
    const h = service();
    seedPrices(h.store, 'Invented core', { EQ: { dates: weekdays('2025-01-06', 5), currency: 'EUR' } });
    const hh = await h.call('households.create', { name: 'Invented E', baseCurrency: 'EUR' });
    await h.call('holdings.set', {
      householdId: hh.id,
      asOf: '2025-01-10',
      positions: [{ asset: 'EQ', amount: 5, currency: 'EUR' }],
    });
    const unknown = await h.reply('holdings.set', {
      householdId: hh.id,
      asOf: '2025-01-10',
      positions: [
        { asset: 'EQ', amount: 5, currency: 'EUR' },
        { asset: 'NOPE', amount: 5, currency: 'EUR' },
      ],
    });
    expect(unknown).toMatchObject({ ok: false, error: { code: 'bad-request', where: 'positions[1].asset' } });
    const twice = await h.reply('holdings.set', {
      householdId: hh.id,
      asOf: '2025-01-10',
      positions: [
        { asset: 'EQ', amount: 5, currency: 'EUR' },
        { asset: 'EQ', amount: 6, currency: 'EUR' },
      ],
    });
    expect(twice).toMatchObject({ ok: false, error: { code: 'bad-request', where: 'positions' } });
    const negative = await h.reply('holdings.set', {
      householdId: hh.id,
      asOf: '2025-01-10',
      positions: [{ asset: 'EQ', amount: -1, currency: 'EUR' }],
    });
    expect(negative).toMatchObject({ ok: false, error: { code: 'bad-request', where: 'positions[0].amount' } });
    const badDate = await h.reply('holdings.set', { householdId: hh.id, asOf: '2025-02-30', positions: [] });
    expect(badDate).toMatchObject({ ok: false, error: { code: 'bad-request', where: 'asOf' } });
    expect((await h.call('holdings.get', { householdId: hh.id })).positions).toEqual([
      { asset: 'EQ', amount: 5, currency: 'EUR', valueInBase: 5, weight: 1 },
    ]);
  });
});
