import { zeros, type Matrix } from './matrix.js';

/**
 * Lower-triangular L with L L' = A for a symmetric positive definite A (lower triangle read),
 * or undefined when a pivot is not positive (A is not positive definite to working precision).
 */
export function cholesky(a: Matrix): Matrix | undefined {
  const n = a.rows;
  const l = zeros(n, n);
  const d = l.data;
  for (let j = 0; j < n; j++) {
    let sum = a.data[j * n + j];
    for (let k = 0; k < j; k++) sum -= d[j * n + k] * d[j * n + k];
    if (!(sum > 0)) return undefined;
    const root = Math.sqrt(sum);
    d[j * n + j] = root;
    for (let i = j + 1; i < n; i++) {
      let s = a.data[i * n + j];
      for (let k = 0; k < j; k++) s -= d[i * n + k] * d[j * n + k];
      d[i * n + j] = s / root;
    }
  }
  return l;
}

/** ||L^-1 z||^2 = z' A^-1 z for A = L L', by forward substitution; `work` has length N. */
export function inverseQuadraticForm(l: Matrix, z: ArrayLike<number>, work: Float64Array): number {
  const n = l.rows;
  const d = l.data;
  let total = 0;
  for (let i = 0; i < n; i++) {
    let s = z[i];
    const o = i * n;
    for (let k = 0; k < i; k++) s -= d[o + k] * work[k];
    const y = s / d[o + i];
    work[i] = y;
    total += y * y;
  }
  return total;
}
