import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { sampleCovariance } from '../../../shared-core/estimators/sample.js';
import { zeros } from '../../../shared-core/linalg/matrix.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { propagateShock } from '../../../shared-core/stress/conditional-shock.js';
import { runWalkForward } from '../../../shared-core/walkforward/engine.js';
import { perPeriodRate, walkForwardMetrics } from '../../../shared-core/walkforward/metrics.js';
import { jobsonKorkieMemmel } from '../../../shared-core/walkforward/significance.js';

// Open data: datasets::EuStockMarkets from R (Debian r-base-core), rows on invented consecutive
// weekdays (test/reference/estimators/eustockmarkets.R). Expected values: numpy 1.24 / scipy 1.10
// by test/reference/walkforward/make_fixtures.py, an independent vectorised implementation.
const source = JSON.parse(
  readFileSync(new URL('../../reference/fixtures/estimators/eustockmarkets.json', import.meta.url), 'utf8'),
) as { assets: string[]; dates: string[]; closes: number[][] };
const ref = JSON.parse(
  readFileSync(new URL('../../reference/fixtures/walkforward/eustock-walkforward.json', import.meta.url), 'utf8'),
);

const prices: PriceTable = {
  dates: source.dates,
  assets: source.assets,
  closes: source.assets.map((_, i) => Float64Array.from(source.closes, (row) => row[i])),
};

function walk(weights: number[], rates: number[]) {
  return runWalkForward({
    prices,
    assets: prices.assets,
    settings: {
      rebalance: 'monthly',
      driftBand: 0.05,
      costRates: Float64Array.from(rates),
      startIndex: ref.settings.startIndex,
      periodsPerYear: 252,
      cashRate: ref.settings.cashRate,
    },
    allocate: () => ({
      status: 'optimal',
      weights: Float64Array.from(weights),
      forecastVolatility: null,
      forecastDiversificationRatio: null,
    }),
  });
}

describe('walk-forward on EuStockMarkets against numpy (test/reference/walkforward/make_fixtures.py)', () => {
  const result = walk(ref.settings.weights, ref.settings.costRates);

  it('rebalance dates, turnover, costs and the growth curve agree to 1e-12', () => {
    expect(result.rebalances.map((r) => r.date)).toEqual(ref.rebalanceDates);
    result.rebalances.forEach((r, k) => {
      expect(r.turnover).toBeCloseTo(ref.turnovers[k], 12);
      expect(r.costFraction).toBeCloseTo(ref.costs[k], 14);
    });
    expect(result.growth.length).toBe(ref.growth.length);
    let worst = 0;
    result.growth.forEach((v, t) => (worst = Math.max(worst, Math.abs(v / ref.growth[t] - 1))));
    expect(worst).toBeLessThan(1e-12);
  });

  it('annualised return, volatility, Sharpe ratio and maximum drawdown agree with numpy', () => {
    const m = walkForwardMetrics(result, ref.settings.cashRate);
    expect(m.annualisedReturn).toBeCloseTo(ref.annualisedReturn, 11);
    expect(m.volatility).toBeCloseTo(ref.volatility, 11);
    expect(m.sharpeRatio).toBeCloseTo(ref.sharpeRatio, 10);
    expect(m.maxDrawdown.depth).toBeCloseTo(ref.maxDrawdown.depth, 11);
    expect(m.maxDrawdown.peakDate).toBe(ref.maxDrawdown.peakDate);
    expect(m.maxDrawdown.troughDate).toBe(ref.maxDrawdown.troughDate);
  });

  it('the Jobson-Korkie-Memmel statistic against equal weights agrees with numpy and scipy.stats.norm', () => {
    const equal = walk([0.25, 0.25, 0.25, 0.25], [0, 0, 0, 0]);
    let worst = 0;
    equal.growth.forEach((v, t) => (worst = Math.max(worst, Math.abs(v / ref.equalWeightGrowth[t] - 1))));
    expect(worst).toBeLessThan(1e-12);
    const test = jobsonKorkieMemmel(result.returns, equal.returns, perPeriodRate(ref.settings.cashRate, 252));
    expect(test.z).toBeCloseTo(ref.jobsonKorkieMemmel.z, 9);
    expect(test.pValue).toBeCloseTo(ref.jobsonKorkieMemmel.pValue, 6);
  });

  it('a 20% fall of EU1 carried by the sample covariance equals the least-squares regression moves (numpy.linalg.lstsq)', () => {
    const T = prices.dates.length - 1;
    const r = zeros(T, 4);
    for (let t = 0; t < T; t++)
      for (let i = 0; i < 4; i++) r.data[t * 4 + i] = Math.log(prices.closes[i][t + 1] / prices.closes[i][t]);
    const estimate = sampleCovariance(r, { method: 'sample' }, { frequency: 'daily' });
    const { assetMoves } = propagateShock(estimate.covariance, [1, 0, 0, 0], -0.2, 'log');
    assetMoves.forEach((m, i) => expect(m).toBeCloseTo(ref.shockEU1minus20[i], 12));
  });
});
