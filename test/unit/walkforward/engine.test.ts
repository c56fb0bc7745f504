import { describe, expect, it } from 'vitest';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { runWalkForward } from '../../../shared-core/walkforward/engine.js';
import { scheduledRows } from '../../../shared-core/walkforward/schedule.js';
import type {
  AllocateFn,
  Allocation,
  WalkForwardInput,
  WalkForwardSettings,
} from '../../../shared-core/walkforward/types.js';
import { normals, syntheticPrices, weekdays } from './synthetic.js';
import { walkForwardMetrics } from '../../../shared-core/walkforward/metrics.js';

const fixed = (weights: number[]): Allocation => ({
  status: 'optimal',
  weights: Float64Array.from(weights),
  forecastVolatility: null,
  forecastDiversificationRatio: null,
});

const constant =
  (weights: number[]): AllocateFn =>
  () =>
    fixed(weights);

function settings(n: number, over: Partial<WalkForwardSettings> = {}): WalkForwardSettings {
  return {
    rebalance: 'monthly',
    driftBand: 0.05,
    costRates: new Float64Array(n),
    startIndex: 0,
    periodsPerYear: 252,
    cashRate: 0,
    ...over,
  };
}

function run(
  prices: PriceTable,
  allocate: AllocateFn,
  over: Partial<WalkForwardSettings> = {},
  extra: Partial<WalkForwardInput> = {},
) {
  return runWalkForward({
    prices,
    assets: prices.assets,
    settings: settings(prices.assets.length, over),
    allocate,
    ...extra,
  });
}

/** Inverse-volatility weights on the last 60 log returns of the history it is given. */
const inverseVolatility: AllocateFn = ({ history }) => {
  const inv = history.closes.map((c) => {
    const t = c.length - 1;
    const k = Math.min(60, t);
    let s = 0;
    let s2 = 0;
    for (let j = t - k + 1; j <= t; j++) {
      const r = Math.log(c[j] / c[j - 1]);
      s += r;
      s2 += r * r;
    }
    return 1 / Math.sqrt((s2 - (s * s) / k) / (k - 1));
  });
  const total = inv.reduce((a, b) => a + b, 0);
  return {
    status: 'optimal',
    weights: Float64Array.from(inv, (v) => v / total),
    forecastVolatility: null,
    forecastDiversificationRatio: null,
  };
};

describe('walk-forward engine', () => {
  it('a constant-weight zero-cost candidate held without rebalancing is buy-and-hold (hand-computed, common practice)', () => {
    // Units bought at the start: 0.6 / 100 of A and 0.4 / 50 of B; value = sum units x price.
    // Row 1: 0.6 x 1.10 + 0.4 x 1.00 = 1.0600; row 2: 0.6 x 0.99 + 0.4 x 1.10 = 1.0340;
    // row 3: 0.6 x 1.089 + 0.4 x 0.88 = 1.0054.
    const prices: PriceTable = {
      dates: ['2024-03-04', '2024-03-05', '2024-03-06', '2024-03-07'],
      assets: ['A', 'B'],
      closes: [Float64Array.from([100, 110, 99, 108.9]), Float64Array.from([50, 50, 55, 44])],
    };
    const result = run(prices, constant([0.6, 0.4]), { rebalance: 'yearly' });
    expect(result.rebalances).toHaveLength(1);
    expect(Array.from(result.growth)).toEqual([1.06, 1.034, 1.0054].map((v) => expect.closeTo(v, 12)));
    expect(result.returns[1]).toBeCloseTo(1.034 / 1.06 - 1, 14);
    expect(result.dates).toEqual(['2024-03-05', '2024-03-06', '2024-03-07']);
    expect(result.startDate).toBe('2024-03-04');
  });

  it('the charged cost equals the known turnover times the cost rate (hand-computed)', () => {
    // 50/50 on Jan 30; A gains 20% on Jan 31, so the drifted weights are 0.6/1.1 and 0.5/1.1.
    // The month-end rebalance back to 50/50 trades 2 x (0.6/1.1 - 0.5) = 1/11 of value; at 10 bps
    // the cost is 0.001/11 of value, charged in the Feb 1 return (prices flat that day).
    const prices: PriceTable = {
      dates: ['2024-01-30', '2024-01-31', '2024-02-01', '2024-02-02'],
      assets: ['A', 'B'],
      closes: [Float64Array.from([100, 120, 120, 120]), Float64Array.from([100, 100, 100, 100])],
    };
    const result = run(prices, constant([0.5, 0.5]), { costRates: Float64Array.from([0.001, 0.001]) });
    expect(result.rebalances.map((r) => r.date)).toEqual(['2024-01-30', '2024-01-31']);
    const [first, second] = result.rebalances;
    expect(first.turnover).toBeCloseTo(1, 15); // bought from cash
    expect(first.costFraction).toBeCloseTo(0.001, 15);
    expect(second.turnover).toBeCloseTo(1 / 11, 14);
    expect(second.costFraction).toBeCloseTo(0.001 / 11, 16);
    expect(result.returns[0]).toBeCloseTo((1 - 0.001) * 1.1 - 1, 14);
    expect(result.returns[1]).toBeCloseTo(-0.001 / 11, 15);
    expect(second.costPaid).toBeCloseTo((0.001 / 11) * (0.999 * 1.1), 16);
    expect(Array.from(second.drifted!)).toEqual([expect.closeTo(0.6 / 1.1, 14), expect.closeTo(0.5 / 1.1, 14)]);
  });

  it('per-asset-class cost rates weight each traded amount by its own rate', () => {
    const prices: PriceTable = {
      dates: ['2024-01-30', '2024-01-31', '2024-02-01'],
      assets: ['A', 'B'],
      closes: [Float64Array.from([100, 120, 120]), Float64Array.from([100, 100, 100])],
    };
    const result = run(prices, constant([0.5, 0.5]), { costRates: Float64Array.from([0.002, 0.0005]) });
    const traded = 0.6 / 1.1 - 0.5;
    expect(result.rebalances[1].costFraction).toBeCloseTo(traded * 0.002 + traded * 0.0005, 16);
  });

  it('no look-ahead: changing every price after a date leaves every earlier rebalance bit-for-bit unchanged', () => {
    const base = syntheticPrices(6, 700, 11);
    const cut = 400;
    const z = syntheticPrices(6, 700, 99);
    const changed: PriceTable = {
      ...base,
      closes: base.closes.map((c, i) => Float64Array.from(c, (p, t) => (t > cut ? p * (z.closes[i][t] / 100) : p))),
    };
    const opts = { startIndex: 80, costRates: new Float64Array(6).fill(0.001) };
    const a = run(base, inverseVolatility, opts);
    const b = run(changed, inverseVolatility, opts);
    const early = a.rebalances.filter((r) => r.index <= cut);
    expect(early.length).toBeGreaterThan(10);
    early.forEach((r, k) => {
      const s = b.rebalances[k];
      expect(s.date).toBe(r.date);
      expect(Buffer.from(s.weights.buffer).equals(Buffer.from(r.weights.buffer))).toBe(true);
      expect(Object.is(s.turnover, r.turnover)).toBe(true);
      expect(Object.is(s.costFraction, r.costFraction)).toBe(true);
    });
    // ... and the check has teeth: a later rebalance does move.
    const later = a.rebalances.findIndex((r) => r.index > cut + 70);
    expect(Array.from(b.rebalances[later].weights)).not.toEqual(Array.from(a.rebalances[later].weights));
  });

  it('the no-look-ahead check catches an allocator that peeks at the next close', () => {
    const base = syntheticPrices(3, 300, 5);
    const peeking =
      (table: PriceTable): AllocateFn =>
      ({ index }) => {
        const next = table.closes.map((c) => c[Math.min(index + 1, c.length - 1)]);
        const total = next.reduce((x, y) => x + y, 0);
        return { ...fixed([]), weights: Float64Array.from(next, (v) => v / total) };
      };
    const a = run(base, peeking(base), { startIndex: 10 });
    const cut = a.rebalances[3].index;
    const changed: PriceTable = {
      ...base,
      closes: base.closes.map((c, i) => Float64Array.from(c, (p, t) => (t > cut ? p * (1 + 0.5 * i) : p))),
    };
    const b = run(changed, peeking(changed), { startIndex: 10 });
    expect(Array.from(b.rebalances[3].weights)).not.toEqual(Array.from(a.rebalances[3].weights));
  });

  it('the allocator sees a history that ends on the rebalance date', () => {
    const prices = syntheticPrices(2, 120, 3);
    const seen: [string, string, number][] = [];
    run(prices, (request) => {
      seen.push([request.date, request.history.dates.at(-1)!, request.history.closes[0].length]);
      return fixed([0.5, 0.5]);
    });
    for (const [date, lastSeen, rows] of seen) {
      expect(lastSeen).toBe(date);
      expect(rows).toBe(prices.dates.indexOf(date) + 1);
    }
  });

  it('monthly, quarterly and yearly schedules trade on the last trading day of each period, never on the final row', () => {
    const dates = [
      '2023-11-29',
      '2023-11-30',
      '2023-12-01',
      '2023-12-29',
      '2024-01-02',
      '2024-01-31',
      '2024-02-01',
      '2024-03-28',
      '2024-04-02',
    ];
    const pick = (s: 'monthly' | 'quarterly' | 'yearly') => [...scheduledRows(dates, 0, s)].map((i) => dates[i]);
    // 2024-02-01 is the last February day the data has, so it is February's rebalance.
    expect(pick('monthly')).toEqual([
      '2023-11-29',
      '2023-11-30',
      '2023-12-29',
      '2024-01-31',
      '2024-02-01',
      '2024-03-28',
    ]);
    expect(pick('quarterly')).toEqual(['2023-11-29', '2023-12-29', '2024-03-28']);
    expect(pick('yearly')).toEqual(['2023-11-29', '2023-12-29']);
  });

  it('the drift schedule rebalances exactly when a weight leaves its band (hand-computed)', () => {
    // 50/50; A rises 10% a day, B is flat. Drifted weight of A after k days: 1.1^k / (1.1^k + 1):
    // k = 1: 0.5238, k = 2: 0.5475 (> 0.5 + 0.04), so the first trade is on day 2, then again
    // two days later, and so on.
    const rows = 9;
    const prices: PriceTable = {
      dates: [
        '2024-05-01',
        '2024-05-02',
        '2024-05-03',
        '2024-05-06',
        '2024-05-07',
        '2024-05-08',
        '2024-05-09',
        '2024-05-10',
        '2024-05-13',
      ],
      assets: ['A', 'B'],
      closes: [Float64Array.from({ length: rows }, (_, t) => 100 * 1.1 ** t), new Float64Array(rows).fill(100)],
    };
    const result = run(prices, constant([0.5, 0.5]), { rebalance: 'drift', driftBand: 0.04 });
    expect(result.rebalances.map((r) => r.index)).toEqual([0, 2, 4, 6]);
    expect(result.rebalances[1].drifted![0]).toBeCloseTo(1.21 / 2.21, 14);
  });

  it('a failed allocation keeps the drifted weights without trading, and is reported', () => {
    const prices = syntheticPrices(2, 90, 4);
    let calls = 0;
    const result = run(prices, () =>
      calls++ === 1
        ? {
            status: 'infeasible',
            message: 'caps too low',
            weights: new Float64Array(2),
            forecastVolatility: null,
            forecastDiversificationRatio: null,
          }
        : fixed([0.5, 0.5]),
    );
    const failed = result.rebalances[1];
    expect(failed.status).toBe('infeasible');
    expect(failed.message).toBe('caps too low');
    expect(failed.turnover).toBe(0);
    expect(Array.from(failed.weights)).toEqual(Array.from(failed.drifted!));
  });

  it('stops with CancelledError when the cancel check fires, returning nothing', () => {
    const prices = syntheticPrices(2, 400, 4);
    let calls = 0;
    expect(() =>
      runWalkForward({
        prices,
        assets: prices.assets,
        settings: settings(2),
        allocate: constant([0.5, 0.5]),
        shouldCancel: () => ++calls > 3,
      }),
    ).toThrow(expect.objectContaining({ name: 'CancelledError' }));
  });

  it('reports progress up to the total', () => {
    const prices = syntheticPrices(2, 200, 4);
    const seen: [number, number][] = [];
    run(prices, constant([0.5, 0.5]), {}, { onProgress: (d, t) => seen.push([d, t]) });
    expect(seen.at(-1)).toEqual([199, 199]);
    expect(seen.every(([d], k) => k === 0 || d >= seen[k - 1][0])).toBe(true);
  });

  it('realised DR: 1 for one asset, about sqrt(2) for two independent equal-vol assets (Choueifaty and Coignard 2008: DR = sqrt(N / (1 + (N - 1) rho)))', () => {
    const one = syntheticPrices(1, 300, 8);
    for (const r of run(one, constant([1])).rebalances)
      if (r.holding.realisedDiversificationRatio !== null)
        expect(r.holding.realisedDiversificationRatio).toBeCloseTo(1, 12);
    const z = normals(21);
    const rows = 2520;
    const closes = [new Float64Array(rows), new Float64Array(rows)];
    const level = [100, 100];
    for (let t = 0; t < rows; t++)
      for (let i = 0; i < 2; i++) {
        if (t > 0) level[i] *= 1 + 0.01 * z();
        closes[i][t] = level[i];
      }
    const two: PriceTable = { dates: weekdays('2010-01-01', rows), assets: ['A', 'B'], closes };
    const result = run(two, constant([0.5, 0.5]));
    const metrics = walkForwardMetrics(result, 0);
    expect(metrics.averageRealisedDiversificationRatio!).toBeGreaterThan(Math.SQRT2 - 0.05);
    expect(metrics.averageRealisedDiversificationRatio!).toBeLessThan(Math.SQRT2 + 0.05);
  });
});

describe('walk-forward engine with part of the portfolio in cash', () => {
  it('current holdings below 100% keep the rest in cash at the cash rate until the first trade (hand-computed)', () => {
    // 60% in A (rises 10%), 40% in cash at 1.0001^252 - 1 a year, i.e. 0.01% a day:
    // 0.6 x 1.1 + 0.4 x 1.0001 = 1.06004.
    const prices: PriceTable = {
      dates: ['2024-03-04', '2024-03-05', '2024-03-06'],
      assets: ['A'],
      closes: [Float64Array.from([100, 110, 110])],
    };
    const cashRate = 1.0001 ** 252 - 1;
    const failing: AllocateFn = () => ({
      status: 'infeasible',
      weights: new Float64Array(1),
      forecastVolatility: null,
      forecastDiversificationRatio: null,
    });
    const result = runWalkForward({
      prices,
      assets: ['A'],
      settings: settings(1, { rebalance: 'yearly', cashRate }),
      allocate: failing,
      initialWeights: Float64Array.from([0.6]),
    });
    expect(result.returns[0]).toBeCloseTo(0.06004, 12);
  });
});

describe('realised over forecast volatility', () => {
  it('stays near 1 when the forecast is the true volatility, and near 2 when it is half of it (the issue: a good forecast keeps it near 1)', () => {
    const z = normals(31);
    const rows = 2520 * 2;
    const c = new Float64Array(rows);
    let level = 100;
    for (let t = 0; t < rows; t++) {
      if (t > 0) level *= 1 + 0.01 * z();
      c[t] = level;
    }
    const prices: PriceTable = { dates: weekdays('2000-01-03', rows), assets: ['A'], closes: [c] };
    const forecasting =
      (vol: number): AllocateFn =>
      () => ({ ...fixed([1]), forecastVolatility: vol });
    const truth = 0.01 * Math.sqrt(252);
    const good = walkForwardMetrics(run(prices, forecasting(truth)), 0).volatilityRatio!;
    const low = walkForwardMetrics(run(prices, forecasting(truth / 2)), 0).volatilityRatio!;
    expect(good.count).toBeGreaterThan(200);
    expect(good.mean).toBeGreaterThan(0.97);
    expect(good.mean).toBeLessThan(1.03);
    expect(good.p10).toBeLessThan(1);
    expect(good.p90).toBeGreaterThan(1);
    expect(low.mean / good.mean).toBeCloseTo(2, 10);
  });
});
