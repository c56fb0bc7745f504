/** A rows x cols matrix (row-major) of arbitrary values in [-0.5, 0.5) from a seeded linear congruential generator. */
export function randomMatrix(
  rows: number,
  cols: number,
  seed: number,
): { rows: number; cols: number; data: Float64Array } {
  let s = seed >>> 0;
  const data = new Float64Array(rows * cols);
  for (let k = 0; k < data.length; k++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    data[k] = s / 2 ** 32 - 0.5;
  }
  return { rows, cols, data };
}

/** True when both arrays hold the same doubles, bit for bit (-0 and 0 told apart). */
export const sameBits = (a: Float64Array, b: Float64Array): boolean =>
  a.length === b.length && a.every((v, k) => Object.is(v, b[k]));
