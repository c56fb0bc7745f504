import type { Matrix } from './matrix.js';

export interface SymmetricEigen {
  /** Eigenvalues in ascending order. */
  values: Float64Array;
  /** Column k is the unit eigenvector of values[k] (as numpy.linalg.eigh returns them). */
  vectors: Matrix;
}

/**
 * Eigen-decomposition of a symmetric matrix: Householder reduction to tridiagonal form, then the
 * implicit QL iteration with Wilkinson shifts (tred2 and tql2 of EISPACK, Smith et al. 1976, in
 * the form of the public-domain JAMA library). Only the lower triangle of `m` is read.
 */
export function symmetricEigen(m: Matrix): SymmetricEigen {
  const n = m.rows;
  const w = transposedLower(m);
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  tridiagonalise(w, n, d, e, true);
  diagonalise(d, e, w, n);
  const order = ascending(d);
  // Rows of w into ascending order (following the permutation's cycles with one spare row),
  // then an in-place transpose: no second N x N buffer.
  const done = new Uint8Array(n);
  const spare = new Float64Array(n);
  for (let start = 0; start < n; start++) {
    if (done[start] || order[start] === start) continue;
    spare.set(w.subarray(start * n, start * n + n));
    let k = start;
    for (;;) {
      done[k] = 1;
      const from = order[k];
      if (from === start) {
        w.set(spare, k * n);
        break;
      }
      w.copyWithin(k * n, from * n, from * n + n);
      k = from;
    }
  }
  for (let i = 0; i < n; i++)
    for (let j = i + 1; j < n; j++) {
      const a = w[i * n + j];
      w[i * n + j] = w[j * n + i];
      w[j * n + i] = a;
    }
  return { values: Float64Array.from(order, (k) => d[k]), vectors: { rows: n, cols: n, data: w } };
}

/** Eigenvalues only, ascending: about 4/3 N^3 flops instead of about 9 N^3 with vectors. */
export function symmetricEigenvalues(m: Matrix): Float64Array {
  const n = m.rows;
  const w = transposedLower(m);
  const d = new Float64Array(n);
  const e = new Float64Array(n);
  tridiagonalise(w, n, d, e, false);
  diagonalise(d, e, undefined, n);
  return d.sort();
}

export interface SpectralExposures {
  /** Eigenvalues of the matrix (in no particular order). */
  values: Float64Array;
  /** exposures[k] = (e_k'v)^2 for the unit eigenvector e_k of values[k]. */
  exposures: Float64Array;
}

/**
 * The squared exposures of a vector v to the eigenvectors of a symmetric matrix, without forming
 * the eigenvectors. A reflector H maps v to |v| e_n; the Householder reduction of H M H keeps e_n
 * fixed, so (e_k'v)^2 = |v|^2 z_k^2 where z is the last row of the tridiagonal's eigenvectors,
 * carried through the QL rotations in O(N) each (the device of Golub and Welsch 1969, Math.
 * Comp. 23, for Gauss quadrature weights). About 4/3 N^3 flops instead of about 9 N^3. Where an
 * eigenvalue repeats, its whole exposure lands on one of its copies, which is the only
 * basis-free way to split it.
 */
export function spectralExposures(m: Matrix, v: ArrayLike<number>): SpectralExposures {
  const n = m.rows;
  const w = transposedLower(m);
  if (v.length !== n) throw new RangeError(`expected ${n} entries, got ${v.length}`);
  let norm2 = 0;
  for (let i = 0; i < n; i++) norm2 += v[i] * v[i];
  const d = new Float64Array(n);
  const exposures = new Float64Array(n);
  if (n === 0 || norm2 === 0) return { values: symmetricEigenvalues(m), exposures };
  const norm = Math.sqrt(norm2);
  // u = v - alpha e_n with alpha of the opposite sign to v_n (no cancellation); H = I - beta u u'.
  const alpha = v[n - 1] > 0 ? -norm : norm;
  const u = Float64Array.from(v);
  u[n - 1] -= alpha;
  let uu = 0;
  for (let i = 0; i < n; i++) uu += u[i] * u[i];
  if (uu > 0) {
    // H M H = M - u q' - q u' with p = beta M u, q = p - (beta u'p / 2) u.
    const beta = 2 / uu;
    const q = new Float64Array(n);
    let up = 0;
    for (let i = 0; i < n; i++) {
      let s = 0;
      const row = i * n;
      for (let j = 0; j < n; j++) s += w[row + j] * u[j];
      q[i] = beta * s;
      up += u[i] * q[i];
    }
    const k = (beta * up) / 2;
    for (let i = 0; i < n; i++) q[i] -= k * u[i];
    for (let i = 0; i < n; i++) {
      const row = i * n;
      const ui = u[i];
      const qi = q[i];
      for (let j = 0; j < n; j++) w[row + j] -= ui * q[j] + qi * u[j];
    }
  }
  const e = new Float64Array(n);
  tridiagonalise(w, n, d, e, false);
  const z = new Float64Array(n);
  z[n - 1] = 1;
  diagonalise(d, e, undefined, n, z);
  for (let k = 0; k < n; k++) exposures[k] = norm2 * z[k] * z[k];
  return { values: d, exposures };
}

/** Eigenvalues of the symmetric tridiagonal matrix with diagonal `diag` and off-diagonal `off` (length n-1). */
export function tridiagonalEigenvalues(diag: ArrayLike<number>, off: ArrayLike<number>): Float64Array {
  const n = diag.length;
  const d = Float64Array.from(diag);
  const e = new Float64Array(n);
  for (let i = 1; i < n; i++) e[i] = off[i - 1];
  diagonalise(d, e, undefined, n);
  return d.sort();
}

// The algorithms below are written on W = V' (row k of W is column k of JAMA's V), so that the
// inner loops run along contiguous memory and the eigenvectors end up in the rows of W.

function transposedLower(m: Matrix): Float64Array {
  const n = m.rows;
  if (m.cols !== n) throw new RangeError(`expected a square matrix, got ${m.rows} x ${m.cols}`);
  const w = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j <= i; j++) w[j * n + i] = w[i * n + j] = m.data[i * n + j];
  return w;
}

/** Householder tridiagonalisation (tred2). On return d is the diagonal and e[1..n-1] the off-diagonal. */
function tridiagonalise(w: Float64Array, n: number, d: Float64Array, e: Float64Array, accumulate: boolean): void {
  // V[r][c] is w[c * n + r].
  for (let j = 0; j < n; j++) d[j] = w[j * n + n - 1];
  for (let i = n - 1; i > 0; i--) {
    let scale = 0;
    let h = 0;
    for (let k = 0; k < i; k++) scale += Math.abs(d[k]);
    if (scale === 0) {
      e[i] = d[i - 1];
      for (let j = 0; j < i; j++) {
        d[j] = w[j * n + i - 1];
        w[j * n + i] = 0;
        w[i * n + j] = 0;
      }
    } else {
      for (let k = 0; k < i; k++) {
        d[k] /= scale;
        h += d[k] * d[k];
      }
      let f = d[i - 1];
      let g = Math.sqrt(h);
      if (f > 0) g = -g;
      e[i] = scale * g;
      h -= f * g;
      d[i - 1] = f - g;
      for (let j = 0; j < i; j++) e[j] = 0;
      for (let j = 0; j < i; j++) {
        f = d[j];
        const col = j * n; // V[.][j]
        w[i * n + j] = f; // V[j][i]
        // The symmetric matrix-vector product, unrolled by two (about 1.6x faster in V8).
        let g0 = e[j] + w[col + j] * f;
        let g1 = 0;
        let k = j + 1;
        for (; k + 1 <= i - 1; k += 2) {
          const a0 = w[col + k];
          const a1 = w[col + k + 1];
          g0 += a0 * d[k];
          g1 += a1 * d[k + 1];
          e[k] += a0 * f;
          e[k + 1] += a1 * f;
        }
        if (k <= i - 1) {
          g0 += w[col + k] * d[k];
          e[k] += w[col + k] * f;
        }
        e[j] = g0 + g1;
      }
      f = 0;
      for (let j = 0; j < i; j++) {
        e[j] /= h;
        f += e[j] * d[j];
      }
      const hh = f / (h + h);
      for (let j = 0; j < i; j++) e[j] -= hh * d[j];
      for (let j = 0; j < i; j++) {
        f = d[j];
        g = e[j];
        const col = j * n;
        // The rank-two update, unrolled by four.
        let k = j;
        for (; k + 3 <= i - 1; k += 4) {
          w[col + k] -= f * e[k] + g * d[k];
          w[col + k + 1] -= f * e[k + 1] + g * d[k + 1];
          w[col + k + 2] -= f * e[k + 2] + g * d[k + 2];
          w[col + k + 3] -= f * e[k + 3] + g * d[k + 3];
        }
        for (; k <= i - 1; k++) w[col + k] -= f * e[k] + g * d[k];
        d[j] = w[col + i - 1];
        w[col + i] = 0;
      }
    }
    d[i] = h;
  }
  if (!accumulate) {
    for (let j = 0; j < n; j++) d[j] = w[j * n + j];
    e[0] = 0;
    return;
  }
  for (let i = 0; i < n - 1; i++) {
    w[i * n + n - 1] = w[i * n + i];
    w[i * n + i] = 1;
    const h = d[i + 1];
    const next = (i + 1) * n; // V[.][i+1]
    if (h !== 0) {
      for (let k = 0; k <= i; k++) d[k] = w[next + k] / h;
      for (let j = 0; j <= i; j++) {
        const col = j * n;
        let g = 0;
        for (let k = 0; k <= i; k++) g += w[next + k] * w[col + k];
        for (let k = 0; k <= i; k++) w[col + k] -= g * d[k];
      }
    }
    for (let k = 0; k <= i; k++) w[next + k] = 0;
  }
  for (let j = 0; j < n; j++) {
    d[j] = w[j * n + n - 1];
    w[j * n + n - 1] = 0;
  }
  w[(n - 1) * n + n - 1] = 1;
  e[0] = 0;
}

/**
 * Implicit QL on the tridiagonal (d, e[1..n-1]) (tql2); rotates the rows of w when given, and
 * the entries of `last` (the last component of every eigenvector) when given.
 */
function diagonalise(
  d: Float64Array,
  e: Float64Array,
  w: Float64Array | undefined,
  n: number,
  last?: Float64Array,
): void {
  for (let i = 1; i < n; i++) e[i - 1] = e[i];
  if (n > 0) e[n - 1] = 0;
  let f = 0;
  let tst1 = 0;
  const eps = 2 ** -52;
  for (let l = 0; l < n; l++) {
    tst1 = Math.max(tst1, Math.abs(d[l]) + Math.abs(e[l]));
    let m = l;
    while (m < n) {
      if (Math.abs(e[m]) <= eps * tst1) break;
      m++;
    }
    if (m > l) {
      let iterations = 0;
      do {
        if (++iterations > 60) throw new Error('symmetric eigenvalue iteration did not converge');
        let g = d[l];
        let p = (d[l + 1] - g) / (2 * e[l]);
        let r = Math.hypot(p, 1);
        if (p < 0) r = -r;
        d[l] = e[l] / (p + r);
        d[l + 1] = e[l] * (p + r);
        const dl1 = d[l + 1];
        let h = g - d[l];
        for (let i = l + 2; i < n; i++) d[i] -= h;
        f += h;
        p = d[m];
        let c = 1;
        let c2 = c;
        let c3 = c;
        const el1 = e[l + 1];
        let s = 0;
        let s2 = 0;
        for (let i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i];
          h = c * p;
          r = Math.hypot(p, e[i]);
          e[i + 1] = s * r;
          s = e[i] / r;
          c = p / r;
          p = c * d[i] - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]);
          if (last) {
            const hk = last[i + 1];
            last[i + 1] = s * last[i] + c * hk;
            last[i] = c * last[i] - s * hk;
          }
          if (w) {
            const a = i * n;
            const b = (i + 1) * n;
            for (let k = 0; k < n; k++) {
              const hk = w[b + k];
              w[b + k] = s * w[a + k] + c * hk;
              w[a + k] = c * w[a + k] - s * hk;
            }
          }
        }
        p = (-s * s2 * c3 * el1 * e[l]) / dl1;
        e[l] = s * p;
        d[l] = c * p;
      } while (Math.abs(e[l]) > eps * tst1);
    }
    d[l] += f;
    e[l] = 0;
  }
}

function ascending(d: Float64Array): number[] {
  return Array.from(d, (_, i) => i).sort((a, b) => d[a] - d[b]);
}
