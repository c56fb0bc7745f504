import type { Rng } from './rng.js';

/**
 * Row indices of one resampled history of length `length` drawn from `0..n-1`.
 *
 * Stationary bootstrap (Politis and Romano 1994, J. American Statistical Association 89):
 * blocks start at a uniform row and have geometric lengths with mean `meanBlock`, wrapping
 * around the end, so the resampled series is stationary and keeps short-range dependence
 * (volatility clusters) that an i.i.d. row bootstrap would destroy.
 */
export function stationaryBootstrapIndices(n: number, meanBlock: number, rng: Rng, length = n): Int32Array {
  if (n < 1) throw new RangeError('cannot resample an empty history');
  const p = 1 / Math.max(1, meanBlock);
  const out = new Int32Array(length);
  let at = rng.int(n);
  for (let t = 0; t < length; t++) {
    if (t > 0) at = rng.next() < p ? rng.int(n) : (at + 1) % n;
    out[t] = at;
  }
  return out;
}

/**
 * Moving-block bootstrap (Kunsch 1989, Annals of Statistics 17): blocks of fixed length `block`
 * starting at uniform rows among the n - block + 1 full blocks, concatenated and cut to `length`.
 */
export function movingBlockIndices(n: number, block: number, rng: Rng, length = n): Int32Array {
  const b = Math.max(1, Math.min(Math.round(block), n));
  const out = new Int32Array(length);
  for (let t = 0; t < length;) {
    const start = rng.int(n - b + 1);
    for (let k = 0; k < b && t < length; k++) out[t++] = start + k;
  }
  return out;
}

/** A default mean block length of order n^(1/3) (the rate of Politis and White 2004, Econometric Reviews 23). */
export function defaultBlockLength(n: number): number {
  return Math.max(1, Math.round(Math.cbrt(n)));
}
