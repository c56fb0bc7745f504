import { describe, expect, it } from 'vitest';
import { annualised, estimateCovariance } from '../../../shared-core/estimators/registry.js';
import type { EstimateContext } from '../../../shared-core/estimators/types.js';
import type { EstimatorSpec } from '../../../shared-core/scenario/estimator-spec.js';
import { CASES, flat, loadFixture, matrix, relativeError } from './fixtures.js';

const daily: EstimateContext = { frequency: 'daily' };
const TOLERANCE = 1e-10;

describe.each(CASES)('estimators agree with the reference libraries on %s', (name) => {
  const fixture = loadFixture(name);
  const returns = matrix(fixture.returns);
  const run = (spec: EstimatorSpec) => estimateCovariance(returns, spec, daily);

  it('sample: numpy.cov with divisor T - 1 (numpy 1.24.2)', () => {
    const e = run({ method: 'sample' });
    expect(relativeError(e.covariance.data, flat(fixture.sample.covariance))).toBeLessThan(TOLERANCE);
    expect(e.diagnostics.shrinkage).toBeNull();
    expect(e.diagnostics.observations).toBe(fixture.T);
  });

  it('ewma: the formula of the issue evaluated with numpy, for lambda 0.94 and a 30-period half-life', () => {
    const e = run({ method: 'ewma', lambda: 0.94 });
    const ref = fixture.ewma['lambda0.94'];
    expect(relativeError(e.covariance.data, flat(ref.covariance))).toBeLessThan(TOLERANCE);
    expect(e.diagnostics.effectiveObservations).toBeCloseTo(ref.effectiveObservations, 8);
    const h = run({ method: 'ewma', halfLife: 30 });
    expect(relativeError(h.covariance.data, flat(fixture.ewma.halfLife30.covariance))).toBeLessThan(TOLERANCE);
    // Daily data default to lambda 0.94 (RiskMetrics Technical Document, 1996).
    expect(relativeError(run({ method: 'ewma' }).covariance.data, flat(ref.covariance))).toBeLessThan(TOLERANCE);
  });

  it('ledoit-wolf scaled-identity: covariance_ and shrinkage_ of sklearn.covariance.LedoitWolf (scikit-learn 1.2.1)', () => {
    const e = run({ method: 'ledoit-wolf' });
    const ref = fixture.ledoitWolf.scaledIdentity;
    expect(relativeError(e.covariance.data, flat(ref.covariance))).toBeLessThan(TOLERANCE);
    expect(relativeError([e.diagnostics.shrinkage ?? NaN], [ref.shrinkage])).toBeLessThan(TOLERANCE);
  });

  it('ledoit-wolf constant-correlation: the estimator of Ledoit and Wolf (2004, J. Portfolio Management 30(4)) written out in numpy', () => {
    const e = run({ method: 'ledoit-wolf', target: 'constant-correlation' });
    const ref = fixture.ledoitWolf.constantCorrelation;
    expect(relativeError(e.covariance.data, flat(ref.covariance))).toBeLessThan(TOLERANCE);
    expect(relativeError([e.diagnostics.shrinkage ?? NaN], [ref.shrinkage])).toBeLessThan(TOLERANCE);
  });

  it('ledoit-wolf single-index: the estimator of Ledoit and Wolf (2003, J. Empirical Finance 10) written out in numpy', () => {
    const e = run({ method: 'ledoit-wolf', target: 'single-index' });
    const ref = fixture.ledoitWolf.singleIndex;
    expect(relativeError(e.covariance.data, flat(ref.covariance))).toBeLessThan(TOLERANCE);
    expect(relativeError([e.diagnostics.shrinkage ?? NaN], [ref.shrinkage])).toBeLessThan(TOLERANCE);
  });

  it('oas: covariance_ and shrinkage_ of sklearn.covariance.OAS (scikit-learn 1.2.1)', () => {
    const e = run({ method: 'oas' });
    expect(relativeError(e.covariance.data, flat(fixture.oas.covariance))).toBeLessThan(TOLERANCE);
    expect(relativeError([e.diagnostics.shrinkage ?? NaN], [fixture.oas.shrinkage])).toBeLessThan(TOLERANCE);
  });

  it('denoised: Marchenko-Pastur clipping (Laloux et al. 1999) with numpy.linalg.eigh', () => {
    const e = run({ method: 'denoised' });
    expect(relativeError(e.covariance.data, flat(fixture.denoised.covariance))).toBeLessThan(TOLERANCE);
    expect(e.diagnostics.eigenvaluesClipped).toBe(fixture.denoised.eigenvaluesClipped);
  });

  it('robust: Tyler (1987) shape with MAD scales, against the fixed point iterated in numpy', () => {
    if (!fixture.robust) {
      expect(() => run({ method: 'robust' })).toThrow(/needs more periods than assets/);
      return;
    }
    const e = run({ method: 'robust' });
    expect(relativeError(e.covariance.data, flat(fixture.robust.covariance))).toBeLessThan(TOLERANCE);
    expect(e.diagnostics.converged).toBe(true);
  });

  it('condition numbers agree with numpy.linalg.cond', () => {
    for (const [key, spec] of [
      ['ledoitWolfScaledIdentity', { method: 'ledoit-wolf' }],
      ['oas', { method: 'oas' }],
      ['sample', { method: 'sample' }],
    ] as const) {
      const ref = fixture.conditionNumbers[key];
      const got = run(spec).diagnostics.conditionNumber;
      if (ref === undefined) expect(got).toBe(Infinity);
      else expect(Math.abs(got - ref) / ref).toBeLessThan(1e-7);
    }
  });

  it('annualised is periods per year times the per-period covariance (252 for daily data)', () => {
    const e = run({ method: 'sample' });
    const a = annualised(e);
    expect(e.periodsPerYear).toBe(252);
    expect(a.data[0]).toBeCloseTo(252 * e.covariance.data[0], 18);
    expect(
      estimateCovariance(returns, { method: 'sample' }, { frequency: 'daily', periodsPerYear: 260 }).periodsPerYear,
    ).toBe(260);
  });
});
