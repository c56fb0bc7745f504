import { describe, expect, it } from 'vitest';
import { nonlinearShrinkage } from '../../../shared-core/estimators/nonlinear.js';
import { estimateCovariance } from '../../../shared-core/estimators/registry.js';
import { zeros } from '../../../shared-core/linalg/matrix.js';
import { CASES, flat, loadFixture, matrix, relativeError } from './fixtures.js';

describe('analytical nonlinear shrinkage (Ledoit and Wolf 2020, Annals of Statistics 48)', () => {
  it.each(CASES)(
    "agrees with the numpy version of the authors' published function on %s (N below and above T)",
    (name) => {
      const f = loadFixture<{ returns: number[][]; nonlinear: { covariance: number[][] } }>(name);
      const e = nonlinearShrinkage(matrix(f.returns));
      // 1e-7 rather than 1e-10: the Hilbert transform of the kernel has a logarithmic singularity
      // at |x| = sqrt(5), so rounding differences in the eigenvalues (numpy's LAPACK against
      // our QL) are amplified where two eigenvalues sit near that distance apart. The numpy version
      // keeps the plain formula, whose cancellation far from the kernel costs it digits; the
      // precision itself is checked at 60 digits in nonlinear-precision.test.ts.
      expect(relativeError(e.covariance.data, flat(f.nonlinear.covariance))).toBeLessThan(1e-7);
      expect(e.eigenvalues.every((d) => d > 0)).toBe(true);
      expect(Number.isFinite(e.conditionNumber)).toBe(true);
    },
  );

  it("beats the sample covariance and linear shrinkage in Frobenius loss on the population of the paper's simulations (20 % of eigenvalues 1, 40 % 3, 40 % 10), N = 100, T = 200", () => {
    const n = 100;
    const t = 200;
    const scale = Array.from({ length: n }, (_, i) => Math.sqrt(i < 20 ? 1 : i < 60 ? 3 : 10));
    let s = 99;
    const uniform = () => {
      s = (s * 48271) % 2147483647;
      return (s + 0.5) / 2147483648;
    };
    const normal = () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
    const loss = { sample: 0, linear: 0, nonlinear: 0 };
    for (let rep = 0; rep < 5; rep++) {
      const x = zeros(t, n);
      for (let k = 0; k < t; k++) for (let i = 0; i < n; i++) x.data[k * n + i] = scale[i] * normal();
      const frobenius = (c: Float64Array) => {
        let sum = 0;
        for (let i = 0; i < n; i++)
          for (let j = 0; j < n; j++) sum += (c[i * n + j] - (i === j ? scale[i] ** 2 : 0)) ** 2;
        return Math.sqrt(sum);
      };
      loss.sample += frobenius(estimateCovariance(x, { method: 'sample' }, { frequency: 'daily' }).covariance.data);
      loss.linear += frobenius(
        estimateCovariance(x, { method: 'ledoit-wolf' }, { frequency: 'daily' }).covariance.data,
      );
      loss.nonlinear += frobenius(nonlinearShrinkage(x).covariance.data);
    }
    expect(loss.nonlinear).toBeLessThan(loss.linear);
    expect(loss.linear).toBeLessThan(loss.sample);
  });

  it('is the scenario method `nonlinear`: the same matrix, annualised by the frequency, with its diagnostics', () => {
    const f = loadFixture<{ returns: number[][] }>(CASES[0]);
    const x = matrix(f.returns);
    const direct = nonlinearShrinkage(x);
    const e = estimateCovariance(x, { method: 'nonlinear' }, { frequency: 'daily' });
    expect(e.method).toBe('nonlinear');
    expect(Array.from(e.covariance.data)).toEqual(Array.from(direct.covariance.data));
    expect(e.periodsPerYear).toBe(252);
    expect(e.diagnostics).toMatchObject({
      observations: x.rows,
      effectiveObservations: x.rows - 1,
      conditionNumber: direct.conditionNumber,
      shrinkage: null,
    });
  });
});
