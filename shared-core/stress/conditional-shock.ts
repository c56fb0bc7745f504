import type { Matrix } from '../linalg/matrix.js';

/**
 * A shock to one asset or a group carried to every asset through the estimated covariance: the
 * conditional expectation of a multivariate normal return vector r given g'r = s,
 *   E[r | g'r = s] = Sigma g (g' Sigma g)^(-1) s
 * (zero-mean returns; Anderson 2003, "An Introduction to Multivariate Statistical Analysis",
 * 3rd ed., Wiley, Theorem 2.5.1 on conditional normal distributions). For one asset g is a unit
 * vector and every other asset moves by its regression beta on it; for a group g holds equal
 * weights over the members, so the group's average move equals the shock. The covariance's
 * horizon cancels out. Shocks are given as simple returns; with log-return estimates they are
 * propagated as ln(1 + s) and turned back into simple returns asset by asset.
 */
export interface ShockResult {
  /** Expected simple return of every asset, in the covariance's asset order. */
  assetMoves: Float64Array;
}

export function propagateShock(
  covariance: Matrix,
  exposure: ArrayLike<number>,
  shock: number,
  returnsMethod: 'log' | 'simple' = 'log',
): ShockResult {
  const n = covariance.rows;
  if (exposure.length !== n) throw new RangeError('one exposure per asset is needed');
  const sg = new Float64Array(n);
  let gsg = 0;
  for (let i = 0; i < n; i++) {
    let s = 0;
    for (let j = 0; j < n; j++) s += covariance.data[i * n + j] * exposure[j];
    sg[i] = s;
    gsg += exposure[i] * s;
  }
  if (!(gsg > 0)) throw new RangeError('the shocked asset or group has no variance under the estimate');
  const s = returnsMethod === 'log' ? Math.log1p(shock) : shock;
  const moves = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const x = (sg[i] / gsg) * s;
    moves[i] = returnsMethod === 'log' ? Math.expm1(x) : x;
  }
  return { assetMoves: moves };
}

/** Portfolio return of weights under per-asset simple returns (buy at the shock's start). */
export function portfolioMove(weights: ArrayLike<number>, moves: ArrayLike<number>): number {
  let r = 0;
  for (let i = 0; i < weights.length; i++) r += weights[i] * moves[i];
  return r;
}
