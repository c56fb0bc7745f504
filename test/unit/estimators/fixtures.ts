import { readFileSync } from 'node:fs';
import { fromRows, type Matrix } from '../../../shared-core/linalg/matrix.js';

/** Reference values written by test/reference/estimators/make-fixtures.sh (Debian numpy, sklearn, R). */
export interface EstimatorCase {
  name: string;
  description: string;
  generator: Record<string, string>;
  T: number;
  N: number;
  returns: number[][];
  sample: { covariance: number[][]; eigenvalues: number[] };
  ewma: Record<'lambda0.94' | 'halfLife30', { covariance: number[][]; effectiveObservations: number }>;
  ledoitWolf: Record<
    'scaledIdentity' | 'constantCorrelation' | 'singleIndex',
    { covariance: number[][]; shrinkage: number }
  >;
  oas: { covariance: number[][]; shrinkage: number };
  denoised: { covariance: number[][]; eigenvaluesClipped: number };
  robust?: { covariance: number[][]; iterations: number; mad: number[] };
  conditionNumbers: Record<string, number>;
  analytics?: {
    weights: number[];
    reference: number[];
    volatility: number;
    assetVolatilities: number[];
    diversificationRatio: number;
    marginalRisk: number[];
    riskContributions: number[];
    effectiveBets: number;
    effectiveHoldings: number;
    trackingError: number;
    correlation: number[][];
  };
}

const dir = new URL('../../reference/fixtures/estimators/', import.meta.url);

export function loadFixture<T = EstimatorCase>(name: string): T {
  return JSON.parse(readFileSync(new URL(`${name}.json`, dir), 'utf8')) as T;
}

export const CASES = ['eustock', 'wide', 'mid', 'heavy'] as const;

export function matrix(rows: number[][]): Matrix {
  return fromRows(rows);
}

/** Max-norm relative error max|a - b| / max|b|: the agreement measure of the estimators issue. */
export function relativeError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  if (a.length !== b.length) return Infinity;
  let diff = 0;
  let size = 0;
  for (let i = 0; i < a.length; i++) {
    diff = Math.max(diff, Math.abs(a[i] - b[i]));
    size = Math.max(size, Math.abs(b[i]));
  }
  return size === 0 ? diff : diff / size;
}

export function flat(rows: number[][]): Float64Array {
  return Float64Array.from(rows.flat());
}
