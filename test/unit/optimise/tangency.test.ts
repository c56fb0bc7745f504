import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fromRows } from '../../../shared-core/linalg/matrix.js';
import { parseScenario } from '../../../shared-core/scenario/schema.js';
import { attempt, ids, solve, weightsArray } from './helpers.js';
import { failed } from '../../support/candidate-status.js';

interface TangencyCase {
  name: string;
  riskFreeRate: number;
  longOnly: boolean;
  cap: number | null;
  weights: number[];
  sharpe: number;
  solver: string;
}

// Tangency portfolios written by test/reference/optimise/tangency.py: the closed form
// Sigma^-1 (mu - rf 1) (Tobin 1958) long-short, and Debian's cvxopt long-only with caps, checked
// there against the efficient frontier searched by scipy.
const fixture = JSON.parse(
  readFileSync(new URL('../../reference/fixtures/optimise/tangency.json', import.meta.url), 'utf8'),
) as { covariance: number[][]; expectedReturns: number[]; cases: TangencyCase[] };
const S = fromRows(fixture.covariance);
const n = S.rows;
const expectedReturns = Object.fromEntries(ids(n).map((a, i) => [a, fixture.expectedReturns[i]]));

const sharpeOf = (w: number[], rf: number) => {
  let ret = 0;
  let variance = 0;
  for (let i = 0; i < n; i++) {
    ret += w[i] * fixture.expectedReturns[i];
    for (let j = 0; j < n; j++) variance += w[i] * S.data[i * n + j] * w[j];
  }
  return (ret - rf) / Math.sqrt(variance);
};

describe('max-sharpe over a risk-free rate: the tangency portfolio', () => {
  it.each(fixture.cases)('$name: the weights and Sharpe ratio of the reference ($solver)', (c) => {
    const constraints = c.longOnly
      ? { weightBounds: { default: [0, c.cap!] as [number, number] } }
      : { longOnly: false };
    const r = solve(S, { method: 'max-sharpe', riskFreeRate: c.riskFreeRate }, constraints, { expectedReturns });
    expect(r.status).toBe('optimal');
    const w = weightsArray(r, n);
    w.forEach((v, i) => expect(Math.abs(v - c.weights[i]), ids(n)[i]).toBeLessThan(1e-7));
    expect(sharpeOf(w, c.riskFreeRate)).toBeCloseTo(c.sharpe, 10);
  });

  it('a rate of zero is the same as no rate, to the last digit', () => {
    const constraints = { weightBounds: { default: [0, 0.35] as [number, number] } };
    const none = solve(S, { method: 'max-sharpe' }, constraints, { expectedReturns });
    const zero = solve(S, { method: 'max-sharpe', riskFreeRate: 0 }, constraints, { expectedReturns });
    expect(zero.weights).toEqual(none.weights);
  });

  // First-order conditions of the long-only tangency portfolio without caps (a cap that binds
  // adds its own multiplier, so the held assets' returns then differ from it by a constant).
  it('long-only: every held asset earns rf + beta (mu_P - rf), the return its beta to the portfolio asks; left-out ones no more', () => {
    const rf = 0.03;
    const r = solve(S, { method: 'max-sharpe', riskFreeRate: rf }, {}, { expectedReturns });
    for (const e of r.explanations!.assets) {
      const mu = expectedReturns[e.asset];
      expect(e.measure).toBe(mu);
      if (e.reason === 'held') expect(e.threshold).toBeCloseTo(mu, 8);
      if (e.reason === 'excluded') expect(mu).toBeLessThanOrEqual(e.threshold! + 1e-9);
    }
    expect(r.explanations!.assets.some((e) => e.reason === 'held')).toBe(true);
    expect(r.explanations!.assets.some((e) => e.reason === 'excluded')).toBe(true);
  });

  it('a rate above every reachable expected return is infeasible, in words naming the rate', () => {
    const r = failed(attempt(S, { method: 'max-sharpe', riskFreeRate: 0.5 }, {}, { expectedReturns }));
    expect(r.status).toBe('infeasible');
    expect(r.message).toMatch(/expected return above the risk-free rate of 50%/);
  });
});

describe('the riskFreeRate option of max-sharpe in the scenario document', () => {
  const doc = (objective: unknown) => ({
    format: 'holdfast-scenario@1',
    name: 'rate',
    baseCurrency: 'EUR',
    candidates: [{ id: 'ms', estimator: { method: 'sample' }, objective }],
  });

  it('is accepted, annualised, as a fraction', () => {
    const p = parseScenario(doc({ method: 'max-sharpe', riskFreeRate: 0.02 }));
    expect(p.ok).toBe(true);
  });

  it('outside (-1, 1) or on another objective it is refused at its JSON path', () => {
    const high = parseScenario(doc({ method: 'max-sharpe', riskFreeRate: 2 }));
    expect(high.ok).toBe(false);
    if (!high.ok) expect(high.errors[0].location.path).toBe('candidates[0].objective.riskFreeRate');
    const elsewhere = parseScenario(doc({ method: 'min-variance', riskFreeRate: 0.02 }));
    expect(elsewhere.ok).toBe(false);
  });
});
