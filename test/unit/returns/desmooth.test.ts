import { describe, expect, it } from 'vitest';
import { desmooth, maLogLikelihood } from '../../../shared-core/returns/desmooth.js';
import { loadFixture } from '../estimators/fixtures.js';

interface Fixture {
  observed: number[];
  true: number[];
  thetaUsed: number[];
  ma: number[];
  intercept: number;
  loglik: number;
  theta: number[];
}
const f = loadFixture<Fixture>('desmoothing');

describe('desmoothing of smoothed returns (Getmansky, Lo and Makarov 2004)', () => {
  it("the exact MA(2) log-likelihood equals R's stats::arima (R 4.2.2) at R's estimates", () => {
    expect(maLogLikelihood(f.observed, f.intercept, f.ma)).toBeCloseTo(f.loglik, 8);
  });

  it("the maximum-likelihood smoothing profile theta matches R's arima(order = c(0, 0, 2), method = 'ML')", () => {
    const d = desmooth(f.observed);
    for (let j = 0; j < 3; j++) expect(Math.abs(d.theta[j] - f.theta[j])).toBeLessThan(1e-5);
    expect(d.theta.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 14);
    expect(d.logLikelihood).toBeGreaterThanOrEqual(f.loglik - 1e-8);
  });

  it('desmoothed returns recover the volatility the smoothing hid and remove the first-order autocorrelation', () => {
    const d = desmooth(f.observed);
    const sd = (v: ArrayLike<number>) => {
      const m = Array.from(v).reduce((a, b) => a + b, 0) / v.length;
      return Math.sqrt(Array.from(v).reduce((a, b) => a + (b - m) ** 2, 0) / (v.length - 1));
    };
    const lag1 = (v: ArrayLike<number>) => {
      const a = Array.from(v);
      const m = a.reduce((p, q) => p + q, 0) / a.length;
      let num = 0;
      let den = 0;
      for (let i = 0; i < a.length; i++) {
        den += (a[i] - m) ** 2;
        if (i > 0) num += (a[i] - m) * (a[i - 1] - m);
      }
      return num / den;
    };
    expect(sd(f.observed)).toBeLessThan(0.8 * sd(f.true));
    expect(Math.abs(sd(d.returns) / sd(f.true) - 1)).toBeLessThan(0.1);
    expect(lag1(f.observed)).toBeGreaterThan(0.3);
    expect(Math.abs(lag1(d.returns))).toBeLessThan(0.1);
    // With no smoothing in the data the smoothing index xi = sum theta^2 is near 1 (GLM 2004).
    expect(desmooth(f.true).smoothingIndex).toBeGreaterThan(0.85);
    expect(d.smoothingIndex).toBeLessThan(0.5);
  });
});

describe('buildReturns with desmoothing', () => {
  it("replaces the named asset's returns by their desmoothed values and reports its profile", async () => {
    const { buildReturns } = await import('../../../shared-core/returns/build-returns.js');
    const months: string[] = [];
    for (let k = 0; k <= f.observed.length; k++) {
      const y = 2000 + Math.floor(k / 12);
      const m = (k % 12) + 1;
      const last = new Date(Date.UTC(y, m, 0)).getUTCDate();
      months.push(`${y}-${String(m).padStart(2, '0')}-${last}`);
    }
    const fund = new Float64Array(months.length);
    const other = new Float64Array(months.length);
    fund[0] = other[0] = 100;
    for (let k = 1; k < months.length; k++) {
      fund[k] = fund[k - 1] * Math.exp(f.observed[k - 1]);
      other[k] = other[k - 1] * Math.exp(0.01 * Math.sin(k));
    }
    const table = { dates: months, assets: ['FUND', 'OTHER'], closes: [fund, other] };
    const r = buildReturns(table, { frequency: 'monthly', method: 'log', desmooth: ['FUND'] });
    const direct = desmooth(f.observed);
    expect(r.desmoothing[0].asset).toBe('FUND');
    for (let j = 0; j < 3; j++) expect(r.desmoothing[0].theta[j]).toBeCloseTo(direct.theta[j], 8);
    expect(r.returns.data[10 * 2]).toBeCloseTo(direct.returns[10], 8);
    expect(r.returns.data[10 * 2 + 1]).toBeCloseTo(0.01 * Math.sin(11), 12);
    expect(r.warnings.join('\n')).toMatch(/desmoothed FUND \(Getmansky, Lo and Makarov 2004\): theta 0\.589/);
    expect(() =>
      buildReturns(table, { frequency: 'monthly', method: 'log', desmooth: ['FUND'], from: '2019-06-01' }),
    ).toThrow(/cannot desmooth FUND: \d+ returns, at least 24/);
  });
});
