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

export function sameStrings(a: readonly string[], b: readonly string[]): boolean {
  return a.length === b.length && a.every((x, i) => x === b[i]);
}

/** Same keys with the same numbers (Object.is), in any key order. */
export function sameNumberRecord(a: Readonly<Record<string, number>>, b: Readonly<Record<string, number>>): boolean {
  const keys = Object.keys(a);
  if (keys.length !== Object.keys(b).length) return false;
  return keys.every((k) => k in b && Object.is(a[k], b[k]));
}

/** Arrays of flat records (strings, numbers, booleans) equal field by field. */
export function sameRows<T extends object>(a: readonly T[], b: readonly T[]): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) {
    const x = a[i] as Record<string, unknown>;
    const y = b[i] as Record<string, unknown>;
    const keys = Object.keys(x);
    if (keys.length !== Object.keys(y).length) return false;
    for (const k of keys) if (!Object.is(x[k], y[k])) return false;
  }
  return true;
}
