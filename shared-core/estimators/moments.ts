import { InputError } from '../errors.js';
import { crossProduct } from '../linalg/cross-product.js';
import { zeros, type Matrix } from '../linalg/matrix.js';
import type { CentredMoments, EstimateContext } from './types.js';

/** Checks the T x N return matrix every estimator receives: finite values, enough rows. */
export function checkReturns(returns: Matrix, minRows: number, method: string): void {
  if (returns.cols === 0) throw new InputError(`${method}: no assets`, { path: 'returns' });
  if (returns.rows < minRows)
    throw new InputError(`${method}: needs at least ${minRows} observations, got ${returns.rows}`, { path: 'returns' });
  const d = returns.data;
  for (let k = 0; k < d.length; k++)
    if (!Number.isFinite(d[k]))
      throw new InputError(
        `${method}: return ${d[k]} is not finite (period ${Math.floor(k / returns.cols)}, asset ${k % returns.cols})`,
        { path: 'returns' },
      );
}

/** Column means of a T x N matrix. */
export function columnMeans(x: Matrix): Float64Array {
  const { rows: t, cols: n, data } = x;
  const mean = new Float64Array(n);
  for (let k = 0; k < t; k++) for (let i = 0; i < n; i++) mean[i] += data[k * n + i];
  for (let i = 0; i < n; i++) mean[i] /= t;
  return mean;
}

/** X minus its column means (a T x N copy). */
export function centred(x: Matrix): Matrix {
  const { rows: t, cols: n, data } = x;
  const mean = columnMeans(x);
  const out = zeros(t, n);
  for (let k = 0; k < t; k++) for (let i = 0; i < n; i++) out.data[k * n + i] = data[k * n + i] - mean[i];
  return out;
}

/** The de-meaned returns and their cross product. */
export function centredMoments(returns: Matrix): CentredMoments {
  const x = centred(returns);
  return { centred: x, crossProduct: crossProduct(x) };
}

/**
 * The de-meaned returns x and the sample covariance s = x'x / divisor (divisor T or T - 1), the
 * cross product taken from the run's memo where the context has one; s is the caller's to change.
 */
export function centredScatter(returns: Matrix, divisor: number, context?: EstimateContext): { x: Matrix; s: Matrix } {
  const m = context?.centredMoments ? context.centredMoments(returns) : centredMoments(returns);
  const n = m.crossProduct.cols;
  const s = zeros(n, n);
  const inv = 1 / divisor;
  const c = m.crossProduct.data;
  for (let k = 0; k < c.length; k++) s.data[k] = c[k] * inv;
  return { x: m.centred, s };
}

/** Zero-variance columns make correlations undefined: a clear error naming the asset's column. */
export function checkVariances(covariance: Matrix, method: string): Float64Array {
  const n = covariance.rows;
  const v = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    v[i] = covariance.data[i * n + i];
    if (!(v[i] > 0))
      throw new InputError(`${method}: asset ${i} has zero variance in the window`, { path: `returns[*][${i}]` });
  }
  return v;
}

export function trace(m: Matrix): number {
  let s = 0;
  for (let i = 0; i < m.rows; i++) s += m.data[i * m.cols + i];
  return s;
}

export function sumOfSquares(m: Matrix): number {
  let s = 0;
  for (let k = 0; k < m.data.length; k++) s += m.data[k] * m.data[k];
  return s;
}
