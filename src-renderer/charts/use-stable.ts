import { useRef } from 'react';

/**
 * Keeps the previous value while a new one is equal to it, so a memoised chart does not redraw
 * for figures that did not change (a cap edit leaves every covariance estimate as it was).
 */
export function useStable<T>(value: T, equal: (a: T, b: T) => boolean): T {
  const kept = useRef(value);
  if (kept.current !== value && !equal(kept.current, value)) kept.current = value;
  return kept.current;
}

export function sameNumbers(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}
