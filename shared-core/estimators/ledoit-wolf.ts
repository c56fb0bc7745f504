import { InputError } from '../errors.js';
import type { Matrix } from '../linalg/matrix.js';
import type { EstimatorSpec, ShrinkageTarget } from '../scenario/estimator-spec.js';
import { diagnose } from './diagnostics.js';
import { centredScatter, checkReturns, checkVariances, sumOfSquares, trace } from './moments.js';
import { periodsPerYear } from './periods.js';
import type { Estimator } from './types.js';

/**
 * Linear shrinkage of the sample covariance S towards a structured target F:
 * shrunk = delta F + (1 - delta) S, delta in [0, 1] estimated from the data. Every target here
 * works, as the papers and scikit-learn do, with de-meaned data and the 1/T covariance S. The
 * only O(N^2 T) step is S itself; the other sums the intensities need are rearranged into
 * O(NT) sums over periods (sum_ij (A'B)_ij u_i v_j = sum_t (A_t . u)(B_t . v)).
 */
export const ledoitWolfCovariance: Estimator<Extract<EstimatorSpec, { method: 'ledoit-wolf' }>> = (
  returns,
  spec,
  context,
) => {
  checkReturns(returns, 2, 'ledoit-wolf');
  const target: ShrinkageTarget = spec.target ?? 'scaled-identity';
  const t = returns.rows;
  const { x, s } = centredScatter(returns, t, context);
  const shrinkage =
    target === 'scaled-identity'
      ? shrinkTowardsScaledIdentity(x, s)
      : target === 'constant-correlation'
        ? shrinkTowardsConstantCorrelation(x, s)
        : shrinkTowardsSingleIndex(x, s);
  return {
    method: 'ledoit-wolf',
    covariance: s,
    periodsPerYear: periodsPerYear(context),
    // With N >= T the 1/T covariance of de-meaned data has rank below N, so the smallest
    // eigenvalue of delta mu I + (1 - delta) S is exactly delta mu.
    diagnostics: diagnose(
      s,
      t,
      t,
      shrinkage,
      { target },
      {
        knownSmallest: target === 'scaled-identity' && x.cols >= t ? (shrinkage * trace(s)) / x.cols : undefined,
        context,
      },
    ),
  };
};

/**
 * Target mu I, mu = trace(S)/N (Ledoit and Wolf 2004, "A well-conditioned estimator for
 * large-dimensional covariance matrices", J. Multivariate Analysis 88), in the arithmetic of
 * scikit-learn's `ledoit_wolf_shrinkage`: d^2 = ||S - mu I||^2 / N,
 * b^2 = min(d^2, (sum_t ||x_t||^4 / T - ||S||^2) / (N T)), delta = b^2 / d^2.
 * Overwrites `s` with the shrunk matrix; returns delta.
 */
export function shrinkTowardsScaledIdentity(x: Matrix, s: Matrix): number {
  const { rows: t, cols: n } = x;
  const tr = trace(s);
  const mu = tr / n;
  const squares = sumOfSquares(s);
  let beta = 0; // sum_t (sum_i x_ti^2)^2 = sum of all entries of (X o X)'(X o X)
  for (let k = 0; k < t; k++) {
    let r = 0;
    for (let i = 0; i < n; i++) r += x.data[k * n + i] * x.data[k * n + i];
    beta += r * r;
  }
  let b2 = (beta / t - squares) / (n * t);
  const d2 = (squares - 2 * mu * tr + n * mu * mu) / n;
  b2 = Math.min(b2, d2);
  const delta = b2 === 0 ? 0 : b2 / d2;
  const keep = 1 - delta;
  for (let k = 0; k < s.data.length; k++) s.data[k] *= keep;
  for (let i = 0; i < n; i++) s.data[i * n + i] += delta * mu;
  return delta;
}

/**
 * Target: sample variances with one average correlation r (Ledoit and Wolf 2004, "Honey, I
 * shrunk the sample covariance matrix", J. Portfolio Management 30(4)): delta =
 * max(0, min(1, (pi - rho) / (gamma T))), with pi, rho and gamma the estimators of the paper's
 * appendix. Overwrites `s`; returns delta.
 */
export function shrinkTowardsConstantCorrelation(x: Matrix, s: Matrix): number {
  const { rows: t, cols: n } = x;
  if (n < 2) return 0;
  const v = checkVariances(s, 'ledoit-wolf constant-correlation');
  const sd = v.map(Math.sqrt);
  const a = s.data;
  let correlations = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) if (i !== j) correlations += a[i * n + j] / (sd[i] * sd[j]);
  const rBar = correlations / (n * (n - 1));

  // pi = sum_ij [ (1/T) sum_t x_ti^2 x_tj^2 - s_ij^2 ].
  // rho = sum_i pi_ii + rBar sum_{i != j} sqrt(v_j / v_i) theta_ij,
  //   theta_ij = (1/T) sum_t x_ti^3 x_tj - v_i s_ij.
  let quartic = 0; // sum_t (sum_i x_ti^2)^2
  let fourth = 0; // sum_t sum_i x_ti^4
  let cubicCross = 0; // sum_t (sum_i x_ti^3 / sd_i)(sum_j x_tj sd_j)
  for (let k = 0; k < t; k++) {
    let r2 = 0;
    let c3 = 0;
    let c1 = 0;
    const o = k * n;
    for (let i = 0; i < n; i++) {
      const xi = x.data[o + i];
      const x2 = xi * xi;
      r2 += x2;
      fourth += x2 * x2;
      c3 += (x2 * xi) / sd[i];
      c1 += xi * sd[i];
    }
    quartic += r2 * r2;
    cubicCross += c3 * c1;
  }
  let squares = 0;
  let diagSquares = 0;
  let weightedOff = 0; // sum_{i != j} sqrt(v_i v_j) s_ij
  let gamma = 0; // ||S - F||^2
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      const sij = a[i * n + j];
      squares += sij * sij;
      if (i === j) {
        diagSquares += sij * sij;
        continue;
      }
      weightedOff += sd[i] * sd[j] * sij;
      const gap = sij - rBar * sd[i] * sd[j];
      gamma += gap * gap;
    }
  const pi = quartic / t - squares;
  const piDiagonal = fourth / t - diagSquares;
  // sum_{i != j} sqrt(v_j/v_i) (1/T) sum_t x_ti^3 x_tj = (cubicCross - fourth) / T.
  const thetaSum = (cubicCross - fourth) / t - weightedOff;
  const rho = piDiagonal + rBar * thetaSum;
  const delta = gamma === 0 ? 0 : Math.max(0, Math.min(1, (pi - rho) / gamma / t));
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      if (i === j) continue;
      const k = i * n + j;
      a[k] = delta * rBar * sd[i] * sd[j] + (1 - delta) * a[k];
    }
  return delta;
}

/**
 * Target: a single-index model whose index is the equally weighted average of the de-meaned
 * returns, F_ij = c_i c_j / v_m off the diagonal and the sample variances on it (Ledoit and Wolf
 * 2003, "Improved estimation of the covariance matrix of stock returns with an application to
 * portfolio selection", J. Empirical Finance 10). Overwrites `s`; returns delta.
 */
export function shrinkTowardsSingleIndex(x: Matrix, s: Matrix): number {
  const { rows: t, cols: n } = x;
  if (n < 2) return 0;
  const a = s.data;
  // Index m_t = mean_i x_ti; c_i = cov(x_i, m) = (S 1)_i / N; v_m = 1'S1 / N^2.
  const c = new Float64Array(n);
  let vm = 0;
  for (let i = 0; i < n; i++) {
    let row = 0;
    for (let j = 0; j < n; j++) row += a[i * n + j];
    c[i] = row / n;
    vm += row;
  }
  vm /= n * n;
  if (!(vm > 0))
    throw new InputError('ledoit-wolf single-index: the equally weighted index has zero variance', {
      path: 'returns',
    });
  // Sums over periods, with z_ti = x_ti m_t and y_ti = x_ti^2:
  let yzc = 0; // sum_t (sum_i y_ti)(sum_j z_tj c_j)
  let zc2 = 0; // sum_t (sum_i z_ti c_i)^2
  const diagV1 = new Float64Array(n); // (1/T) sum_t x_ti^3 m_t
  const diagV3 = new Float64Array(n); // (1/T) sum_t x_ti^2 m_t^2
  let fourth = 0;
  let quartic = 0;
  for (let k = 0; k < t; k++) {
    const o = k * n;
    let m = 0;
    for (let i = 0; i < n; i++) m += x.data[o + i];
    m /= n;
    let ySum = 0;
    let zcSum = 0;
    for (let i = 0; i < n; i++) {
      const xi = x.data[o + i];
      const y = xi * xi;
      ySum += y;
      fourth += y * y;
      zcSum += xi * m * c[i];
      diagV1[i] += y * xi * m;
      diagV3[i] += y * m * m;
    }
    quartic += ySum * ySum;
    yzc += ySum * zcSum;
    zc2 += zcSum * zcSum;
  }
  let cSc = 0; // c'Sc
  let squares = 0;
  let diagSquares = 0;
  let gamma = 0;
  for (let i = 0; i < n; i++) {
    let sc = 0;
    for (let j = 0; j < n; j++) {
      const sij = a[i * n + j];
      sc += sij * c[j];
      squares += sij * sij;
      if (i === j) diagSquares += sij * sij;
      else {
        const gap = sij - (c[i] * c[j]) / vm;
        gamma += gap * gap;
      }
    }
    cSc += c[i] * sc;
  }
  const pi = quartic / t - squares;
  const piDiagonal = fourth / t - diagSquares;
  // v1_ij = (1/T)(Y'Z)_ij - c_i s_ij; roff1 = (sum_ij v1_ij c_j - sum_i v1_ii c_i) / v_m.
  let v1Diagonal = 0;
  let v3Diagonal = 0;
  for (let i = 0; i < n; i++) {
    const sii = a[i * n + i];
    v1Diagonal += (diagV1[i] / t - c[i] * sii) * c[i];
    v3Diagonal += (diagV3[i] / t - vm * sii) * c[i] * c[i];
  }
  const roff1 = (yzc / t - cSc - v1Diagonal) / vm;
  // v3_ij = (1/T)(Z'Z)_ij - v_m s_ij; roff3 = (sum_ij v3_ij c_i c_j - sum_i v3_ii c_i^2) / v_m^2.
  const roff3 = (zc2 / t - vm * cSc - v3Diagonal) / (vm * vm);
  const rho = piDiagonal + 2 * roff1 - roff3;
  const delta = gamma === 0 ? 0 : Math.max(0, Math.min(1, (pi - rho) / gamma / t));
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) {
      if (i === j) continue;
      const k = i * n + j;
      a[k] = (delta * c[i] * c[j]) / vm + (1 - delta) * a[k];
    }
  return delta;
}
