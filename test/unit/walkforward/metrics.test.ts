import { describe, expect, it } from 'vitest';
import { maxDrawdown } from '../../../shared-core/analytics/drawdown.js';
import {
  annualisedReturn,
  annualisedVolatility,
  sharpeRatio,
  spread,
  walkForwardMetrics,
} from '../../../shared-core/walkforward/metrics.js';
import type { WalkForwardResult } from '../../../shared-core/walkforward/types.js';

// Worked examples computed by hand (the arithmetic is in each comment). Definitions: Bacon (2008),
// "Practical Portfolio Performance Measurement and Attribution", 2nd ed., Wiley (annualised
// return, volatility); Sharpe (1994), J. Portfolio Management 21(1) (the ex post Sharpe ratio);
// maximum drawdown: common practice.
const monthly = [0.02, -0.01, 0.03, 0.01];

describe('performance metrics on worked examples', () => {
  it('annualised return is geometric: (prod(1 + r))^(P/n) - 1', () => {
    // 1.02 x 0.99 = 1.0098; x 1.03 = 1.040094; x 1.01 = 1.05049494; over 4 months of 12:
    // 1.05049494^3 - 1 = 0.159263.
    const growth = 1.02 * 0.99 * 1.03 * 1.01;
    expect(growth).toBeCloseTo(1.05049494, 12);
    expect(annualisedReturn(monthly, 12)).toBeCloseTo(growth ** 3 - 1, 12);
    expect(annualisedReturn(monthly, 12)).toBeCloseTo(0.159263, 6);
  });

  it('volatility is the n-1 standard deviation times sqrt(P)', () => {
    // mean 0.0125; squared deviations 0.00005625, 0.00050625, 0.00030625, 0.00000625, sum 0.000875;
    // / 3 = 0.000291667; sqrt = 0.0170783; x sqrt(12) = 0.0591608.
    expect(annualisedVolatility(monthly, 12)).toBeCloseTo(0.0591608, 6);
  });

  it('Sharpe ratio is mean over standard deviation of excess returns, times sqrt(P)', () => {
    // Cash 0%: 0.0125 / 0.0170783 x sqrt(12) = 2.535463.
    expect(sharpeRatio(monthly, 12, 0)).toBeCloseTo(2.535463, 5);
    // Cash 12.6825% a year = 1% a month exactly: (0.0125 - 0.01) / 0.0170783 x sqrt(12) = 0.507093.
    const cash = 1.01 ** 12 - 1;
    expect(sharpeRatio(monthly, 12, cash)).toBeCloseTo(0.507093, 5);
  });

  it('maximum drawdown is the largest peak-to-trough fall, with peak, trough and recovery dates', () => {
    // Curve: 1, 1.2, 0.9, 1.0, 1.25, 1.1: the fall from 1.2 to 0.9 is 25%, regained on d4.
    const curve = [1, 1.2, 0.9, 1.0, 1.25, 1.1];
    const returns = curve.slice(1).map((v, k) => v / curve[k] - 1);
    const dates = ['d1', 'd2', 'd3', 'd4', 'd5'];
    expect(maxDrawdown(returns, dates, 'd0')).toEqual({
      depth: expect.closeTo(0.25, 12),
      peakDate: 'd1',
      troughDate: 'd2',
      recoveryDate: 'd4',
    });
    // A fall from the start that is never regained: peak is the start date, no recovery.
    expect(maxDrawdown([-0.1, 0.05], ['e1', 'e2'], 'e0')).toEqual({
      depth: expect.closeTo(0.1, 12),
      peakDate: 'e0',
      troughDate: 'e1',
      recoveryDate: null,
    });
    expect(maxDrawdown([0.01, 0.02], ['f1', 'f2'], 'f0').depth).toBe(0);
  });

  it('spread reports quantiles of type 7 (Hyndman and Fan 1996)', () => {
    // For 1..10: median 5.5, 10% quantile 1 + 0.9 = 1.9, 90% quantile 9.1.
    const s = spread([3, 1, 2, 4, 5, 6, 7, 8, 9, 10])!;
    expect(s.median).toBeCloseTo(5.5, 12);
    expect(s.p10).toBeCloseTo(1.9, 12);
    expect(s.p90).toBeCloseTo(9.1, 12);
    expect(spread([])).toBeNull();
  });

  it('turnover per year leaves out the initial purchase; costs and the volatility ratio add up per rebalance', () => {
    const holding = (v: number | null, periods = 20) => ({
      periods,
      realisedVolatility: v,
      realisedDiversificationRatio: 1.2,
    });
    const base = {
      status: 'optimal' as const,
      weights: new Float64Array(1),
      drifted: null,
      forecastDiversificationRatio: 1,
    };
    const result: WalkForwardResult = {
      assets: ['A'],
      startDate: 's',
      dates: Array.from({ length: 504 }, (_, k) => `d${k}`),
      returns: new Float64Array(504).fill(0.0001),
      growth: new Float64Array(504),
      periodsPerYear: 252,
      rebalances: [
        {
          ...base,
          date: 'a',
          index: 0,
          turnover: 1,
          costFraction: 0.001,
          costPaid: 0.001,
          forecastVolatility: 0.1,
          holding: holding(0.12),
        },
        {
          ...base,
          date: 'b',
          index: 1,
          turnover: 0.3,
          costFraction: 0.0003,
          costPaid: 0.00031,
          forecastVolatility: 0.1,
          holding: holding(0.08),
        },
        {
          ...base,
          date: 'c',
          index: 2,
          turnover: 0.1,
          costFraction: 0.0001,
          costPaid: 0.0001,
          forecastVolatility: null,
          holding: holding(0.2, 3),
        },
      ],
    };
    const m = walkForwardMetrics(result, 0);
    expect(m.years).toBe(2);
    expect(m.turnoverPerYear).toBeCloseTo(0.4 / 2, 15);
    expect(m.initialTurnover).toBe(1);
    expect(m.costsPaid).toBeCloseTo(0.00141, 15);
    expect(m.costDragPerYear).toBeCloseTo(0.0014 / 2, 15);
    expect(m.volatilityRatio).toMatchObject({ count: 2, mean: expect.closeTo(1, 12), median: expect.closeTo(1, 12) });
    expect(m.averageRealisedDiversificationRatio).toBeCloseTo(1.2, 12);
  });
});
