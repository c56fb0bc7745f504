import type { Matrix } from '../linalg/matrix.js';
import type { TridiagonalForm } from '../linalg/tridiagonal-form.js';
import type { EstimatorSpec } from '../scenario/estimator-spec.js';
import type { Frequency } from '../scenario/frequency.js';

export interface EstimateContext {
  frequency: Frequency;
  /** Overrides PERIODS_PER_YEAR[frequency]. */
  periodsPerYear?: number;
  /**
   * The tridiagonal reduction to use (linalg/tridiagonal-form.ts): a run's memoised one, so that
   * the exact condition number (at any size) and the effective bets of the candidates come from
   * one reduction of the estimate. Without it the condition number is exact up to
   * EXACT_CONDITION_LIMIT assets and a Lanczos bound above.
   */
  tridiagonalise?: (m: Matrix) => TridiagonalForm;
  /**
   * The de-meaned returns and their cross product X'X (moments.ts `centredMoments`), memoised by
   * the run: the estimators built on the sample covariance (sample, ledoit-wolf, oas, denoised,
   * nonlinear) then share the one O(N^2 T) product a scenario's returns need.
   */
  centredMoments?: (returns: Matrix) => CentredMoments;
}

export interface CentredMoments {
  /** The returns less their column means, T x N. */
  centred: Matrix;
  /** centred' centred, N x N. Read only: every estimator scales a copy. */
  crossProduct: Matrix;
}

export interface EstimateDiagnostics {
  observations: number;
  /** Effective observations: T for equal weights, 1 / sum(w_t^2) for EWMA weights. */
  effectiveObservations: number;
  /** Ratio of largest to smallest eigenvalue (Infinity when singular). */
  conditionNumber: number;
  /** Shrinkage intensity in [0, 1] where the method has one, else null. */
  shrinkage: number | null;
  /** Eigenvalues replaced by the denoising step, where there are. */
  eigenvaluesClipped?: number;
  /** Method-specific figures (iterations of an M-estimator, lambda used, ...). */
  [extra: string]: unknown;
}

export interface CovarianceEstimate {
  method: EstimatorSpec['method'];
  /** Covariance of per-period returns, N x N. */
  covariance: Matrix;
  periodsPerYear: number;
  diagnostics: EstimateDiagnostics;
}

/** Every estimator has this one signature: a pure function of a T x N return matrix and its options. */
export type Estimator<S extends EstimatorSpec = EstimatorSpec> = (
  returns: Matrix,
  spec: S,
  context: EstimateContext,
) => CovarianceEstimate;
