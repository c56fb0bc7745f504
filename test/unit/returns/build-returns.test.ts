import { describe, expect, it } from 'vitest';
import { InputError, formatInputError } from '../../../shared-core/errors.js';
import { toRows } from '../../../shared-core/linalg/matrix.js';
import { priceTableFromText } from '../../../src-main/io/read-price-table.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { buildReturns, type BuildReturnsOptions } from '../../../shared-core/returns/build-returns.js';
import { pricingFrequency } from '../../../shared-core/returns/calendar.js';
import { weekdays } from '../../support/calendar.js';

/** A table whose asset k has price 100 * exp(g_k * i + a small wiggle) on weekday i; NaN where `holes` says. */
function table(dates: string[], assets: string[], holes: Record<string, number[]> = {}): PriceTable {
  const closes = assets.map((id, k) => {
    const c = Float64Array.from(dates, (_, i) => 100 * Math.exp(0.001 * (k + 1) * i + 0.01 * Math.sin(i * (k + 2))));
    for (const i of holes[id] ?? []) c[i] = NaN;
    return c;
  });
  return { dates, assets, closes };
}

const daily: BuildReturnsOptions = { frequency: 'daily', method: 'log' };

function error(run: () => unknown): InputError {
  try {
    run();
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
  throw new Error('expected an InputError');
}

describe('buildReturns: aligned returns (returns engine of the estimators issue)', () => {
  it('log returns are ln(P_t / P_t-1) and simple returns P_t / P_t-1 - 1 between consecutive dates', () => {
    const t = table(weekdays('2024-01-01', 6), ['A', 'B']);
    const log = buildReturns(t, daily);
    const simple = buildReturns(t, { ...daily, method: 'simple' });
    expect(log.dates).toEqual(t.dates.slice(1));
    for (let i = 0; i < 5; i++)
      for (let a = 0; a < 2; a++) {
        const ratio = t.closes[a][i + 1] / t.closes[a][i];
        expect(log.returns.data[i * 2 + a]).toBeCloseTo(Math.log(ratio), 15);
        expect(simple.returns.data[i * 2 + a]).toBeCloseTo(ratio - 1, 15);
      }
    expect(log.coverage[0]).toEqual({
      asset: 'A',
      firstDate: '2024-01-01',
      lastDate: '2024-01-08',
      observations: 5,
      datesDropped: 0,
      pricesFilled: 0,
    });
    expect(log.warnings).toEqual([]);
  });

  it('a date on which one asset has no price is dropped for all; the next return spans both days', () => {
    const t = table(weekdays('2024-01-01', 8), ['A', 'B'], { B: [3] });
    const r = buildReturns(t, daily);
    expect(r.dates).toEqual([1, 2, 4, 5, 6, 7].map((i) => t.dates[i]));
    expect(r.returns.data[2 * 2 + 1]).toBeCloseTo(Math.log(t.closes[1][4] / t.closes[1][2]), 15);
    expect(r.returns.data[2 * 2 + 0]).toBeCloseTo(Math.log(t.closes[0][4] / t.closes[0][2]), 15);
    expect(r.coverage.map((c) => c.datesDropped)).toEqual([1, 0]);
    expect(r.warnings.join('\n')).toMatch(/dropped 1 date\(s\).*missing: B on 1/);
  });

  it('never bridges a hole longer than maxFillDays: the return across it is dropped with a warning', () => {
    const t = table(weekdays('2024-01-01', 12), ['A', 'B'], { B: [3, 4, 5, 6] });
    const r = buildReturns(t, daily);
    // B has no price from Thu 4th to Tue 9th: Wed 3rd to Wed 10th is 7 days > 5.
    expect(r.dates).toEqual([1, 2, 8, 9, 10, 11].map((i) => t.dates[i]));
    expect(r.warnings.join('\n')).toMatch(/spanning missing prices longer than 5 days: 2024-01-03 to 2024-01-10/);
    const lenient = buildReturns(t, { ...daily, maxFillDays: 7 });
    expect(lenient.dates).toContain('2024-01-10');
  });

  it('an asset that starts late shortens the common window, and the warning names it', () => {
    const t = table(weekdays('2024-01-01', 30), ['A', 'LATE'], { LATE: [0, 1, 2, 3, 4, 5, 6, 7, 8, 9] });
    const r = buildReturns(t, daily);
    expect(r.dates[0]).toBe(t.dates[11]);
    expect(r.warnings.join('\n')).toMatch(/LATE starts on 2024-01-15, after the window start 2024-01-01/);
    expect(r.coverage[0].datesDropped).toBe(10);
    expect(r.coverage[1].firstDate).toBe('2024-01-15');
  });

  it('the window bounds are inclusive', () => {
    const t = table(weekdays('2024-01-01', 20), ['A']);
    const r = buildReturns(t, { ...daily, from: '2024-01-03', to: '2024-01-10' });
    expect(r.dates).toEqual(['2024-01-04', '2024-01-05', '2024-01-08', '2024-01-09', '2024-01-10']);
  });

  it('weekly returns run between the last trading days of consecutive weeks; a stale price is carried at most maxFillDays', () => {
    const dates = weekdays('2024-01-01', 20); // four weeks, Fridays at 4, 9, 14, 19
    const t = table(dates, ['A', 'B'], { B: [9, 8] }); // B lacks Thu and Fri of week 2: its Wed price is 2 days old
    const r = buildReturns(t, { ...daily, frequency: 'weekly' });
    expect(r.dates).toEqual([dates[9], dates[14], dates[19]]);
    expect(r.returns.data[0 * 2 + 1]).toBeCloseTo(Math.log(t.closes[1][7] / t.closes[1][4]), 15);
    expect(r.coverage[1].pricesFilled).toBe(1);
    const strict = buildReturns(t, { ...daily, frequency: 'weekly', maxFillDays: 1, minObservations: 1 });
    // With a 1-day limit week 2 has no usable B price: both returns touching it are dropped.
    expect(strict.dates).toEqual([dates[19]]);
    expect(strict.warnings.join('\n')).toMatch(/B 2024-01-12/);
  });

  it('monthly returns run between month ends; an incomplete last month is dropped', () => {
    const dates = weekdays('2024-01-01', 100); // January to mid-May 2024
    const r = buildReturns(table(dates, ['A']), { ...daily, frequency: 'monthly' });
    expect(r.dates).toEqual(['2024-02-29', '2024-03-29', '2024-04-30']);
    expect(r.warnings.join('\n')).toMatch(/incomplete last month ending 2024-05-17/);
  });

  it('an asset priced monthly refuses a daily estimate, naming it, or coarsens the frequency when asked', () => {
    const dates = weekdays('2024-01-01', 130);
    const t = table(dates, ['A', 'FUND']);
    const monthEnds = new Set(['2024-01-31', '2024-02-29', '2024-03-29', '2024-04-30', '2024-05-31', '2024-06-28']);
    dates.forEach((d, i) => {
      if (!monthEnds.has(d)) t.closes[1][i] = NaN;
    });
    const e = error(() => buildReturns(t, daily));
    expect(e.message).toMatch(/FUND is priced monthly .* use frequency monthly/);
    const r = buildReturns(t, { ...daily, onCoarserPricing: 'coarsen' });
    expect(r.frequency).toBe('monthly');
    expect(r.dates).toEqual([...monthEnds].slice(1));
    expect(r.warnings.join('\n')).toMatch(/estimating monthly: FUND priced monthly/);
  });

  it('converts prices to the base currency with the FX series before taking returns', () => {
    const dates = weekdays('2024-01-01', 6);
    const t = { ...table(dates, ['HOME', 'ABROAD']), currencies: ['EUR', 'USD'] };
    const fx: PriceTable = { dates, assets: ['USD'], closes: [Float64Array.from([0.9, 0.91, 0.92, 0.9, 0.88, 0.89])] };
    const r = buildReturns(t, { ...daily, method: 'simple', baseCurrency: 'EUR', fx });
    for (let i = 0; i < 5; i++) {
      const local = t.closes[1][i + 1] / t.closes[1][i];
      expect(r.returns.data[i * 2 + 1]).toBeCloseTo((local * fx.closes[0][i + 1]) / fx.closes[0][i] - 1, 15);
      expect(r.returns.data[i * 2]).toBeCloseTo(t.closes[0][i + 1] / t.closes[0][i] - 1, 15);
    }
  });

  it('a missing FX rate on a needed date is an error naming the asset, the currency and the date', () => {
    const dates = weekdays('2024-01-01', 12);
    const csv = ['date,HOME,ABROAD', ...dates.map((d, i) => `${d},${100 + i},${50 + (i % 3)}`)].join('\n');
    const read = priceTableFromText(csv);
    const t = { ...read.table, currencies: ['EUR', 'USD'] };
    const rates = Float64Array.from(dates, () => 0.9);
    for (const i of [5, 6, 7, 8, 9]) rates[i] = NaN; // 2024-01-08 .. 2024-01-12
    const fx: PriceTable = { dates, assets: ['USD'], closes: [rates] };
    const e = error(() => buildReturns(t, { ...daily, baseCurrency: 'EUR', fx, locate: read.locate }));
    expect(formatInputError(e.inFile('p.csv'))).toBe(
      'p.csv:10:3: no USD rate in EUR for ABROAD on 2024-01-11 (none within 5 days before)',
    );
    const none = error(() => buildReturns(t, { ...daily, baseCurrency: 'EUR' }));
    expect(none.message).toBe('ABROAD is priced in USD but there is no USD rate series in EUR');
  });

  it('fewer than three common returns, a constant series, an unknown asset: clear errors with a location', () => {
    const read = priceTableFromText('date,A,B\n2024-01-01,1,5\n2024-01-02,2,5\n2024-01-03,3,5\n2024-01-04,4,5\n');
    const { table: t, locate } = read;
    const flat = error(() => buildReturns(t, { ...daily, locate }));
    expect(formatInputError(flat)).toBe(
      'line 2:3: prices of B are constant from 2024-01-01 to 2024-01-04: no risk can be estimated',
    );
    const short = error(() => buildReturns(t, { ...daily, assets: ['A'], from: '2024-01-02', locate }));
    expect(formatInputError(short)).toMatch(/^line 3:2: only 2 common daily return\(s\) .* at least 3 are needed/);
    const unknown = error(() => buildReturns(t, { ...daily, assets: ['A', 'Z'] }));
    expect(formatInputError(unknown)).toBe("assets[1]: no price history for asset 'Z'");
  });

  it('keeps the selected asset order', () => {
    const t = table(weekdays('2024-01-01', 6), ['A', 'B', 'C']);
    const r = buildReturns(t, { ...daily, assets: ['C', 'A'] });
    expect(r.assets).toEqual(['C', 'A']);
    expect(toRows(r.returns)[0][0]).toBeCloseTo(Math.log(t.closes[2][1] / t.closes[2][0]), 15);
  });
});

describe('pricingFrequency (how often a series is priced)', () => {
  it('takes the median gap a sort would give, for short, long and unsorted gaps', () => {
    let s = 9;
    const next = () => (s = (s * 16807) % 2147483647) / 2147483647;
    for (let c = 0; c < 300; c++) {
      const days = [0];
      const length = 3 + Math.floor(next() * 60);
      for (let i = 1; i < length; i++) {
        const u = next();
        days.push(
          days[i - 1] +
            (u < 0.05 ? -Math.ceil(next() * 5) : u < 0.2 ? 60 + Math.floor(next() * 300) : 1 + Math.floor(next() * 35)),
        );
      }
      const gaps = Float64Array.from(days.slice(1), (d, i) => d - days[i]).sort();
      expect(pricingFrequency(days).medianGap).toBe(gaps[gaps.length >> 1]);
    }
    expect(pricingFrequency([0, 31, 59, 90, 120]).frequency).toBe('monthly');
    expect(pricingFrequency([0, 1, 2, 3, 6, 7]).frequency).toBe('daily');
  });
});
