import { describe, expect, it } from 'vitest';
import { fromRows, zeros, type Matrix } from '../../../shared-core/linalg/matrix.js';
import { diversificationRatio } from '../../../shared-core/analytics/risk.js';
import { buildMandate, mandateViolation } from '../../../shared-core/optimise/mandate.js';
import { directForm } from '../../../shared-core/optimise/formulate.js';
import { phaseOne, solveQp } from '../../../shared-core/optimise/qp/index.js';
import type { Constraints } from '../../../shared-core/scenario/schema.js';
import type { ObjectiveSpec } from '../../../shared-core/scenario/objective-spec.js';
import { attempt, ids, solve, weightsArray } from './helpers.js';
import { failed } from '../../support/candidate-status.js';
import { randomCovariance } from './random-problems.js';
import { seededRng } from '../../../shared-core/stability/rng.js';

/**
 * max DR by a one-dimensional search: DR*(t) = t / sqrt(v(t)), v(t) = min w'Sw over the mandate
 * with sigma'w = t. sqrt(v) is convex in t (partial minimisation of a norm over an affine family),
 * so DR* is quasi-concave and golden-section search finds its maximum. Independent of the
 * homogenised QP it checks: it solves QPs in the original weights only.
 */
function drByParametricSearch(S: Matrix, constraints: Constraints, current: Record<string, number>): number {
  const n = S.rows;
  const sigma = Array.from({ length: n }, (_, i) => Math.sqrt(S.data[i * n + i]));
  const m = buildMandate(ids(n), constraints, current, undefined);
  const base = directForm(m, S).qp;
  const vAt = (t: number): number => {
    const qp = { ...base, A: [...base.A, { idx: [...Array(n).keys()], val: sigma }], b: Float64Array.of(...base.b, t) };
    const r = solveQp(qp);
    return r.status === 'optimal' ? t / Math.sqrt(2 * r.solution.objective) : -Infinity;
  };
  // Range of sigma'w over the mandate: minimise and maximise it (tiny ridge keeps the QP strictly convex).
  const ridge = zeros(m.variables, m.variables);
  for (let i = 0; i < m.variables; i++) ridge.data[i * m.variables + i] = 1e-12;
  const ext = (sign: number) => {
    const q = new Float64Array(m.variables);
    for (let i = 0; i < n; i++) q[i] = sign * sigma[i];
    const r = solveQp({ ...base, P: ridge, q });
    if (r.status !== 'optimal') throw new Error('range');
    return Array.from(r.solution.x.subarray(0, n)).reduce((s, v, i) => s + v * sigma[i], 0);
  };
  let lo = ext(1);
  let hi = ext(-1);
  const g = (Math.sqrt(5) - 1) / 2;
  let a = hi - g * (hi - lo);
  let b = lo + g * (hi - lo);
  let fa = vAt(a);
  let fb = vAt(b);
  for (let k = 0; k < 80; k++) {
    if (fa < fb) {
      lo = a;
      a = b;
      fa = fb;
      b = lo + g * (hi - lo);
      fb = vAt(b);
    } else {
      hi = b;
      b = a;
      fb = fa;
      a = hi - g * (hi - lo);
      fa = vAt(a);
    }
  }
  return Math.max(fa, fb);
}

describe('turnover against current holdings (a non-homogeneous limit)', () => {
  const S = randomCovariance(12, 101, 3, 1, 0.15);
  const current = Object.fromEntries(ids(12).map((a, i) => [a, i < 4 ? 0.25 : 0]));

  it('the homogenised QP reaches the same maximum DR as a golden-section search on the parametric QP', () => {
    for (const maxTurnover of [0.2, 0.5, 0.9]) {
      const c: Constraints = { maxTurnover, weightBounds: { default: [0, 0.3] } };
      const r = solve(S, { method: 'max-diversification' }, c, { current });
      expect(r.status).toBe('optimal');
      const ref = drByParametricSearch(S, c, current);
      expect(Math.abs(r.metrics!.diversificationRatio - ref) / ref).toBeLessThan(1e-9);
      expect(r.metrics!.turnover).toBeLessThanOrEqual(maxTurnover + 1e-9);
    }
  });

  it('a binding turnover limit is flagged and priced in DR, matching a re-solve with the limit moved', () => {
    const c = (t: number): Constraints => ({ maxTurnover: t });
    const r = solve(S, { method: 'max-diversification' }, c(0.3), { current });
    const b = r.explanations!.binding.find((x) => x.constraint.startsWith('turnover limit'))!;
    expect(b).toBeDefined();
    expect(r.explanations!.flags.join(' ')).toMatch(/30% turnover limit binds/);
    const h = 1e-5;
    const up = solve(S, { method: 'max-diversification' }, c(0.3 + h), { current }).metrics!.diversificationRatio;
    const dn = solve(S, { method: 'max-diversification' }, c(0.3 - h), { current }).metrics!.diversificationRatio;
    expect(b.shadowPrice).toBeGreaterThan(0);
    expect(Math.abs(b.shadowPrice - (up - dn) / (2 * h)) / b.shadowPrice).toBeLessThan(1e-4);
    expect(b.text).toMatch(/^raising the turnover limit from 30.0% to 31.0% would raise DR by about/);
  });
});

describe('shadow prices from the multipliers match a re-solve with the limit moved', () => {
  const S = randomCovariance(10, 202, 3, 1, 0.15);
  const equity = ['A001', 'A002', 'A003', 'A004', 'A005'];
  const cases: { objective: ObjectiveSpec; metric: 'diversificationRatio' | 'volatility' }[] = [
    { objective: { method: 'max-diversification' }, metric: 'diversificationRatio' },
    { objective: { method: 'min-variance' }, metric: 'volatility' },
  ];
  for (const { objective, metric } of cases)
    it(`${objective.method}: band maximum, band minimum and caps`, () => {
      const base = solve(S, objective, { weightBounds: { default: [0, 1] } });
      const inEquity = equity.reduce((s, a) => s + base.weights[a], 0);
      // Bands that cut the unconstrained answer from both sides.
      const gmax = Math.round(inEquity * 70) / 100;
      expect(gmax).toBeGreaterThan(0.05);
      const make = (gm: number, cap: number): Constraints => ({
        weightBounds: { default: [0, cap] },
        groups: [{ name: 'Equity', members: equity, max: gm }],
      });
      const cap = 0.25;
      const r = solve(S, objective, make(gmax, cap));
      expect(r.status).toBe('optimal');
      const band = r.explanations!.binding.find((b) => b.constraint.startsWith('Equity band maximum'));
      expect(band).toBeDefined();
      const h = 1e-5;
      const f = (gm: number, c: number) => solve(S, objective, make(gm, c)).metrics![metric];
      const fd = (f(gmax + h, cap) - f(gmax - h, cap)) / (2 * h);
      expect(Math.abs(band!.shadowPrice - fd)).toBeLessThan(1e-4 * Math.abs(fd) + 1e-9);
      const caps = r.explanations!.binding.filter((b) => b.constraint.startsWith('cap on'));
      if (caps.length === 1) {
        const fdc = (f(gmax, cap + h) - f(gmax, cap - h)) / (2 * h);
        expect(Math.abs(caps[0].shadowPrice - fdc)).toBeLessThan(1e-4 * Math.abs(fdc) + 1e-9);
      }
    });

  it('a binding band minimum is priced as lowering it', () => {
    const c = (min: number): Constraints => ({ groups: [{ name: 'Bonds', members: ['A009', 'A010'], min }] });
    const base = solve(S, { method: 'max-diversification' }, {});
    const min = Math.round((base.weights.A009 + base.weights.A010 + 0.15) * 100) / 100;
    const r = solve(S, { method: 'max-diversification' }, c(min));
    const b = r.explanations!.binding.find((x) => x.constraint.startsWith('Bonds band minimum'))!;
    const h = 1e-5;
    const fd =
      (solve(S, { method: 'max-diversification' }, c(min + h)).metrics!.diversificationRatio -
        solve(S, { method: 'max-diversification' }, c(min - h)).metrics!.diversificationRatio) /
      (2 * h);
    expect(b.shadowPrice).toBeLessThan(0);
    expect(Math.abs(b.shadowPrice - fd) / Math.abs(fd)).toBeLessThan(1e-4);
    expect(b.text).toMatch(/^lowering the Bonds band minimum/);
  });
});

describe('infeasible mandates are explained in the user’s words', () => {
  const S = randomCovariance(4, 303);
  it('caps that add to less than 100%', () => {
    const r = failed(attempt(S, { method: 'max-diversification' }, { weightBounds: { default: [0, 0.2] } }));
    expect(r.status).toBe('infeasible');
    expect(r.message).toBe('the per-asset upper bounds add to 80%, below the 100% invested');
  });
  it('a band minimum above the caps of its members', () => {
    const r = failed(
      attempt(
        randomCovariance(8, 304),
        { method: 'min-variance' },
        {
          weightBounds: { default: [0, 0.1], A005: [0, 1], A006: [0, 1] },
          groups: [{ name: 'Equity', members: ['A001', 'A002', 'A003', 'A004'], min: 0.6 }],
        },
      ),
    );
    expect(r.status).toBe('infeasible');
    expect(r.message).toBe('Equity band minimum 60% and the caps on its 4 members (10% each) cannot both hold');
  });
  it('a turnover limit too tight for the caps: named from the phase-one certificate', () => {
    const r = failed(
      attempt(
        S,
        { method: 'max-diversification' },
        { maxTurnover: 0.1, weightBounds: { default: [0, 0.4] } },
        {
          current: { A001: 0.7, A002: 0.3 },
        },
      ),
    );
    expect(r.status).toBe('infeasible');
    expect(r.message).toMatch(/^these limits cannot all hold: .*the 10% turnover limit/);
    expect(r.message).toMatch(/cap of 40% on A001/);
  });
});

describe('the covariance is checked before solving', () => {
  it('a duplicated asset makes it singular: an error advising a shrinkage estimator, no weights', () => {
    const base = randomCovariance(5, 404);
    const S = zeros(6, 6);
    const src = (i: number) => (i === 5 ? 0 : i);
    for (let i = 0; i < 6; i++) for (let j = 0; j < 6; j++) S.data[i * 6 + j] = base.data[src(i) * 5 + src(j)];
    const r = failed(attempt(S, { method: 'max-diversification' }));
    expect(r.status).toBe('error');
    expect(r.message).toMatch(/singular or badly conditioned/);
    expect(r.message).toMatch(/shrinkage estimator such as ledoit-wolf or oas/);
    expect('weights' in r).toBe(false);
  });
  it('more assets than observations is named as the cause', () => {
    const r = failed(
      attempt(
        fromRows([
          [1, 1],
          [1, 1],
        ]),
        { method: 'min-variance' },
        {},
        { observations: 1, estimator: 'sample', conditionNumber: Infinity },
      ),
    );
    expect(r.message).toMatch(/2 assets with only 1 observations make the sample covariance singular/);
  });
});

describe('long-short, gross exposure and liquidity', () => {
  const S = randomCovariance(8, 505, 3, 0.2);
  it('gross exposure caps sum |w| and binds when the unconstrained optimum is more leveraged', () => {
    const free = solve(S, { method: 'max-diversification' }, { longOnly: false });
    const gross = Object.values(free.weights).reduce((s, v) => s + Math.abs(v), 0);
    expect(gross).toBeGreaterThan(1.3);
    const r = solve(S, { method: 'max-diversification' }, { longOnly: false, maxGrossExposure: 1.3 });
    const g = Object.values(r.weights).reduce((s, v) => s + Math.abs(v), 0);
    expect(g).toBeCloseTo(1.3, 9);
    expect(r.explanations!.binding.some((b) => b.constraint.startsWith('gross-exposure limit'))).toBe(true);
    expect(r.metrics!.diversificationRatio).toBeLessThan(free.metrics!.diversificationRatio);
  });
  it('the illiquid cap and per-asset liquidity caps from assetInfo hold', () => {
    const assetInfo = {
      A001: { liquidity: 'illiquid' as const },
      A002: { liquidity: 'illiquid' as const },
      A003: { liquidityCap: 0.05 },
    };
    const r = solve(S, { method: 'equal-weight' }, { illiquidMax: 0.1 }, { assetInfo });
    expect(r.weights.A001 + r.weights.A002).toBeLessThanOrEqual(0.1 + 1e-12);
    expect(r.weights.A003).toBeLessThanOrEqual(0.05 + 1e-12);
    const cap = r.explanations!.assets.find((a) => a.asset === 'A003')!;
    expect(cap.reason).toBe('at-upper-bound');
  });
});

describe('random feasibility fuzzing', () => {
  it('every optimum meets every limit to 1e-9; every infeasible verdict is confirmed by phase one', () => {
    const methods: ObjectiveSpec['method'][] = [
      'max-diversification',
      'min-variance',
      'max-decorrelation',
      'equal-risk-contribution',
      'equal-weight',
      'inverse-volatility',
    ];
    let optimal = 0;
    let infeasible = 0;
    for (let seed = 1; seed <= 120; seed++) {
      const rng = seededRng(seed * 31);
      const n = 4 + rng.int(12);
      const S = randomCovariance(n, seed + 1000, 3, 1, 0.1);
      const assets = ids(n);
      const cap = (0.8 + 1.5 * rng.next()) / n;
      const members = assets.filter(() => rng.next() < 0.4);
      const c: Constraints = {
        weightBounds: { default: [0, Math.min(1, cap)] },
        ...(members.length
          ? { groups: [{ name: 'G', members, min: 0.3 * rng.next(), max: 0.3 + 0.6 * rng.next() }] }
          : {}),
        ...(rng.next() < 0.4 ? { maxTurnover: 0.1 + rng.next() } : {}),
      };
      const current = Object.fromEntries(assets.map((a) => [a, 1 / n]));
      const method = methods[seed % methods.length];
      const r = attempt(S, { method } as ObjectiveSpec, c, { current });
      const m = buildMandate(assets, c, current, undefined);
      if (r.status === 'optimal') {
        optimal++;
        expect(mandateViolation(m, weightsArray(r, n)), `seed ${seed}`).toBeLessThan(1e-9);
        expect(r.solver.kktResidual, `seed ${seed} ${method}`).toBeLessThan(1e-10);
      } else {
        expect(r.status, `seed ${seed} ${r.message}`).toBe('infeasible');
        infeasible++;
        // Phase one on the original (direct) form of the mandate.
        expect(phaseOne(directForm(m, S).qp).feasible, `seed ${seed}`).toBe(false);
      }
    }
    expect(optimal).toBeGreaterThan(60);
    expect(infeasible).toBeGreaterThan(5);
  });
});

describe('diversification ratio helper agrees', () => {
  it('DR metric equals the analytics function', () => {
    const S = randomCovariance(6, 606);
    const r = solve(S, { method: 'min-variance' });
    expect(r.metrics!.diversificationRatio).toBeCloseTo(diversificationRatio(weightsArray(r, 6), S), 14);
  });
});
