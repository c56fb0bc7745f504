/**
 * A small seeded pseudo-random source for the invented demonstration data. The same seed gives
 * the same sequence on every platform: only integer arithmetic (Math.imul) and one division.
 *
 * Generator: SplitMix32 to spread the seed, then Mulberry32 for the stream (both public-domain
 * designs; quality is ample for synthetic prices, not for cryptography).
 */
export interface RandomSource {
  /** Uniform in [0, 1). */
  uniform(): number;
  /** Standard normal (Box-Muller, Box and Muller 1958, Annals of Mathematical Statistics 29). */
  normal(): number;
}

function splitMix32(seed: number): number {
  let z = (seed + 0x9e3779b9) | 0;
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
  return (z ^ (z >>> 16)) >>> 0;
}

export function createRandom(seed: number): RandomSource {
  if (!Number.isInteger(seed)) throw new RangeError(`seed must be an integer, got ${seed}`);
  let state = splitMix32(seed);
  let spare: number | undefined;
  const uniform = (): number => {
    state = (state + 0x6d2b79f5) | 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = (): number => {
    if (spare !== undefined) {
      const s = spare;
      spare = undefined;
      return s;
    }
    const u = 1 - uniform(); // (0, 1]: the logarithm stays finite
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
  return { uniform, normal };
}

/** A child stream for one purpose, so adding a draw in one place does not shift every other series. */
export function deriveSeed(seed: number, label: string): number {
  let h = splitMix32(seed);
  for (let i = 0; i < label.length; i++) h = splitMix32(h ^ label.charCodeAt(i));
  return h | 0;
}
