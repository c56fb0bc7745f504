import { conditionNumber } from '../linalg/condition.js';
import type { Matrix } from '../linalg/matrix.js';
import type { EstimateDiagnostics } from './types.js';

/** The diagnostics every estimate carries; `extra` adds the method's own figures. */
export function diagnose(
  covariance: Matrix,
  observations: number,
  effectiveObservations: number,
  shrinkage: number | null,
  extra: Partial<EstimateDiagnostics> & Record<string, unknown> = {},
  singular = false,
  /** The smallest eigenvalue when the method knows it exactly (shrinkage of a rank-deficient S). */
  knownSmallest?: number,
): EstimateDiagnostics {
  const condition = singular ? undefined : conditionNumber(covariance, knownSmallest);
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
