import { conditionNumber } from '../linalg/condition.js';
import type { Matrix } from '../linalg/matrix.js';
import type { EstimateContext, EstimateDiagnostics } from './types.js';

export interface DiagnoseOptions {
  /** Singular by rank (N >= T for the sample covariance): no condition number is computed. */
  singular?: boolean;
  /** The smallest eigenvalue when the method knows it exactly (shrinkage of a rank-deficient S). */
  knownSmallest?: number;
  /** The run's context: its tridiagonal reduction, where it has one, is shared with later steps. */
  context?: EstimateContext;
}

/** The diagnostics every estimate carries; `extra` adds the method's own figures. */
export function diagnose(
  covariance: Matrix,
  observations: number,
  effectiveObservations: number,
  shrinkage: number | null,
  extra: Partial<EstimateDiagnostics> & Record<string, unknown> = {},
  options: DiagnoseOptions = {},
): EstimateDiagnostics {
  // A run that reduces the estimate anyway (for the effective bets) gets the exact figure at any
  // size; otherwise conditionNumber chooses by size (exact up to EXACT_CONDITION_LIMIT, Lanczos above).
  const reduce = options.context?.tridiagonalise;
  const form = !options.singular && reduce ? reduce(covariance) : undefined;
  const condition = options.singular ? undefined : conditionNumber(covariance, options.knownSmallest, form);
  return {
    observations,
    effectiveObservations,
    conditionNumber: condition ? condition.value : Infinity,
    // `lanczos`: a lower bound from extreme Ritz values (large N); `rank`: singular by rank (N >= T);
    // `lanczos-largest`: the largest by Lanczos over a smallest known exactly.
    conditionNumberMethod: condition ? condition.method : 'rank',
    shrinkage,
    ...extra,
  };
}
