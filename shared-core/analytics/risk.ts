import { multiplyVector, zeros, type Matrix } from '../linalg/matrix.js';
import { formExposures } from '../linalg/symmetric-eigen.js';
import { tridiagonalForm, type TridiagonalForm } from '../linalg/tridiagonal-form.js';

/**
 * Risk figures of a portfolio for any weights and covariance: the one place the app, the memo
 * and the command line take them from. Weights are in the covariance's asset order. Pass an
 * annualised covariance (see `annualised` in estimators/registry) to get annualised figures.
 */

function check(weights: ArrayLike<number>, covariance: Matrix): void {
  if (covariance.rows !== covariance.cols)
    throw new RangeError(`covariance is ${covariance.rows} x ${covariance.cols}, not square`);
  if (weights.length !== covariance.rows)
    throw new RangeError(`${weights.length} weights for a ${covariance.rows}-asset covariance`);
}

/** Sigma w (skipping the zero weights). */
const times = (covariance: Matrix, weights: ArrayLike<number>): Float64Array => multiplyVector(covariance, weights);

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

/** w' Sigma w */
export function portfolioVariance(weights: ArrayLike<number>, covariance: Matrix): number {
  check(weights, covariance);
  return dot(weights, times(covariance, weights));
}

/** sqrt(w' Sigma w) */
export function portfolioVolatility(weights: ArrayLike<number>, covariance: Matrix): number {
  return Math.sqrt(Math.max(0, portfolioVariance(weights, covariance)));
}

/** sigma_i = sqrt(Sigma_ii) */
export function assetVolatilities(covariance: Matrix): Float64Array {
  const n = covariance.rows;
  return Float64Array.from({ length: n }, (_, i) => Math.sqrt(Math.max(0, covariance.data[i * n + i])));
}

/** rho_ij = Sigma_ij / (sigma_i sigma_j); an asset with zero variance is an error (its correlations are undefined). */
export function correlationMatrix(covariance: Matrix): Matrix {
  const n = covariance.rows;
  const vol = assetVolatilities(covariance);
  vol.forEach((v, i) => {
    if (!(v > 0)) throw new RangeError(`asset ${i} has zero variance: its correlations are undefined`);
  });
  const out = zeros(n, n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) out.data[i * n + j] = covariance.data[i * n + j] / (vol[i] * vol[j]);
    out.data[i * n + i] = 1;
  }
  return out;
}

/**
 * DR(w) = w'sigma / sqrt(w' Sigma w) (Choueifaty and Coignard 2008, J. Portfolio Management
 * 35(1)). At least 1 for long-only weights; invariant to scaling w.
 */
export function diversificationRatio(weights: ArrayLike<number>, covariance: Matrix): number {
  return dot(weights, assetVolatilities(covariance)) / portfolioVolatility(weights, covariance);
}

/** d sigma_p / d w_i = (Sigma w)_i / sigma_p */
export function marginalRisk(weights: ArrayLike<number>, covariance: Matrix): Float64Array {
  check(weights, covariance);
  const sw = times(covariance, weights);
  const vol = Math.sqrt(Math.max(0, dot(weights, sw)));
  return sw.map((v) => v / vol);
}

/**
 * Euler risk contributions as fractions of the portfolio variance: w_i (Sigma w)_i / w'Sigma w.
 * They sum to 1 because volatility is homogeneous of degree one in w (Euler's theorem).
 */
export function riskContributions(weights: ArrayLike<number>, covariance: Matrix): Float64Array {
  check(weights, covariance);
  const sw = times(covariance, weights);
  const variance = dot(weights, sw);
  return Float64Array.from(sw, (v, i) => (weights[i] * v) / variance);
}

/**
 * Effective number of bets from principal components (Meucci 2009, "Managing diversification",
 * Risk 22): with Sigma = E Lambda E', the exposures to the principal portfolios are E'w, their
 * shares of variance p_k = (E'w)_k^2 lambda_k / w'Sigma w, and the effective number of bets is
 * exp(-sum p_k ln p_k), between 1 and N. `form` is the covariance's tridiagonal form (or that of
 * a positive multiple of it, which has the same shares) where the caller has it already.
 */
export function effectiveBets(weights: ArrayLike<number>, covariance: Matrix, form?: TridiagonalForm): number {
  check(weights, covariance);
  if (form && form.n !== covariance.rows)
    throw new RangeError(`a tridiagonal form of size ${form.n} for a ${covariance.rows}-asset covariance`);
  const { values, exposures } = formExposures(form ?? tridiagonalForm(covariance), weights);
  const shares = Float64Array.from(exposures, (x, k) => x * Math.max(0, values[k]));
  let total = 0;
  for (const s of shares) total += s;
  let entropy = 0;
  for (const s of shares) {
    const p = s / total;
    if (p > 0) entropy -= p * Math.log(p);
  }
  return Math.exp(entropy);
}

/**
 * Effective number of holdings: the inverse Herfindahl index of the weights, (sum |w_i|)^2 /
 * sum w_i^2, which is 1 / sum w_i^2 for long-only weights summing to 1 (common practice).
 */
export function effectiveHoldings(weights: ArrayLike<number>): number {
  let gross = 0;
  let squares = 0;
  for (let i = 0; i < weights.length; i++) {
    gross += Math.abs(weights[i]);
    squares += weights[i] * weights[i];
  }
  return squares === 0 ? 0 : (gross * gross) / squares;
}

/** Ex-ante tracking error against reference weights (the current holdings): sqrt((w-b)' Sigma (w-b)). */
export function trackingError(weights: ArrayLike<number>, reference: ArrayLike<number>, covariance: Matrix): number {
  check(reference, covariance);
  const active = Float64Array.from({ length: weights.length }, (_, i) => weights[i] - reference[i]);
  return portfolioVolatility(active, covariance);
}
