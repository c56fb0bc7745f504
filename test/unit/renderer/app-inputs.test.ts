import { describe, expect, it } from 'vitest';
import type { Coverage } from '../../../shared-core/contract/service-api.js';
import { href, parseRoute, type Route } from '../../../src-renderer/app/route.js';
import { parseAmountInput } from '../../../src-renderer/households/amount-input.js';
import { commonSpan, coverageFinding, runsOf, yearTicks } from '../../../src-renderer/library/coverage-layout.js';

describe('amounts as an advisor types them', () => {
  it('reads thousands separators of the common conventions and both decimal marks', () => {
    expect(parseAmountInput('1,250,000')).toEqual({ ok: true, value: 1_250_000 });
    expect(parseAmountInput('1 250 000')).toEqual({ ok: true, value: 1_250_000 });
    expect(parseAmountInput("1'250'000.50")).toEqual({ ok: true, value: 1_250_000.5 });
    expect(parseAmountInput('1.250.000,50')).toEqual({ ok: true, value: 1_250_000.5 });
    expect(parseAmountInput('1.250.000')).toEqual({ ok: true, value: 1_250_000 });
    expect(parseAmountInput('1250,5')).toEqual({ ok: true, value: 1250.5 });
    expect(parseAmountInput('750000')).toEqual({ ok: true, value: 750_000 });
  });

  it('gives a reason instead of guessing', () => {
    expect(parseAmountInput('')).toEqual({ ok: false, reason: 'enter an amount' });
    expect(parseAmountInput('-5')).toEqual({ ok: false, reason: 'an amount cannot be negative' });
    expect(parseAmountInput('12k')).toMatchObject({ ok: false });
    expect(parseAmountInput('1,2,3.4.5')).toMatchObject({ ok: false });
  });
});

describe('page addresses', () => {
  it('reads back every address it writes', () => {
    const routes: Route[] = [
      { page: 'households' },
      { page: 'household-new' },
      { page: 'household', householdId: '7' },
      { page: 'scenario', householdId: '7', scenarioId: '12' },
      { page: 'library' },
      { page: 'library', universeId: '3', assetId: 'EQ GLB/1' },
      { page: 'import' },
      { page: 'settings' },
    ];
    for (const r of routes) expect(parseRoute(href(r))).toEqual(r);
    expect(parseRoute('')).toEqual({ page: 'households' });
    expect(parseRoute('#/nowhere')).toEqual({ page: 'households' });
  });
});

function coverage(assets: Coverage['assets']): Coverage {
  const firsts = assets.map((a) => a.firstDate).filter((d): d is string => !!d);
  const lasts = assets.map((a) => a.lastDate).filter((d): d is string => !!d);
  return {
    firstDate: firsts.sort()[0] ?? null,
    lastDate: lasts.sort().reverse()[0] ?? null,
    minGapWeekdays: 5,
    assets,
    dataVersion: 1,
  };
}

const row = (asset: string, firstDate: string, lastDate: string, gaps: Coverage['assets'][number]['gaps'] = []) => ({
  asset,
  name: asset,
  currency: 'EUR',
  observations: 100,
  firstDate,
  lastDate,
  typicalSpacingWeekdays: 1,
  gaps,
});

describe('the coverage picture in words', () => {
  it('names the window every asset covers, the late starters and the gaps', () => {
    const c = coverage([
      row('A', '2015-01-02', '2025-12-31'),
      row('B', '2018-03-01', '2025-12-31'),
      row('C', '2015-01-02', '2025-12-31', [{ after: '2020-03-02', before: '2020-04-01', missingWeekdays: 21 }]),
    ]);
    expect(commonSpan(c)).toEqual({ from: '2018-03-01', to: '2025-12-31' });
    const text = coverageFinding(c, 'en-GB');
    expect(text).toBe(
      'Every asset has prices from 1 Mar 2018 to 31 Dec 2025; starts late: B (1 Mar 2018); has gaps: C.',
    );
    expect(runsOf(c.assets[2]).map((r) => r.kind)).toEqual(['prices', 'gap', 'prices']);
  });

  it('says so when no window has prices for every asset', () => {
    const c = coverage([row('A', '2015-01-02', '2016-12-30'), row('B', '2018-03-01', '2025-12-31')]);
    expect(commonSpan(c)).toBeNull();
    expect(coverageFinding(c, 'en-GB')).toMatch(/^No window has prices for every asset; /);
  });

  it('marks years on the axis, fewer over a long span', () => {
    expect(yearTicks('2019-06-01', '2022-02-01')).toEqual(['2020-01-01', '2021-01-01', '2022-01-01']);
    expect(yearTicks('2000-01-03', '2025-12-31')).toEqual([
      '2005-01-01',
      '2010-01-01',
      '2015-01-01',
      '2020-01-01',
      '2025-01-01',
    ]);
  });
});
