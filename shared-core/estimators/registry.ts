import { scale, type Matrix } from '../linalg/matrix.js';
import type { EstimatorMethod, EstimatorSpec } from '../scenario/estimator-spec.js';
import { denoisedCovariance } from './denoised.js';
import { ewmaCovariance } from './ewma.js';
import { ledoitWolfCovariance } from './ledoit-wolf.js';
import { nonlinearCovariance } from './nonlinear.js';
import { oasCovariance } from './oas.js';
import { robustCovariance } from './robust.js';
import { sampleCovariance } from './sample.js';
import type { CovarianceEstimate, EstimateContext, Estimator } from './types.js';

/**
 * Every covariance estimator by its scenario name (shrunk = delta F + (1 - delta) S for the
 * shrinkage methods). One signature each: a pure function of a T x N return matrix, its
 * options and the data frequency. A new method is one file plus a line here.
 */
export const estimators: { [M in EstimatorMethod]: Estimator<Extract<EstimatorSpec, { method: M }>> } = {
  sample: sampleCovariance,
  ewma: ewmaCovariance,
  'ledoit-wolf': ledoitWolfCovariance,
  oas: oasCovariance,
  denoised: denoisedCovariance,
  robust: robustCovariance,
  nonlinear: nonlinearCovariance,
};

/** The covariance of per-period returns by the method and options of `spec`, with diagnostics. */
export function estimateCovariance(returns: Matrix, spec: EstimatorSpec, context: EstimateContext): CovarianceEstimate {
  const estimator = estimators[spec.method] as Estimator;
  return estimator(returns, spec, context);
}

/** The annualised covariance: periods per year times the per-period covariance (common practice). */
export function annualised(estimate: CovarianceEstimate): Matrix {
  return scale(estimate.covariance, estimate.periodsPerYear);
}
