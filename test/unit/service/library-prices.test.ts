import { describe, expect, it } from 'vitest';
import { priceTableFromWire, priceTableToWire } from '../../../shared-core/contract/service-api.js';
import { seedPrices, useService, weekdays } from './service-fixture.js';

const service = useService();

describe('service: universes, assets and their tags', () => {
  it('lists universes and their members, and sets group tags and descriptive tags', async () => {
    const h = service();
    seedPrices(h.store, 'Invented core', {
      AAA: { dates: weekdays('2025-01-06', 3) },
      BBB: { dates: weekdays('2025-01-06', 3) },
    });
    const [universe] = await h.call('universes.list', {});
    expect(universe).toMatchObject({ name: 'Invented core', assetCount: 2 });
    const member = await h.call('universes.setGroups', {
      universeId: universe.id,
      asset: 'AAA',
      groups: ['equity', ' growth ', 'equity'],
    });
    expect(member.groups).toEqual(['equity', 'growth']);
    const asset = await h.call('assets.update', {
      assetId: 'BBB',
      fields: { assetClass: 'hedge fund', region: 'global', currency: 'USD', liquidity: 'illiquid', lockUpDays: 90 },
    });
    // One spelling per class (scenario/asset-class.ts): typed 'hedge fund', kept as 'hedge-fund'.
    expect(asset).toMatchObject({ assetClass: 'hedge-fund', currency: 'USD', liquidity: 'illiquid', lockUpDays: 90 });
    const got = await h.call('universes.get', { universeId: universe.id });
    expect(got.members.map((m) => [m.asset.id, m.groups])).toEqual([
      ['AAA', ['equity', 'growth']],
      ['BBB', []],
    ]);
    expect(got.members[1].asset.name).toBe('Invented BBB');
    const back = await h.call('assets.update', { assetId: 'BBB', fields: { liquidity: 'daily', lockUpDays: null } });
    expect(back).toMatchObject({ liquidity: 'daily', lockUpDays: null, currency: 'USD' });
  });

  it('refuses tags for an asset outside the universe and unknown ids', async () => {
    const h = service();
    seedPrices(h.store, 'Invented core', { AAA: { dates: weekdays('2025-01-06', 3) } });
    seedPrices(h.store, 'Invented other', { ZZZ: { dates: weekdays('2025-01-06', 3) } });
    const core = (await h.call('universes.list', {})).find((u) => u.name === 'Invented core')!;
    expect(await h.reply('universes.setGroups', { universeId: core.id, asset: 'ZZZ', groups: [] })).toMatchObject({
      ok: false,
      error: { code: 'not-found', where: 'asset' },
    });
    expect(await h.reply('universes.get', { universeId: '404' })).toMatchObject({
      ok: false,
      error: { code: 'not-found' },
    });
    expect(await h.reply('assets.get', { assetId: 'NOPE' })).toMatchObject({ ok: false, error: { code: 'not-found' } });
    expect(await h.reply('assets.update', { assetId: 'AAA', fields: { currency: 'eur' } })).toMatchObject({
      ok: false,
      error: { code: 'bad-request', where: 'fields.currency' },
    });
  });
});

describe('service: prices', () => {
  it('gives one series for a chart, within a window', async () => {
    const h = service();
    const dates = weekdays('2025-01-06', 10);
    seedPrices(h.store, 'Invented core', { AAA: { dates, closes: dates.map((_, i) => 100 + i), currency: 'EUR' } });
    const all = await h.call('prices.series', { assetId: 'AAA' });
    expect(all).toMatchObject({ asset: 'AAA', currency: 'EUR', dates, closes: dates.map((_, i) => 100 + i) });
    const part = await h.call('prices.series', { assetId: 'AAA', window: { from: '2025-01-08', to: '2025-01-13' } });
    expect(part.dates).toEqual(['2025-01-08', '2025-01-09', '2025-01-10', '2025-01-13']);
    expect(
      await h.reply('prices.series', { assetId: 'AAA', window: { from: '2025-02-01', to: '2025-01-01' } }),
    ).toMatchObject({
      ok: false,
      error: { code: 'bad-request', where: 'window' },
    });
  });

  it('sends an aligned price table with null where an asset has no price, and reads it back with NaN', async () => {
    const h = service();
    seedPrices(h.store, 'Invented core', {
      AAA: { dates: weekdays('2025-01-06', 5), closes: [1, 2, 3, 4, 5] },
      LATE: { dates: weekdays('2025-01-08', 3), closes: [7, 8, 9] },
    });
    const { table, dataVersion } = await h.call('prices.table', { assets: ['AAA', 'LATE'] });
    expect(dataVersion).toBe(h.store.dataVersion());
    expect(table.dates).toEqual(weekdays('2025-01-06', 5));
    expect(table.closes).toEqual([
      [1, 2, 3, 4, 5],
      [null, null, 7, 8, 9],
    ]);
    const back = priceTableFromWire(table);
    expect(Number.isNaN(back.closes[1][0])).toBe(true);
    expect(priceTableToWire(back)).toEqual(table);
    expect(await h.reply('prices.table', { assets: ['AAA', 'NOPE'] })).toMatchObject({
      ok: false,
      error: { code: 'not-found', where: 'assets[1]' },
    });
  });

  it('shows which asset has prices when: late start, a gap, and a monthly series that is not a gap', async () => {
    const h = service();
    const daily = weekdays('2024-01-01', 260);
    // Ten weekdays missing in the middle: 2024-03-04 (a Monday) to 2024-03-15 (a Friday).
    const gapped = daily.filter((d) => d < '2024-03-04' || d > '2024-03-15');
    const monthEnds = ['2024-01-31', '2024-02-29', '2024-03-29', '2024-04-30', '2024-05-31', '2024-06-28'];
    seedPrices(h.store, 'Invented core', {
      FULL: { dates: daily },
      LATE: { dates: daily.filter((d) => d >= '2024-06-03') },
      HOLE: { dates: gapped },
      NAV: { dates: monthEnds },
    });
    const [universe] = await h.call('universes.list', {});
    const coverage = await h.call('prices.coverage', { universeId: universe.id });
    const row = (id: string) => coverage.assets.find((a) => a.asset === id)!;
    expect(coverage.firstDate).toBe('2024-01-01');
    expect(coverage.lastDate).toBe(daily[daily.length - 1]);
    expect(row('FULL')).toMatchObject({ observations: 260, gaps: [], typicalSpacingWeekdays: 1 });
    expect(row('LATE').firstDate).toBe('2024-06-03');
    expect(row('HOLE').gaps).toEqual([{ after: '2024-03-01', before: '2024-03-18', missingWeekdays: 10 }]);
    expect(row('NAV').gaps).toEqual([]);
    expect(row('NAV').typicalSpacingWeekdays).toBeGreaterThanOrEqual(20);
    // A holiday week (five weekdays) is not a gap with the default; it is with a stricter setting.
    const strict = await h.call('prices.coverage', { assets: ['HOLE'], minGapWeekdays: 12 });
    expect(strict.assets[0].gaps).toEqual([]);
  });
});
