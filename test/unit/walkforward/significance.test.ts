import { describe, expect, it } from 'vitest';
import { compareCandidates, jobsonKorkieMemmel, normalCdf } from '../../../shared-core/walkforward/significance.js';
import { standardDeviation } from '../../../shared-core/stability/quantile.js';
import { normals } from './synthetic.js';

function pair(T: number, seed: number, rho: number, muA: number, muB: number, sd = 0.01) {
  const z = normals(seed);
  const a = new Float64Array(T);
  const b = new Float64Array(T);
  for (let t = 0; t < T; t++) {
    const x = z();
    const y = rho * x + Math.sqrt(1 - rho * rho) * z();
    a[t] = muA + sd * x;
    b[t] = muB + sd * y;
  }
  return { a, b };
}

describe('significance of differences between candidates', () => {
  it('the normal CDF matches tabulated values (Abramowitz and Stegun 1964, table 26.1)', () => {
    expect(normalCdf(0)).toBeCloseTo(0.5, 7);
    expect(normalCdf(1.96)).toBeCloseTo(0.9750021, 6);
    expect(normalCdf(-1)).toBeCloseTo(0.1586553, 6);
  });

  it('a candidate compared with itself differs by exactly 0 with p-value 1', () => {
    const { a } = pair(500, 1, 0, 0.0004, 0);
    const c = compareCandidates(
      { id: 'x', returns: a },
      { id: 'y', returns: a },
      { periodsPerYear: 252, cashRate: 0, draws: 200 },
    );
    expect(c.sharpeRatio).toEqual({ difference: 0, lower: 0, upper: 0, pValue: 1 });
    expect(c.volatility.upper).toBe(0);
    expect(c.method).toMatch(/Politis and Romano 1994/);
  });

  it('is deterministic for a seed and changes with the seed', () => {
    const { a, b } = pair(400, 2, 0.5, 0.0005, 0.0001);
    const run = (seed: number) =>
      compareCandidates(
        { id: 'a', returns: a },
        { id: 'b', returns: b },
        { periodsPerYear: 252, cashRate: 0, draws: 300, seed },
      );
    expect(run(5)).toEqual(run(5));
    expect(run(5).sharpeRatio.lower).not.toBe(run(6).sharpeRatio.lower);
  });

  it('the bootstrap spread of a Sharpe difference matches the i.i.d. variance (1 + SR^2/2)/T per series (Lo 2002, Financial Analysts Journal 58)', () => {
    // Two independent i.i.d. normal series with per-period Sharpe 0.05: Var(SR_a - SR_b) = 2 (1 + 0.05^2 / 2) / T.
    const T = 2000;
    const { a, b } = pair(T, 3, 0, 0.0005, 0.0005);
    const c = compareCandidates(
      { id: 'a', returns: a },
      { id: 'b', returns: b },
      { periodsPerYear: 1, cashRate: 0, draws: 2000, meanBlockLength: 1, seed: 9 },
    );
    const expected = Math.sqrt((2 * (1 + 0.05 ** 2 / 2)) / T);
    const bootstrapSd = (c.sharpeRatio.upper - c.sharpeRatio.lower) / (2 * 1.959964);
    expect(bootstrapSd / expected).toBeGreaterThan(0.9);
    expect(bootstrapSd / expected).toBeLessThan(1.1);
  });

  it('detects a large Sharpe difference and not a zero one', () => {
    const strong = pair(2520, 4, 0.3, 0.001, -0.0005);
    const c = compareCandidates(
      { id: 'a', returns: strong.a },
      { id: 'b', returns: strong.b },
      { periodsPerYear: 252, cashRate: 0, draws: 1000 },
    );
    expect(c.sharpeRatio.lower).toBeGreaterThan(0);
    expect(c.sharpeRatio.pValue).toBeLessThan(0.01);
    expect(c.iidTest.pValue).toBeLessThan(0.01);
    const none = pair(2520, 5, 0.3, 0.0003, 0.0003);
    const d = compareCandidates(
      { id: 'a', returns: none.a },
      { id: 'b', returns: none.b },
      { periodsPerYear: 252, cashRate: 0, draws: 1000 },
    );
    expect(d.sharpeRatio.lower).toBeLessThan(0);
    expect(d.sharpeRatio.upper).toBeGreaterThan(0);
  });

  it('the volatility difference interval covers the true difference', () => {
    // a has daily sd 0.01, b has 0.015: annualised difference -0.005 x sqrt(252) = -0.0794.
    const z = normals(6);
    const a = Float64Array.from({ length: 2520 }, () => 0.01 * z());
    const b = Float64Array.from({ length: 2520 }, () => 0.015 * z());
    const c = compareCandidates(
      { id: 'a', returns: a },
      { id: 'b', returns: b },
      { periodsPerYear: 252, cashRate: 0, draws: 1000 },
    );
    expect(c.volatility.lower).toBeLessThan(-0.005 * Math.sqrt(252));
    expect(c.volatility.upper).toBeGreaterThan(-0.005 * Math.sqrt(252));
    expect(c.volatility.upper).toBeLessThan(0);
  });

  it('the Jobson-Korkie-Memmel z statistic has unit spread under equal Sharpe ratios (Memmel 2003, Finance Letters 1)', () => {
    const zs: number[] = [];
    for (let k = 0; k < 400; k++) {
      const { a, b } = pair(250, 100 + k, 0.6, 0.0006, 0.0006);
      zs.push(jobsonKorkieMemmel(a, b, 0).z);
    }
    expect(standardDeviation(zs)).toBeGreaterThan(0.88);
    expect(standardDeviation(zs)).toBeLessThan(1.12);
  });
});
