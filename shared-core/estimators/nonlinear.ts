import type { Matrix } from '../linalg/matrix.js';
import type { EstimatorSpec } from '../scenario/estimator-spec.js';
import { periodsPerYear } from './periods.js';
import type { EstimateContext, Estimator } from './types.js';
import { symmetricEigen } from '../linalg/symmetric-eigen.js';
import { centredScatter, checkReturns } from './moments.js';

export interface NonlinearShrinkage {
  /** Covariance of per-period returns, N x N. */
  covariance: Matrix;
  /** The shrunk eigenvalues d, ascending with the sample eigenvalues. */
  eigenvalues: Float64Array;
  /** Effective sample size n = T - 1, the kernel bandwidth factor h = n^(-1/3), lambda_max / lambda_min. */
  effectiveObservations: number;
  bandwidth: number;
  conditionNumber: number;
}

/**
 * Analytical nonlinear shrinkage (Ledoit and Wolf 2020, "Analytical nonlinear shrinkage of
 * large-dimensional covariance matrices", Annals of Statistics 48): keep the sample
 * eigenvectors and replace each sample eigenvalue lambda_i by
 * d_i = lambda_i / ((pi c lambda_i f(lambda_i))^2 + (1 - c - pi c lambda_i Hf(lambda_i))^2),
 * c = N/n, where f is a kernel estimate of the density of the sample eigenvalues and Hf its
 * Hilbert transform (Epanechnikov kernel, bandwidth h lambda_j with h = n^(-1/3)). Data are
 * de-meaned, so the effective sample size is n = T - 1. When N > n the N - n null eigenvalues
 * all get the value the paper gives for the point mass at zero.
 */
export function nonlinearShrinkage(returns: Matrix, context?: EstimateContext): NonlinearShrinkage {
  checkReturns(returns, 3, 'nonlinear');
  const t = returns.rows;
  const p = returns.cols;
  const n = t - 1;
  const s = centredScatter(returns, n, context).s;
  const { values, vectors } = symmetricEigen(s);
  const m = Math.min(p, n);
  const h = n ** (-1 / 3);
  // The non-null sample eigenvalues, ascending.
  const d = shrunkEigenvalues(values.subarray(p - m), p, n, h);
  // Sigma = U diag(d) U', written over the sample covariance.
  const u = vectors.data;
  for (let i = 0; i < p; i++)
    for (let j = 0; j <= i; j++) {
      let sum = 0;
      for (let k = 0; k < p; k++) sum += u[i * p + k] * d[k] * u[j * p + k];
      s.data[i * p + j] = s.data[j * p + i] = sum;
    }
  let smallest = Infinity;
  let largest = 0;
  for (const v of d) {
    smallest = Math.min(smallest, v);
    largest = Math.max(largest, v);
  }
  return {
    covariance: s,
    eigenvalues: d,
    effectiveObservations: n,
    bandwidth: h,
    conditionNumber: smallest > 0 ? largest / smallest : Infinity,
  };
}

const ROOT5 = Math.sqrt(5);

/**
 * The kernel estimate f of the density of the sample eigenvalues and its Hilbert transform Hf,
 * at each of the m non-null eigenvalues `lambda` (Ledoit and Wolf 2020, section 4): Epanechnikov
 * kernel with bandwidth h lambda_j, x = (lambda_i - lambda_j) / (h lambda_j).
 */
export function kernelEstimates(lambda: Float64Array, h: number): { density: Float64Array; hilbert: Float64Array } {
  const m = lambda.length;
  const density = new Float64Array(m);
  const hilbert = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let f = 0;
    let hf = 0;
    for (let j = 0; j < m; j++) {
      const width = h * lambda[j];
      const x = (lambda[i] - lambda[j]) / width;
      f += Math.max(1 - (x * x) / 5, 0) / width;
      hf += hilbertKernel(x) / width;
    }
    density[i] = ((3 / 4 / ROOT5) * f) / m;
    hilbert[i] = hf / m;
  }
  return { density, hilbert };
}

/** From |x| = this times sqrt(5) on, the kernel's Hilbert transform is summed as a series (u^2 <= 1/16). */
const SERIES_FROM = 4;
/** The series' coefficients 1 / ((2k+1)(2k+3)), k = 0..13: u^(2k) <= 16^-13 < 3e-16 at the last one. */
const SERIES = Array.from({ length: 14 }, (_, k) => 1 / ((2 * k + 1) * (2 * k + 3)));

/**
 * The Hilbert transform of the Epanechnikov kernel at x,
 *   K(x) = -3x/(10 pi) + 3/(4 sqrt5 pi) (1 - x^2/5) log|(sqrt5 - x)/(sqrt5 + x)|,
 * evaluated without losing digits (checked at 60 digits against mpmath,
 * test/reference/estimators/nonlinear_hilbert.py). Beyond |x| = sqrt5 the two terms grow like x
 * and cancel to about -1/(pi x), and the ratio inside the logarithm tends to -1, so its log
 * loses the digits that the cancellation then magnifies: with N > T the smallest sample
 * eigenvalues are tiny and x reaches 10^5, and the plain formula lost up to 3e-3 (relative) of
 * a shrunk eigenvalue. So the logarithm is log1p of |ratio| - 1, which is computed exactly, and
 * far out, with u = sqrt5 / x, the cancelled form
 *   K(x) = -3/(sqrt5 pi) sum_k u^(2k+1) / ((2k+1)(2k+3))
 * (from log|(sqrt5 - x)/(sqrt5 + x)| = -2 atanh(u); its 1/u terms cancel exactly).
 */
export function hilbertKernel(x: number): number {
  const y = Math.abs(x);
  if (y === ROOT5) return (-3 / 10 / Math.PI) * x;
  if (y >= SERIES_FROM * ROOT5) {
    const u = ROOT5 / x;
    const u2 = u * u;
    let sum = 0;
    for (let k = SERIES.length - 1; k >= 0; k--) sum = sum * u2 + SERIES[k];
    return (-3 / ROOT5 / Math.PI) * u * sum;
  }
  // log|(sqrt5 - y)/(sqrt5 + y)| = log1p(-2 min(y, sqrt5) / (sqrt5 + y)); odd in x.
  const log = Math.log1p((-2 * Math.min(y, ROOT5)) / (ROOT5 + y)) * Math.sign(x);
  return (-3 / 10 / Math.PI) * x + (3 / 4 / ROOT5 / Math.PI) * (1 - (x * x) / 5) * log;
}

/** Hf at zero for the point mass of the N - n null eigenvalues when N > n (the paper's formula for d0). */
export function nullHilbert(lambda: Float64Array, h: number): number {
  let meanInverse = 0;
  for (const l of lambda) meanInverse += 1 / l / lambda.length;
  return (
    (1 / Math.PI) *
    (3 / 10 / h ** 2 + (3 / 4 / ROOT5 / h) * (1 - 1 / 5 / h ** 2) * Math.log((1 + ROOT5 * h) / (1 - ROOT5 * h))) *
    meanInverse
  );
}

/**
 * The shrunk eigenvalues d of N = p assets from the m = min(p, n) non-null sample eigenvalues
 * `lambda` (ascending), n the effective sample size and h the bandwidth factor; the N - n null
 * ones first when N > n, so d is ascending with the sample eigenvalues.
 */
export function shrunkEigenvalues(lambda: Float64Array, p: number, n: number, h: number): Float64Array {
  const m = lambda.length;
  const { density: f, hilbert: hf } = kernelEstimates(lambda, h);
  const d = new Float64Array(p);
  if (p <= n) {
    const c = p / n;
    for (let i = 0; i < m; i++) {
      const l = lambda[i];
      d[i] = l / ((Math.PI * c * l * f[i]) ** 2 + (1 - c - Math.PI * c * l * hf[i]) ** 2);
    }
  } else {
    const d0 = 1 / (((Math.PI * (p - n)) / n) * nullHilbert(lambda, h));
    for (let i = 0; i < p - n; i++) d[i] = d0;
    for (let i = 0; i < m; i++) {
      const l = lambda[i];
      d[p - n + i] = l / (Math.PI ** 2 * l * l * (f[i] ** 2 + hf[i] ** 2));
    }
  }
  return d;
}

/** The scenario method `nonlinear`: the shrinkage above, its condition number exact from d. */
export const nonlinearCovariance: Estimator<Extract<EstimatorSpec, { method: 'nonlinear' }>> = (
  returns,
  _spec,
  context,
) => {
  const fit = nonlinearShrinkage(returns, context);
  return {
    method: 'nonlinear',
    covariance: fit.covariance,
    periodsPerYear: periodsPerYear(context),
    diagnostics: {
      observations: returns.rows,
      effectiveObservations: fit.effectiveObservations,
      conditionNumber: fit.conditionNumber,
      conditionNumberMethod: 'eigenvalues',
      shrinkage: null,
      bandwidth: fit.bandwidth,
    },
  };
};
