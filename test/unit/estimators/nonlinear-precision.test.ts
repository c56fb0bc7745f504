import { describe, expect, it } from 'vitest';
import {
  hilbertKernel,
  kernelEstimates,
  nullHilbert,
  shrunkEigenvalues,
} from '../../../shared-core/estimators/nonlinear.js';
import { loadFixture } from './fixtures.js';

interface KernelCase {
  name: string;
  description: string;
  N: number;
  n: number;
  h: number;
  eigenvalues: number[];
  density: number[];
  hilbert: number[];
  hilbertNull: number;
  shrunk: number[];
}

/** The largest entry-wise relative error. */
function relativeError(got: ArrayLike<number>, want: readonly number[]): number {
  expect(got.length).toBe(want.length);
  let err = 0;
  for (let i = 0; i < want.length; i++) err = Math.max(err, Math.abs(got[i] - want[i]) / Math.abs(want[i]));
  return err;
}

// The kernel sums of the analytical nonlinear shrinkage (Ledoit and Wolf 2020, Annals of
// Statistics 48), evaluated at 60 digits by mpmath from the same double eigenvalues and bandwidth
// (test/reference/estimators/nonlinear_hilbert.py), so that only our own rounding is measured.
// The required precision is 1e-8; the evaluation reaches about 1e-13, so the bound is 1e-12. The
// plain formula missed it by up to 3e-3 on the one-factor case (150 assets, 120 periods).
const fixture = loadFixture<{ kernel: [number, number][]; cases: KernelCase[] }>('nonlinear-hilbert');

describe('nonlinear shrinkage: the kernel terms against a 60-digit evaluation (mpmath)', () => {
  it("the kernel's Hilbert transform from 1e-6 to 1e6, both signs, both sides of sqrt 5 and of the series' start", () => {
    for (const [x, k] of fixture.kernel)
      expect(Math.abs(hilbertKernel(x) - k) / Math.abs(k), `x = ${x}`).toBeLessThan(1e-12);
  });

  it.each(fixture.cases)('the Hilbert transform of the density, at every eigenvalue, on $description', (c) => {
    const { hilbert } = kernelEstimates(Float64Array.from(c.eigenvalues), c.h);
    expect(relativeError(hilbert, c.hilbert)).toBeLessThan(1e-12);
  });

  it.each(fixture.cases)('the density, the null term and every shrunk eigenvalue on $description', (c) => {
    const lambda = Float64Array.from(c.eigenvalues);
    expect(relativeError(kernelEstimates(lambda, c.h).density, c.density)).toBeLessThan(1e-12);
    expect(Math.abs(nullHilbert(lambda, c.h) - c.hilbertNull) / c.hilbertNull).toBeLessThan(1e-12);
    expect(relativeError(shrunkEigenvalues(lambda, c.N, c.n, c.h), c.shrunk)).toBeLessThan(1e-12);
  });

  it('uses the bandwidth factor h = n^(-1/3) the fixture was evaluated with', () => {
    for (const c of fixture.cases) expect(c.n ** (-1 / 3)).toBe(c.h);
  });
});
