import { describe, expect, it } from 'vitest';
import { InputError } from '../../../shared-core/errors.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { buildReturns, type BuildReturnsOptions } from '../../../shared-core/returns/build-returns.js';
import { dayNumber, isCoarser, pricingFrequency } from '../../../shared-core/returns/calendar.js';
import { weekdays } from '../../support/calendar.js';

// Park-Miller generator (Park and Miller 1988), seeded so a failure can be replayed.
function lcg(seed: number) {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

/**
 * `n` assets on `count` weekdays, random walks rounded to 6 decimals; asset 3 starts 10 days late
 * and every fifth asset misses one day in ten, a different one (so no hole spans more than 4 calendar days);
 * every third asset is priced in USD. The USD rate is the EUR price of one dollar.
 */
function universe(n: number, count: number, seed: number): { table: PriceTable; fx: PriceTable } {
  const rnd = lcg(seed);
  const dates = weekdays('2024-01-01', count);
  const closes = Array.from({ length: n }, (_, a) => {
    let p = 50 + 100 * rnd();
    return Float64Array.from(dates, (_, i) => {
      p *= Math.exp(0.02 * (rnd() - 0.5));
      if ((a === 3 && i < 10) || (a % 5 === 0 && i % 10 === (2 * a) / 5 + 1)) return NaN;
      return Math.round(p * 1e6) / 1e6;
    });
  });
  const assets = closes.map((_, a) => `S${a}`);
  const currencies = assets.map((_, a) => (a % 3 === 0 ? 'USD' : 'EUR'));
  const rates = Float64Array.from(dates, () => 0.85 + 0.1 * rnd());
  return { table: { dates, assets, closes, currencies }, fx: { dates, assets: ['USD'], closes: [rates] } };
}

describe('buildReturns on a universe wider than one block of columns', () => {
  const n = 19;
  const { table, fx } = universe(n, 90, 11);
  const options: BuildReturnsOptions = { frequency: 'daily', method: 'log', baseCurrency: 'EUR', fx };

  it('each return is ln(P_t / P_t-1) of its own asset in the base currency, between consecutive dates on which every asset has a price', () => {
    const r = buildReturns(table, options);
    const all = table.dates.map((_, i) => i).filter((i) => table.closes.every((c) => Number.isFinite(c[i])));
    expect(r.dates).toEqual(all.slice(1).map((i) => table.dates[i]));
    const level = (a: number, i: number) =>
      table.currencies![a] === 'USD' ? table.closes[a][i] * fx.closes[0][i] : table.closes[a][i];
    for (let s = 0; s < r.dates.length; s++)
      for (let a = 0; a < n; a++) {
        const expected = Math.log(level(a, all[s + 1]) / level(a, all[s]));
        expect(Object.is(r.returns.data[s * n + a], expected), `${table.assets[a]} ${r.dates[s]}`).toBe(true);
      }
    const simple = buildReturns(table, { ...options, method: 'simple' });
    expect(Object.is(simple.returns.data[5 * n + 12], level(12, all[6]) / level(12, all[5]) - 1)).toBe(true);
  });

  it('reordering the assets reorders the return columns and the coverage, bit for bit (daily and weekly)', () => {
    const order = [...table.assets].reverse().sort((x, y) => (x.length % 2) - (y.length % 2));
    for (const frequency of ['daily', 'weekly'] as const) {
      const base = buildReturns(table, { ...options, frequency });
      const moved = buildReturns(table, { ...options, frequency, assets: order });
      expect(moved.dates).toEqual(base.dates);
      order.forEach((id, j) => {
        const a = base.assets.indexOf(id);
        expect(moved.coverage[j]).toEqual(base.coverage[a]);
        for (let s = 0; s < base.dates.length; s++)
          expect(Object.is(moved.returns.data[s * n + j], base.returns.data[s * n + a])).toBe(true);
      });
    }
  });
});

describe('buildReturns: an asset priced less often than asked', () => {
  it('is refused exactly when pricingFrequency finds it coarser, for gaps of every length (the median gap is the order statistic at rank (m - 1) / 2)', () => {
    const rnd = lcg(29);
    const dates = weekdays('2023-01-02', 160);
    const dense = Float64Array.from(dates, (_, i) => 100 * Math.exp(0.01 * Math.sin(i)));
    for (let trial = 0; trial < 150; trial++) {
      const keep = 0.05 + 0.9 * rnd();
      const sparse = dense.map((p, i) => (i === 0 || i === dates.length - 1 || rnd() < keep ? p * 1.5 : NaN));
      const days = dates.filter((_, i) => Number.isFinite(sparse[i])).map(dayNumber);
      const native = pricingFrequency(days).frequency;
      const table: PriceTable = { dates, assets: ['DENSE', 'SPARSE'], closes: [dense, sparse] };
      for (const frequency of ['daily', 'weekly'] as const) {
        let refused = false;
        try {
          buildReturns(table, { frequency, method: 'log', minObservations: 1 });
        } catch (error) {
          if (!(error instanceof InputError)) throw error;
          refused = /SPARSE is priced (weekly|monthly)/.test(error.message);
        }
        expect(refused, `keep ${keep}, ${frequency}`).toBe(isCoarser(native, frequency));
      }
    }
  });
});
