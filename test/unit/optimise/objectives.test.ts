import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fromRows, multiplyVector, toRows } from '../../../shared-core/linalg/matrix.js';
import { portfolioVolatility } from '../../../shared-core/analytics/risk.js';
import { attempt, equicorrelated, ids, solve, solveLinear, weightsArray } from './helpers.js';
import { failed } from '../../support/candidate-status.js';
import { randomCovariance } from './random-problems.js';

const fixture = (name: string) =>
  JSON.parse(readFileSync(new URL(`../../reference/fixtures/optimise/${name}`, import.meta.url), 'utf8'));

function correlations(S: ReturnType<typeof randomCovariance>, w: number[]): number[] {
  const n = S.rows;
  const sw = multiplyVector(S, w);
  const vp = Math.sqrt(w.reduce((s, v, i) => s + v * sw[i], 0));
  return Array.from(sw, (v, i) => v / (Math.sqrt(S.data[i * n + i]) * vp));
}

describe('maximum diversification (Choueifaty and Coignard 2008; Choueifaty, Froidure and Reynier 2013)', () => {
  it('with shorting and no other limit the optimum is proportional to Sigma^-1 sigma and every correlation with it is 1/DR', () => {
    const S = randomCovariance(12, 3);
    const r = solve(S, { method: 'max-diversification' }, { longOnly: false });
    expect(r.status).toBe('optimal');
    const sigma = Array.from({ length: 12 }, (_, i) => Math.sqrt(S.data[i * 12 + i]));
    const raw = solveLinear(toRows(S), sigma);
    const sum = raw.reduce((a, b) => a + b, 0);
    const w = weightsArray(r, 12);
    w.forEach((v, i) => expect(v).toBeCloseTo(raw[i] / sum, 10));
    const dr = r.metrics!.diversificationRatio;
    for (const c of correlations(S, w)) expect(c).toBeCloseTo(1 / dr, 10);
  });

  it('long-only: every held asset has correlation 1/DR with the optimum, every excluded asset at least 1/DR', () => {
    for (const seed of [5, 6, 7, 8]) {
      const S = randomCovariance(30, seed, 3, 1, 0.15);
      const r = solve(S, { method: 'max-diversification' });
      expect(r.status).toBe('optimal');
      const w = weightsArray(r, 30);
      const t = 1 / r.metrics!.diversificationRatio;
      const rho = correlations(S, w);
      let held = 0;
      w.forEach((v, i) => {
        if (v > 1e-9) {
          held++;
          expect(Math.abs(rho[i] - t)).toBeLessThan(1e-9);
        } else expect(rho[i]).toBeGreaterThanOrEqual(t - 1e-9);
      });
      expect(held).toBeGreaterThan(1);
      expect(held).toBeLessThan(30);
      const ex = r.explanations!.assets.find((a) => a.reason === 'excluded')!;
      expect(ex.text).toMatch(/^left out: correlation \d\.\d\d with the portfolio, threshold 1\/DR = \d\.\d\d/);
    }
  });

  it('an asset kept out by a band is explained by the band and its own threshold, which its correlation meets (no contradictory sentence)', () => {
    const S = equicorrelated(4, 0.15, 0.3);
    const r = solve(
      S,
      { method: 'max-diversification' },
      { groups: [{ name: 'Alternatives', members: ['A004'], min: 0, max: 0 }] },
    );
    const out = r.explanations!.assets.find((a) => a.asset === 'A004')!;
    expect(out.reason).toBe('excluded');
    expect(out.correlationWithPortfolio!).toBeLessThan(1 / r.metrics!.diversificationRatio);
    expect(out.correlationWithPortfolio!).toBeGreaterThanOrEqual(out.threshold! - 1e-9);
    expect(out.text).toMatch(
      /once the binding limits are counted \(1\/DR = \d\.\d\d without them\); the Alternatives band binds;/,
    );
    expect(out.text).not.toMatch(/below the threshold it would be held/);
  });

  it('an asset kept out by limits on other assets is told its own threshold', () => {
    const S = equicorrelated(4, 0.15, 0.3);
    const r = solve(
      S,
      { method: 'max-diversification' },
      { groups: [{ name: 'Core', members: ['A001', 'A002', 'A003'], min: 1, max: 1 }] },
    );
    const out = r.explanations!.assets.find((a) => a.asset === 'A004')!;
    expect(out.reason).toBe('excluded');
    expect(out.correlationWithPortfolio!).toBeLessThan(1 / r.metrics!.diversificationRatio);
    expect(out.correlationWithPortfolio!).toBeGreaterThanOrEqual(out.threshold! - 1e-9);
    expect(out.text).toMatch(/^left out: correlation -?\d\.\d\d with the portfolio/);
    expect(out.text).toMatch(/once the binding limits are counted/);
  });

  it('with caps and bands binding, each asset meets its own threshold as the optimality conditions require: equal when held freely, at least when left out, at most at a cap (KKT of the homogenised QP, derived in formulate.ts)', () => {
    let moved = 0;
    for (const seed of [3, 5, 8, 13, 21]) {
      const S = randomCovariance(24, seed);
      const r = solve(
        S,
        { method: 'max-diversification' },
        {
          weightBounds: { default: [0, 0.09] },
          groups: [
            { name: 'First', members: ids(24).slice(0, 8), min: 0.45 },
            { name: 'Last', members: ids(24).slice(16), max: 0.1 },
          ],
        },
      );
      expect(r.status).toBe('optimal');
      for (const a of r.explanations!.assets) {
        const gap = a.correlationWithPortfolio! - a.threshold!;
        if (Math.abs(a.threshold! - 1 / r.metrics!.diversificationRatio) > 0.005) moved++;
        if (a.reason === 'excluded') expect(gap).toBeGreaterThanOrEqual(-1e-8);
        else if (a.reason === 'at-upper-bound') expect(gap).toBeLessThanOrEqual(1e-8);
        else expect(Math.abs(gap)).toBeLessThan(1e-8);
      }
    }
    expect(moved).toBeGreaterThan(0); // the limits did move thresholds: the check is not the plain 1/DR one
  });

  it('an asset at its cap has correlation at most 1/DR (first-order conditions with an upper bound)', () => {
    const S = randomCovariance(20, 11);
    const r = solve(S, { method: 'max-diversification' }, { weightBounds: { default: [0, 0.12] } });
    const w = weightsArray(r, 20);
    const t = 1 / r.metrics!.diversificationRatio;
    const rho = correlations(S, w);
    const capped = w.map((v, i) => (Math.abs(v - 0.12) < 1e-9 ? i : -1)).filter((i) => i >= 0);
    expect(capped.length).toBeGreaterThan(0);
    for (const i of capped) expect(rho[i]).toBeLessThanOrEqual(t + 1e-9);
    expect(r.explanations!.binding.some((b) => b.constraint.startsWith('cap on'))).toBe(true);
  });

  it('two assets: the long-only optimum is the inverse-volatility portfolio (closed form of Sigma^-1 sigma)', () => {
    const S = fromRows([
      [0.04, 0.3 * 0.2 * 0.1],
      [0.3 * 0.2 * 0.1, 0.01],
    ]);
    const r = solve(S, { method: 'max-diversification' });
    expect(r.weights.A001).toBeCloseTo(0.1 / 0.3, 12);
    expect(r.weights.A002).toBeCloseTo(0.2 / 0.3, 12);
  });
});

describe('equal risk contribution (Maillard, Roncalli and Teiletche 2010)', () => {
  const ref = fixture('erc-four-asset.json');
  const S = fromRows(ref.covariance);

  it('reproduces the four-asset example recomputed by test/reference/optimise/erc_four_asset.py (numpy, scipy)', () => {
    const r = solve(S, { method: 'equal-risk-contribution' });
    expect(r.status).toBe('optimal');
    weightsArray(r, 4).forEach((v, i) => expect(v).toBeCloseTo(ref.weights[i], 10));
    // The published rounded weights 38.4 / 19.2 / 24.3 / 18.2% (recalled from memory).
    expect(weightsArray(r, 4).map((v) => Math.round(v * 1000) / 10)).toEqual([38.4, 19.2, 24.3, 18.2]);
    for (const a of ids(4)) expect(r.metrics!.riskContributions[a]).toBeCloseTo(0.25, 12);
  });

  it('its volatility lies between the minimum-variance and the equal-weight portfolio’s', () => {
    for (const seed of [21, 22, 23]) {
      const C = randomCovariance(15, seed);
      const erc = solve(C, { method: 'equal-risk-contribution' }).metrics!.volatility;
      const mv = solve(C, { method: 'min-variance' }).metrics!.volatility;
      const ew = solve(C, { method: 'equal-weight' }).metrics!.volatility;
      expect(mv).toBeLessThanOrEqual(erc + 1e-12);
      expect(erc).toBeLessThanOrEqual(ew + 1e-12);
    }
  });

  it('risk budgets: contributions equal the budgets', () => {
    const budgets = { A001: 0.4, A002: 0.3, A003: 0.2, A004: 0.1 };
    const r = solve(S, { method: 'equal-risk-contribution', budgets });
    for (const [a, b] of Object.entries(budgets)) expect(r.metrics!.riskContributions[a]).toBeCloseTo(b, 11);
  });

  it('under a binding cap the sequential QP meets the cap and keeps the others’ contributions in budget order', () => {
    const r = solve(S, { method: 'equal-risk-contribution' }, { weightBounds: { default: [0, 0.3] } });
    expect(r.status).toBe('optimal');
    const w = weightsArray(r, 4);
    expect(w[0]).toBeCloseTo(0.3, 9);
    expect(w.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    for (const v of w) expect(v).toBeLessThanOrEqual(0.3 + 1e-9);
    // KKT of min F(y) = 1/2 y'Sy - sum b ln y over the cone (erc.ts): with y = w scaled to
    // y'Sy = 1, (S y)_i - b_i / y_i is the same (the budget row's multiplier) for every uncapped asset.
    const sw = multiplyVector(S, w);
    const s = 1 / Math.sqrt(w.reduce((a, v, i) => a + v * sw[i], 0));
    const grad = w.map((v, i) => s * sw[i] - 0.25 / (s * v));
    expect(grad[1]).toBeCloseTo(grad[2], 9);
    expect(grad[2]).toBeCloseTo(grad[3], 9);
    // and the capped asset would want more weight: its gradient is lower.
    expect(grad[0]).toBeLessThan(grad[1]);
    expect(r.explanations!.flags.join(' ')).toMatch(/limits bind/);
  });
});

describe('every objective on equal volatilities and equal correlations gives equal weights (derived)', () => {
  const n = 6;
  const rho = 0.3;
  const S = equicorrelated(n, 0.2, rho);
  const objectives = [
    { method: 'max-diversification' },
    { method: 'min-variance' },
    { method: 'equal-risk-contribution' },
    { method: 'max-decorrelation' },
    { method: 'inverse-volatility' },
    { method: 'equal-weight' },
  ] as const;
  for (const objective of objectives)
    it(objective.method, () => {
      const r = solve(S, objective);
      expect(r.status).toBe('optimal');
      for (const v of weightsArray(r, n)) expect(v).toBeCloseTo(1 / n, 10);
      expect(r.metrics!.diversificationRatio).toBeCloseTo(Math.sqrt(n / (1 + (n - 1) * rho)), 12);
    });
  it('max-sharpe with equal expected returns', () => {
    const expectedReturns = Object.fromEntries(ids(n).map((a) => [a, 0.05]));
    const r = solve(S, { method: 'max-sharpe' }, {}, { expectedReturns });
    for (const v of weightsArray(r, n)) expect(v).toBeCloseTo(1 / n, 10);
  });
});

describe('minimum variance', () => {
  it('two assets: w1 = (s2^2 - s12) / (s1^2 + s2^2 - 2 s12) (closed form)', () => {
    const s1 = 0.25;
    const s2 = 0.15;
    const c = 0.2 * s1 * s2;
    const r = solve(
      fromRows([
        [s1 * s1, c],
        [c, s2 * s2],
      ]),
      { method: 'min-variance' },
    );
    expect(r.weights.A001).toBeCloseTo((s2 * s2 - c) / (s1 * s1 + s2 * s2 - 2 * c), 12);
  });

  it('long-short with no bounds returns the unconstrained optimum, proportional to Sigma^-1 1', () => {
    const S = randomCovariance(10, 31, 3, 0.1);
    const r = solve(S, { method: 'min-variance' }, { longOnly: false });
    const raw = solveLinear(toRows(S), Array(10).fill(1));
    const sum = raw.reduce((a, b) => a + b, 0);
    weightsArray(r, 10).forEach((v, i) => expect(v).toBeCloseTo(raw[i] / sum, 10));
  });

  it('with caps, bands and turnover binding, each asset’s beta meets its own threshold: equal when held freely, at least when left out, at most at a cap (KKT of the direct QP, derived in formulate.ts); the same on the correlation matrix for maximum decorrelation', () => {
    let moved = 0;
    for (const method of ['min-variance', 'max-decorrelation'] as const)
      for (const seed of [4, 9, 16]) {
        const S = randomCovariance(20, seed);
        const n = 20;
        const current = Object.fromEntries(ids(n).map((a) => [a, 1 / n]));
        const r = solve(
          S,
          { method },
          {
            weightBounds: { default: [0, 0.12] },
            groups: [{ name: 'Front', members: ids(n).slice(0, 6), min: 0.4 }],
            ...(seed === 16 ? { maxTurnover: 0.5 } : {}),
          },
          { current },
        );
        expect(r.status).toBe('optimal');
        const w = weightsArray(r, n);
        const vols = Array.from({ length: n }, (_, i) => Math.sqrt(S.data[i * n + i]));
        const P =
          method === 'min-variance'
            ? S
            : fromRows(toRows(S).map((row, i) => row.map((v, j) => v / (vols[i] * vols[j]))));
        const Pw = multiplyVector(P, w);
        const wPw = w.reduce((a, x, i) => a + x * Pw[i], 0);
        r.explanations!.assets.forEach((a) => {
          const i = ids(n).indexOf(a.asset);
          const gap = Pw[i] / wPw - a.threshold!;
          if (Math.abs(a.threshold! - 1) > 0.005) moved++;
          if (a.reason === 'excluded') expect(gap).toBeGreaterThanOrEqual(-1e-8);
          else if (a.reason === 'at-upper-bound') expect(gap).toBeLessThanOrEqual(1e-8);
          else expect(Math.abs(gap)).toBeLessThan(1e-8);
        });
      }
    expect(moved).toBeGreaterThan(0);
  });

  it('its volatility is the lowest of all objectives under the same limits', () => {
    const S = randomCovariance(25, 41);
    const mv = solve(S, { method: 'min-variance' }).metrics!.volatility;
    for (const m of ['max-diversification', 'equal-risk-contribution', 'max-decorrelation', 'equal-weight'] as const)
      expect(solve(S, { method: m }).metrics!.volatility).toBeGreaterThanOrEqual(mv - 1e-12);
  });
});

describe('rules', () => {
  it('inverse volatility without binding limits is w_i proportional to 1 / sigma_i', () => {
    const S = randomCovariance(8, 51);
    const r = solve(S, { method: 'inverse-volatility' });
    const inv = Array.from({ length: 8 }, (_, i) => 1 / Math.sqrt(S.data[i * 8 + i]));
    const sum = inv.reduce((a, b) => a + b, 0);
    weightsArray(r, 8).forEach((v, i) => expect(v).toBeCloseTo(inv[i] / sum, 14));
    expect(r.explanations!.flags).toEqual([]);
  });

  it('where a limit cuts the rule the nearest feasible weights are returned and flagged', () => {
    const S = randomCovariance(5, 52);
    const r = solve(
      S,
      { method: 'equal-weight' },
      { groups: [{ name: 'Equity', members: ['A001', 'A002'], max: 0.3 }] },
    );
    expect(r.status).toBe('optimal');
    // Euclidean projection: the two members share 30%, the other three share 70% (by symmetry).
    expect(r.weights.A001).toBeCloseTo(0.15, 10);
    expect(r.weights.A003).toBeCloseTo(0.7 / 3, 10);
    expect(r.explanations!.flags[0]).toMatch(/limits cut the equal-weight rule/);
  });
});

describe('max-sharpe', () => {
  it('long-short without limits: w proportional to Sigma^-1 mu (tangency portfolio, common practice)', () => {
    const S = randomCovariance(7, 61);
    const mu = [0.05, 0.07, 0.03, 0.06, 0.04, 0.08, 0.05];
    const r = solve(
      S,
      { method: 'max-sharpe' },
      { longOnly: false },
      {
        expectedReturns: Object.fromEntries(ids(7).map((a, i) => [a, mu[i]])),
      },
    );
    const raw = solveLinear(toRows(S), mu);
    const sum = raw.reduce((a, b) => a + b, 0);
    weightsArray(r, 7).forEach((v, i) => expect(v).toBeCloseTo(raw[i] / sum, 10));
  });

  it('missing expected returns are an error naming the assets', () => {
    const r = failed(attempt(randomCovariance(3, 1), { method: 'max-sharpe' }, {}, { expectedReturns: { A001: 0.1 } }));
    expect(r.status).toBe('error');
    expect(r.message).toMatch(/A002, A003/);
  });
});

describe('portfolio volatility helper agrees with the reported metric', () => {
  it('volatility', () => {
    const S = randomCovariance(9, 71);
    const r = solve(S, { method: 'max-diversification' });
    expect(r.metrics!.volatility).toBeCloseTo(portfolioVolatility(weightsArray(r, 9), S), 14);
  });
});

describe("the walk-forward's light solve (detail: 'weights')", () => {
  it('gives the same weights, volatility and DR, without the effective bets or explanations', () => {
    for (const objective of [
      { method: 'max-diversification' },
      { method: 'equal-risk-contribution' },
      { method: 'min-variance' },
    ] as const) {
      const S = randomCovariance(25, 4);
      const full = solve(S, objective, { weightBounds: { default: [0, 0.15] } });
      const light = solve(S, objective, { weightBounds: { default: [0, 0.15] } }, { detail: 'weights' });
      expect(light.weights).toEqual(full.weights);
      expect(light.metrics!.volatility).toBe(full.metrics!.volatility);
      expect(light.metrics!.diversificationRatio).toBe(full.metrics!.diversificationRatio);
      expect(light.metrics!.effectiveBets).toBeNaN();
      expect(light.explanations).toBeUndefined();
    }
  });
});
