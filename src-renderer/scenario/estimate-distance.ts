import { assetVolatilities, correlationMatrix } from '../../shared-core/analytics/risk.js';
import type { Matrix } from '../../shared-core/linalg/matrix.js';

/**
 * How far an estimate moves from the sample covariance on the same returns: each asset's
 * volatility as a ratio to its sample volatility, and the correlations' mean and largest absolute
 * difference. Shrinkage pulls correlations towards a target and an exponentially weighted estimate
 * tilts towards recent periods; these figures show by how much, in the units an advisor reads.
 */
export interface EstimateDistance {
  /** Estimated volatility / sample volatility, per asset (1 = unchanged). */
  volatilityRatio: number[];
  /** Mean of |volatility ratio - 1| over assets. */
  meanVolatilityChange: number;
  /** Mean |rho_est - rho_sample| over the pairs i < j. */
  meanCorrelationChange: number;
  /** The pair whose correlation moves most. */
  largestCorrelationChange: { i: number; j: number; sample: number; estimate: number } | null;
}

/** Correlation from covariance, by the shared core's one function for it. */
export function correlationFromCovariance(covariance: Matrix): Float64Array {
  return correlationMatrix(covariance).data;
}

export function volatilities(covariance: Matrix): number[] {
  return Array.from(assetVolatilities(covariance));
}

export function estimateDistance(sample: Matrix, estimate: Matrix): EstimateDistance {
  const n = sample.rows;
  if (estimate.rows !== n) throw new RangeError(`estimate is ${estimate.rows} x ${estimate.cols}, sample ${n} x ${n}`);
  const vs = volatilities(sample);
  const ve = volatilities(estimate);
  const volatilityRatio = ve.map((v, i) => v / vs[i]);
  const meanVolatilityChange = n === 0 ? 0 : volatilityRatio.reduce((s, r) => s + Math.abs(r - 1), 0) / n;
  const rs = correlationFromCovariance(sample);
  const re = correlationFromCovariance(estimate);
  let sum = 0;
  let pairs = 0;
  let largest: EstimateDistance['largestCorrelationChange'] = null;
  let largestGap = -1;
  for (let i = 0; i < n; i++)
    for (let j = i + 1; j < n; j++) {
      const gap = Math.abs(re[i * n + j] - rs[i * n + j]);
      sum += gap;
      pairs++;
      if (gap > largestGap) {
        largestGap = gap;
        largest = { i, j, sample: rs[i * n + j], estimate: re[i * n + j] };
      }
    }
  return {
    volatilityRatio,
    meanVolatilityChange,
    meanCorrelationChange: pairs === 0 ? 0 : sum / pairs,
    largestCorrelationChange: largest,
  };
}
