import { describe, expect, it } from 'vitest';
import { estimateCovariance } from '../../../shared-core/estimators/registry.js';
import { cholesky } from '../../../shared-core/linalg/cholesky.js';
import { zeros, type Matrix } from '../../../shared-core/linalg/matrix.js';
import { symmetricEigenvalues } from '../../../shared-core/linalg/symmetric-eigen.js';
import type { EstimatorSpec } from '../../../shared-core/scenario/estimator-spec.js';
import { loadFixture, matrix } from './fixtures.js';

/** Seeded returns of a one-factor model with uniform noise (invented data). */
function factorReturns(t: number, n: number, seed: number): Matrix {
  let s = seed;
  const next = () => {
    s = (s * 48271) % 2147483647;
    return s / 2147483647 - 0.5;
  };
  const beta = Array.from({ length: n }, () => 0.5 + next());
  const m = zeros(t, n);
  for (let k = 0; k < t; k++) {
    const f = 0.02 * next();
    for (let i = 0; i < n; i++) m.data[k * n + i] = beta[i] * f + 0.01 * (1 + i / n) * next();
  }
  return m;
}

const shrinkers: EstimatorSpec[] = [
  { method: 'ledoit-wolf', target: 'scaled-identity' },
  { method: 'ledoit-wolf', target: 'constant-correlation' },
  { method: 'ledoit-wolf', target: 'single-index' },
  { method: 'oas' },
];

describe('published properties of the estimators', () => {
  it('the shrinkage intensity lies in [0, 1] (Ledoit and Wolf 2004; Chen et al. 2010), for N below and above T', () => {
    for (let trial = 0; trial < 30; trial++) {
      const t = 12 + 7 * (trial % 6);
      const n = 3 + 5 * (trial % 7);
      const x = factorReturns(t, n, 1000 + trial);
      for (const spec of shrinkers) {
        const delta = estimateCovariance(x, spec, { frequency: 'daily' }).diagnostics.shrinkage;
        expect(delta).not.toBeNull();
        expect(delta!).toBeGreaterThanOrEqual(0);
        expect(delta!).toBeLessThanOrEqual(1);
      }
    }
  });

  it('with N > T the sample estimate is singular and every shrinkage estimate is positive definite (seeded data N=60, T=40)', () => {
    const x = matrix(loadFixture('wide').returns);
    const sample = estimateCovariance(x, { method: 'sample' }, { frequency: 'daily' });
    expect(sample.diagnostics.conditionNumber).toBe(Infinity);
    const values = symmetricEigenvalues(sample.covariance);
    // Rank at most T - 1 = 39: the 21 smallest eigenvalues are zero up to rounding.
    expect(Math.abs(values[20])).toBeLessThan(1e-12 * values[59]);
    expect(cholesky(sample.covariance)).toBeUndefined();
    for (const spec of [...shrinkers, { method: 'denoised' } as EstimatorSpec]) {
      const e = estimateCovariance(x, spec, { frequency: 'daily' });
      expect(cholesky(e.covariance), JSON.stringify(spec)).toBeDefined();
      expect(Number.isFinite(e.diagnostics.conditionNumber)).toBe(true);
      expect(symmetricEigenvalues(e.covariance)[0]).toBeGreaterThan(0);
    }
  });

  it('denoising keeps every sample variance and clips the eigenvalues below the Marchenko-Pastur edge', () => {
    const x = matrix(loadFixture('mid').returns);
    const s = estimateCovariance(x, { method: 'sample' }, { frequency: 'daily' }).covariance;
    const d = estimateCovariance(x, { method: 'denoised' }, { frequency: 'daily' });
    for (let i = 0; i < 30; i++) expect(d.covariance.data[i * 31]).toBeCloseTo(s.data[i * 31], 15);
    expect(d.diagnostics.eigenvaluesClipped).toBeGreaterThan(20);
  });

  it('the robust estimate resists gross outliers: three corrupted days move it far less than the sample covariance (Tyler 1987)', () => {
    const clean = factorReturns(300, 5, 77);
    const dirty = { ...clean, data: Float64Array.from(clean.data) };
    for (const k of [10, 150, 290]) for (let i = 0; i < 5; i++) dirty.data[k * 5 + i] += (i % 2 ? -1 : 1) * 0.5;
    const move = (spec: EstimatorSpec) => {
      const a = estimateCovariance(clean, spec, { frequency: 'daily' }).covariance.data;
      const b = estimateCovariance(dirty, spec, { frequency: 'daily' }).covariance.data;
      let diff = 0;
      let size = 0;
      for (let k = 0; k < a.length; k++) {
        diff = Math.max(diff, Math.abs(a[k] - b[k]));
        size = Math.max(size, Math.abs(a[k]));
      }
      return diff / size;
    };
    expect(move({ method: 'robust' })).toBeLessThan(0.1);
    expect(move({ method: 'sample' })).toBeGreaterThan(10);
  });

  it('EWMA weights: effective observations 1 / sum w^2 equal (1 + lambda)/(1 - lambda) for a long window, and monthly data default to 0.97 (RiskMetrics 1996)', () => {
    const x = factorReturns(2000, 3, 5);
    const e = estimateCovariance(x, { method: 'ewma' }, { frequency: 'daily' });
    expect(e.diagnostics.effectiveObservations).toBeCloseTo((1 + 0.94) / (1 - 0.94), 6);
    expect(estimateCovariance(x, { method: 'ewma' }, { frequency: 'monthly' }).diagnostics.lambda).toBe(0.97);
    expect(
      estimateCovariance(x, { method: 'ewma', halfLife: 10 }, { frequency: 'daily' }).diagnostics.lambda,
    ).toBeCloseTo(0.5 ** 0.1, 15);
  });
});
