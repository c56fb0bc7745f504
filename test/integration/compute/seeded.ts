import { crossProduct } from '../../../shared-core/linalg/cross-product.js';
import { zeros, type Matrix } from '../../../shared-core/linalg/matrix.js';

/**
 * What the two-thread tests share. The helper thread runs from the build that `npm test` makes
 * first (dist/), as it does for `holdfast`.
 */
export const computeThreadScript = new URL('../../../dist/src-main/compute/compute-thread.js', import.meta.url);

/** T x N returns of about 1 % from a Park and Miller (1988) stream. */
export function seededReturns(t: number, n: number, seed: number): Matrix {
  let s = seed;
  const x = zeros(t, n);
  for (let k = 0; k < x.data.length; k++) {
    s = (s * 16807) % 2147483647;
    x.data[k] = (s / 2147483647 - 0.5) * 0.02;
  }
  return x;
}

/** X'X of seededReturns: rank-deficient when T < N. */
export const seededCovariance = (t: number, n: number, seed: number): Matrix => crossProduct(seededReturns(t, n, seed));

export const sameBits = (a: Float64Array, b: Float64Array): boolean =>
  a.length === b.length && a.every((x, i) => Object.is(x, b[i]));
