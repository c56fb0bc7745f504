/**
 * A small seeded pseudo-random generator, so every resampling in Holdfast is reproducible from
 * its seed on every platform (Math.random cannot be seeded). Mulberry32: a 32-bit state,
 * period 2^32, adequate for a few thousand bootstrap draws (common practice for seeded
 * simulation in JavaScript; not for cryptography).
 */
export interface Rng {
  /** Uniform in [0, 1). */
  next(): number;
  /** Uniform integer in [0, n). */
  int(n: number): number;
}

export function seededRng(seed: number): Rng {
  let state = (Math.trunc(seed) ^ 0x9e3779b9) >>> 0;
  const next = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return { next, int: (n) => Math.floor(next() * n) };
}
