import { describe, expect, it } from 'vitest';
import {
  assetVolatilities,
  correlationMatrix,
  diversificationRatio,
  effectiveBets,
  effectiveHoldings,
  marginalRisk,
  portfolioVariance,
  portfolioVolatility,
  riskContributions,
  trackingError,
} from '../../../shared-core/analytics/risk.js';
import { fromRows, zeros, type Matrix } from '../../../shared-core/linalg/matrix.js';
import { flat, loadFixture, matrix, relativeError } from '../estimators/fixtures.js';

function equalCorrelation(n: number, vol: number, rho: number): Matrix {
  const m = zeros(n, n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) m.data[i * n + j] = vol * vol * (i === j ? 1 : rho);
  return m;
}

/** Seeded covariance A A' / k + diagonal (positive definite). */
function randomCovariance(n: number, seed: number): Matrix {
  let s = seed;
  const next = () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647 - 0.5;
  };
  const k = n + 3;
  const a = Array.from({ length: n * k }, next);
  const m = zeros(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      let v = 0;
      for (let c = 0; c < k; c++) v += a[i * k + c] * a[j * k + c];
      m.data[i * n + j] = v / k + (i === j ? 0.01 : 0);
    }
  return m;
}

describe.each(['eustock', 'mid'])('risk analytics agree with numpy on the %s data set', (name) => {
  const f = loadFixture(name);
  const a = f.analytics!;
  const cov = matrix(f.sample.covariance);
  for (let k = 0; k < cov.data.length; k++) cov.data[k] *= 252; // the fixture's annualised covariance
  const w = a.weights;

  it('volatility, asset volatilities, correlation', () => {
    expect(relativeError([portfolioVolatility(w, cov)], [a.volatility])).toBeLessThan(1e-12);
    expect(relativeError([portfolioVariance(w, cov)], [a.volatility ** 2])).toBeLessThan(1e-12);
    expect(relativeError(assetVolatilities(cov), a.assetVolatilities)).toBeLessThan(1e-12);
    expect(relativeError(correlationMatrix(cov).data, flat(a.correlation))).toBeLessThan(1e-12);
  });

  it('diversification ratio (Choueifaty and Coignard 2008), marginal risk and Euler risk contributions', () => {
    expect(relativeError([diversificationRatio(w, cov)], [a.diversificationRatio])).toBeLessThan(1e-12);
    expect(relativeError(marginalRisk(w, cov), a.marginalRisk)).toBeLessThan(1e-12);
    expect(relativeError(riskContributions(w, cov), a.riskContributions)).toBeLessThan(1e-12);
  });

  it('effective number of bets from principal components (Meucci 2009), effective holdings, tracking error', () => {
    expect(relativeError([effectiveBets(w, cov)], [a.effectiveBets])).toBeLessThan(1e-9);
    expect(relativeError([effectiveHoldings(w)], [a.effectiveHoldings])).toBeLessThan(1e-12);
    expect(relativeError([trackingError(w, a.reference, cov)], [a.trackingError])).toBeLessThan(1e-12);
  });
});

describe('published properties of the risk figures', () => {
  it.each([
    [2, 0],
    [5, 0.3],
    [10, 0.6],
    [25, -0.02],
  ])(
    "equal vols and correlations: DR of equal weights is sqrt(N / (1 + (N-1) rho)) (derived: w'sigma = s, w'Sigma w = s^2 (1 + (N-1) rho) / N), N=%i rho=%f",
    (n, rho) => {
      const cov = equalCorrelation(n, 0.2, rho);
      const w = new Array(n).fill(1 / n);
      expect(diversificationRatio(w, cov)).toBeCloseTo(Math.sqrt(n / (1 + (n - 1) * rho)), 12);
    },
  );

  it("DR of any long-only portfolio is at least 1 (Choueifaty and Coignard 2008: sigma_p <= w'sigma by the triangle inequality); it is scale invariant", () => {
    let s = 7;
    const next = () => {
      s = (s * 48271) % 2147483647;
      return s / 2147483647;
    };
    for (let trial = 0; trial < 200; trial++) {
      const n = 2 + (trial % 9);
      const cov = randomCovariance(n, 100 + trial);
      const w: number[] = Array.from({ length: n }, () => (next() < 0.3 ? 0 : next()));
      if (Math.max(...w) === 0) w[0] = 1;
      const dr = diversificationRatio(w, cov);
      expect(dr).toBeGreaterThanOrEqual(1 - 1e-12);
      expect(
        diversificationRatio(
          w.map((v) => 3 * v),
          cov,
        ),
      ).toBeCloseTo(dr, 12);
    }
    // A single holding has DR exactly 1.
    expect(diversificationRatio([0, 1, 0], randomCovariance(3, 5))).toBeCloseTo(1, 14);
  });

  it('Euler risk contributions sum to 1, also for long-short weights', () => {
    const cov = randomCovariance(8, 42);
    const w = [0.3, -0.1, 0.25, 0.15, 0.2, -0.05, 0.1, 0.15];
    const rc = riskContributions(w, cov);
    expect(rc.reduce((x, y) => x + y, 0)).toBeCloseTo(1, 14);
    // sum_i w_i * marginal_i = sigma_p (Euler's theorem for a function homogeneous of degree 1).
    const m = marginalRisk(w, cov);
    expect(w.reduce((acc, v, i) => acc + v * m[i], 0)).toBeCloseTo(portfolioVolatility(w, cov), 14);
  });

  it('the equal-risk-contribution weights of Maillard, Roncalli and Teiletche (2010, JPM 36(4)) give every asset 1/4 of the risk', () => {
    const erc = loadFixture<{ covariance: number[][]; weights: number[] }>('erc-example');
    const rc = riskContributions(erc.weights, fromRows(erc.covariance));
    for (const c of rc) expect(c).toBeCloseTo(0.25, 12);
    // The paper's published weights, 38.4 / 19.2 / 24.3 / 18.2 % (recalled from memory), to 0.1 %.
    expect(erc.weights.map((v) => Math.round(v * 1000) / 10)).toEqual([38.4, 19.2, 24.3, 18.2]);
  });

  it('effective bets: N for inverse-volatility weights on uncorrelated assets, 1 for one holding (Meucci 2009)', () => {
    const vols = [0.1, 0.2, 0.05, 0.3];
    const cov = zeros(4, 4);
    vols.forEach((v, i) => (cov.data[i * 4 + i] = v * v));
    expect(
      effectiveBets(
        vols.map((v) => 1 / v),
        cov,
      ),
    ).toBeCloseTo(4, 10);
    expect(effectiveBets([0, 0, 1, 0], cov)).toBeCloseTo(1, 12);
  });

  it('effective holdings: 1 / sum w^2 for long-only weights summing to 1; N for equal weights', () => {
    expect(effectiveHoldings([0.25, 0.25, 0.25, 0.25])).toBeCloseTo(4, 14);
    expect(effectiveHoldings([0.5, 0.3, 0.2])).toBeCloseTo(1 / (0.25 + 0.09 + 0.04), 14);
  });

  it('tracking error against the same weights is 0; weights must match the covariance', () => {
    const cov = randomCovariance(3, 9);
    expect(trackingError([0.2, 0.3, 0.5], [0.2, 0.3, 0.5], cov)).toBe(0);
    expect(() => portfolioVariance([1, 0], cov)).toThrow(/2 weights for a 3-asset covariance/);
  });
});
