import type { Matrix } from '../linalg/matrix.js';
import type { EstimatorSpec } from '../scenario/estimator-spec.js';
import { periodsPerYear } from './periods.js';
import type { Estimator } from './types.js';
import { symmetricEigen } from '../linalg/symmetric-eigen.js';
import { centred, checkReturns, scatter } from './moments.js';

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
export function nonlinearShrinkage(returns: Matrix): NonlinearShrinkage {
  checkReturns(returns, 3, 'nonlinear');
  const t = returns.rows;
  const p = returns.cols;
  const n = t - 1;
  const s = scatter(centred(returns), n);
  const { values, vectors } = symmetricEigen(s);
  const m = Math.min(p, n);
  const lambda = values.subarray(p - m); // the non-null sample eigenvalues, ascending
  const h = n ** (-1 / 3);
  const root5 = Math.sqrt(5);
  const f = new Float64Array(m);
  const hf = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    let density = 0;
    let hilbert = 0;
    for (let j = 0; j < m; j++) {
      const width = h * lambda[j];
      const x = (lambda[i] - lambda[j]) / width;
      density += Math.max(1 - (x * x) / 5, 0) / width;
      const transform =
        Math.abs(x) === root5
          ? (-3 / 10 / Math.PI) * x
          : (-3 / 10 / Math.PI) * x +
            (3 / 4 / root5 / Math.PI) * (1 - (x * x) / 5) * Math.log(Math.abs((root5 - x) / (root5 + x)));
      hilbert += transform / width;
    }
    f[i] = ((3 / 4 / root5) * density) / m;
    hf[i] = hilbert / m;
  }
  const d = new Float64Array(p);
  if (p <= n) {
    const c = p / n;
    for (let i = 0; i < m; i++) {
      const l = lambda[i];
      d[i] = l / ((Math.PI * c * l * f[i]) ** 2 + (1 - c - Math.PI * c * l * hf[i]) ** 2);
    }
  } else {
    let meanInverse = 0;
    for (const l of lambda) meanInverse += 1 / l / m;
    const hf0 =
      (1 / Math.PI) *
      (3 / 10 / h ** 2 + (3 / 4 / root5 / h) * (1 - 1 / 5 / h ** 2) * Math.log((1 + root5 * h) / (1 - root5 * h))) *
      meanInverse;
    const d0 = 1 / (((Math.PI * (p - n)) / n) * hf0);
    for (let i = 0; i < p - n; i++) d[i] = d0;
    for (let i = 0; i < m; i++) {
      const l = lambda[i];
      d[p - n + i] = l / (Math.PI ** 2 * l * l * (f[i] ** 2 + hf[i] ** 2));
    }
  }
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

/** The scenario method `nonlinear`: the shrinkage above, its condition number exact from d. */
export const nonlinearCovariance: Estimator<Extract<EstimatorSpec, { method: 'nonlinear' }>> = (
  returns,
  _spec,
  context,
) => {
  const fit = nonlinearShrinkage(returns);
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
