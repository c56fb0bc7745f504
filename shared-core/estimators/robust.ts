import { InputError } from '../errors.js';
import { cholesky, inverseQuadraticForm } from '../linalg/cholesky.js';
import { identity, zeros, type Matrix } from '../linalg/matrix.js';
import type { EstimatorSpec } from '../scenario/estimator-spec.js';
import { diagnose } from './diagnostics.js';
import { checkReturns } from './moments.js';
import { periodsPerYear } from './periods.js';
import type { Estimator } from './types.js';

/** 1 / Phi^-1(3/4): makes the MAD a consistent scale for normal data (Hampel 1974, JASA 69). */
export const MAD_CONSTANT = 1.482602218505602;
/** Fixed-point settings of the shape iteration: stop when no entry moves more than this. */
export const TYLER_TOLERANCE = 1e-14;
export const TYLER_MAX_ITERATIONS = 10_000;

/**
 * Robust covariance for heavy tails and outliers: Tyler's M-estimator of shape (Tyler 1987,
 * "A distribution-free M-estimator of multivariate scatter", Annals of Statistics 15) with
 * robust scales. Each asset is centred at its median and scaled by its MAD; the shape V solves
 * V = (N / T) sum_t z_t z_t' / (z_t' V^-1 z_t) with trace N (iterated from I until it stops
 * moving); the covariance is diag(MAD) corr(V) diag(MAD). Every period gets a weight that
 * falls with its distance, so a few extreme days cannot dominate. Needs more periods than
 * assets, as the estimator's existence does.
 */
export const robustCovariance: Estimator<Extract<EstimatorSpec, { method: 'robust' }>> = (returns, _spec, context) => {
  checkReturns(returns, 2, 'robust');
  const { rows: t, cols: n, data } = returns;
  if (t <= n)
    throw new InputError(
      `robust: Tyler's shape estimator needs more periods than assets (${t} periods, ${n} assets); ` +
        'use a shrinkage method or a longer window',
      { path: 'returns' },
    );
  const median = new Float64Array(n);
  const mad = new Float64Array(n);
  const column = new Float64Array(t);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < t; k++) column[k] = data[k * n + i];
    median[i] = medianOf(column);
    for (let k = 0; k < t; k++) column[k] = Math.abs(data[k * n + i] - median[i]);
    mad[i] = MAD_CONSTANT * medianOf(column);
    if (!(mad[i] > 0))
      throw new InputError(
        `robust: asset ${i} has a zero robust scale (at least half of its returns equal the median)`,
        { path: `returns[*][${i}]` },
      );
  }
  // Standardised rows; a row exactly at the centre carries no direction and is left out.
  const rows: number[] = [];
  const z = zeros(t, n);
  for (let k = 0; k < t; k++) {
    let any = false;
    for (let i = 0; i < n; i++) {
      const v = (data[k * n + i] - median[i]) / mad[i];
      z.data[k * n + i] = v;
      any ||= v !== 0;
    }
    if (any) rows.push(k);
  }
  const { shape, iterations, converged } = tylerShape(z, rows);
  const cov = zeros(n, n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++)
      cov.data[i * n + j] =
        (shape.data[i * n + j] / Math.sqrt(shape.data[i * n + i] * shape.data[j * n + j])) * mad[i] * mad[j];
  return {
    method: 'robust',
    covariance: cov,
    periodsPerYear: periodsPerYear(context),
    diagnostics: diagnose(
      cov,
      t,
      rows.length,
      null,
      {
        estimator: 'Tyler (1987) shape with median centre and MAD scales',
        iterations,
        converged,
      },
      { context },
    ),
  };
};

function tylerShape(z: Matrix, rows: readonly number[]): { shape: Matrix; iterations: number; converged: boolean } {
  const n = z.cols;
  let v = identity(n);
  const work = new Float64Array(n);
  for (let iteration = 1; iteration <= TYLER_MAX_ITERATIONS; iteration++) {
    const l = cholesky(v);
    if (!l) throw new InputError('robust: the shape iteration lost positive definiteness', { path: 'returns' });
    const next = zeros(n, n);
    for (const k of rows) {
      const zk = z.data.subarray(k * n, (k + 1) * n);
      const w = 1 / inverseQuadraticForm(l, zk, work);
      for (let i = 0; i < n; i++) {
        const a = w * zk[i];
        const o = i * n;
        for (let j = 0; j <= i; j++) next.data[o + j] += a * zk[j];
      }
    }
    let tr = 0;
    for (let i = 0; i < n; i++) tr += next.data[i * n + i];
    const factor = n / tr; // (N / T) and the trace normalisation in one step
    let step = 0;
    for (let i = 0; i < n; i++)
      for (let j = 0; j <= i; j++) {
        const value = next.data[i * n + j] * factor;
        next.data[i * n + j] = next.data[j * n + i] = value;
        step = Math.max(step, Math.abs(value - v.data[i * n + j]));
      }
    v = next;
    if (step < TYLER_TOLERANCE) return { shape: v, iterations: iteration, converged: true };
  }
  return { shape: v, iterations: TYLER_MAX_ITERATIONS, converged: false };
}

function medianOf(values: Float64Array): number {
  const s = Float64Array.from(values).sort();
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}
