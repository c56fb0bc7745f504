import type { Matrix } from './matrix.js';
import { householderVector, intoTridiagonalBasis, tridiagonalForm, type TridiagonalForm } from './tridiagonal-form.js';
import { wasmKernels, type WasmKernels } from './wasm/wasm-kernels.js';

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
  tridiagonalise(w, n, d, e);
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
  return formEigenvalues(tridiagonalForm(m));
}

/** Every eigenvalue of a reduced matrix, ascending, in O(N^2). */
export function formEigenvalues(form: TridiagonalForm): Float64Array {
  const d = Float64Array.from(form.diagonal);
  const e = Float64Array.from(form.offDiagonal);
  diagonalise(d, e, undefined, form.n);
  return d.sort();
}

/**
 * The smallest and the largest eigenvalue of a reduced matrix by bisection on Sturm counts of the
 * tridiagonal (Barth, Martin and Wilkinson 1967, Numer. Math. 9; Golub and Van Loan 2013, section
 * 8.4.1): O(N) per step, about 60 steps each, to the same absolute accuracy as QL (a few eps
 * times the largest eigenvalue in size), without the O(N^2) of all the eigenvalues.
 */
export function formExtremes(form: TridiagonalForm): { smallest: number; largest: number } {
  const n = form.n;
  if (n === 0) return { smallest: 0, largest: 0 };
  // Gershgorin bounds; the count runs on T / size, so that no square of an entry overflows or
  // underflows whatever the matrix's scale.
  let size = 0;
  for (let i = 0; i < n; i++) {
    const r = (i > 0 ? Math.abs(form.offDiagonal[i]) : 0) + (i + 1 < n ? Math.abs(form.offDiagonal[i + 1]) : 0);
    size = Math.max(size, Math.abs(form.diagonal[i]) + r);
  }
  if (!(size > 0)) return { smallest: 0, largest: 0 };
  const d = Float64Array.from(form.diagonal, (x) => x / size);
  const e2 = Float64Array.from(form.offDiagonal, (x) => (x / size) * (x / size));
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const r = (i > 0 ? Math.sqrt(e2[i]) : 0) + (i + 1 < n ? Math.sqrt(e2[i + 1]) : 0);
    lo = Math.min(lo, d[i] - r);
    hi = Math.max(hi, d[i] + r);
  }
  const tiny = 2 ** -52;
  /** How many eigenvalues lie below x (the sign changes of the Sturm sequence). */
  const below = (x: number): number => {
    let count = 0;
    let q = 1;
    for (let i = 0; i < n; i++) {
      q = d[i] - x - (i > 0 ? e2[i] / q : 0);
      if (q === 0) q = -tiny;
      if (q < 0) count++;
    }
    return count;
  };
  /** The k-th eigenvalue (0-based, ascending). */
  const kth = (k: number): number => {
    let a = lo - tiny;
    let b = hi + tiny;
    for (let step = 0; step < 200 && b - a > 2 * 2 ** -52 * Math.max(Math.abs(a), Math.abs(b)) + tiny; step++) {
      const mid = a + (b - a) / 2;
      if (below(mid) > k) b = mid;
      else a = mid;
    }
    return (a + (b - a) / 2) * size;
  };
  return { smallest: kth(0), largest: kth(n - 1) };
}

export interface SpectralExposures {
  /** Eigenvalues of the matrix (in no particular order). */
  values: Float64Array;
  /** exposures[k] = (e_k'v)^2 for the unit eigenvector e_k of values[k]. */
  exposures: Float64Array;
}

/**
 * Eigenvalues this close (relative to the largest in size) count as one repeated eigenvalue:
 * a few hundred times the rounding error of the reduction and QL, far below any gap an estimate
 * can resolve.
 */
export const REPEATED_EIGENVALUE = 2 ** -40;

/**
 * The squared exposures of a vector v to the eigenvectors of a symmetric matrix, without forming
 * the eigenvectors: v is carried into the tridiagonal basis by the reduction's reflectors
 * (O(N^2)), then through the QL rotations at O(1) each, as Golub and Welsch (1969, Math. Comp.
 * 23) carry one row of the eigenvectors for Gauss quadrature weights. Where an eigenvalue
 * repeats, the split of v's exposure among its eigenvectors depends on an arbitrary choice of
 * basis; its whole exposure (the squared length of v's projection on the eigenspace, which does
 * not) lands on one of its copies.
 */
export function spectralExposures(m: Matrix, v: ArrayLike<number>): SpectralExposures {
  return formExposures(tridiagonalForm(m), v);
}

export function formExposures(form: TridiagonalForm, v: ArrayLike<number>): SpectralExposures {
  const n = form.n;
  const y = intoTridiagonalBasis(form, v);
  const d = Float64Array.from(form.diagonal);
  diagonalise(d, Float64Array.from(form.offDiagonal), undefined, n, y);
  const exposures = Float64Array.from(y, (x) => x * x);
  const order = ascending(d);
  let size = 0;
  for (const x of d) size = Math.max(size, Math.abs(x));
  const tie = REPEATED_EIGENVALUE * size;
  for (let a = 0; a < n;) {
    let b = a + 1;
    while (b < n && d[order[b]] - d[order[b - 1]] <= tie) b++;
    for (let c = a + 1; c < b; c++) {
      exposures[order[a]] += exposures[order[c]];
      exposures[order[c]] = 0;
    }
    a = b;
  }
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

/**
 * Householder tridiagonalisation with the transformation accumulated (tred2), for the full
 * decomposition. On return d is the diagonal and e[1..n-1] the off-diagonal.
 */
function tridiagonalise(w: Float64Array, n: number, d: Float64Array, e: Float64Array): void {
  // V[r][c] is w[c * n + r].
  for (let j = 0; j < n; j++) d[j] = w[j * n + n - 1];
  for (let i = n - 1; i > 0; i--) {
    const h = householderVector(d, i, e);
    if (h === 0) {
      for (let j = 0; j < i; j++) {
        d[j] = w[j * n + i - 1];
        w[j * n + i] = 0;
        w[i * n + j] = 0;
      }
    } else {
      let f: number;
      let g: number;
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
 * `tracked` (a vector's coordinates in the tridiagonal basis, which end as its coordinates in
 * the eigenvector basis) when given.
 */
function diagonalise(
  d: Float64Array,
  e: Float64Array,
  w: Float64Array | undefined,
  n: number,
  tracked?: Float64Array,
): void {
  if (!w && n > 1) {
    const wasm = wasmKernels();
    if (wasm && diagonaliseInWasm(wasm, d, e, n, tracked)) return;
  }
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
        if (++iterations > 60) throw new Error(NOT_CONVERGED);
        let g = d[l];
        let p = (d[l + 1] - g) / (2 * e[l]);
        let r = hypot(p, 1);
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
          r = hypot(p, e[i]);
          e[i + 1] = s * r;
          s = e[i] / r;
          c = p / r;
          p = c * d[i] - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]);
          if (tracked) {
            const hk = tracked[i + 1];
            tracked[i + 1] = s * tracked[i] + c * hk;
            tracked[i] = c * tracked[i] - s * hk;
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

/**
 * diagonalise without eigenvectors in the WebAssembly module (tridiagonal.c, tridiagonal_ql), the
 * same operations in the same order, on copies of d, e and `tracked`, one call per eigenvalue (the
 * first calls run unoptimised code, the rest optimised). False, with the arrays untouched, where
 * an entry needs Math.hypot's care or is NaN: the TypeScript then makes the whole.
 */
function diagonaliseInWasm(
  wasm: WasmKernels,
  d: Float64Array,
  e: Float64Array,
  n: number,
  tracked: Float64Array | undefined,
): boolean {
  const [dw, ew, yw, state] = wasm.views(n, n, n, 2);
  dw.set(d.subarray(0, n));
  ew.set(e.subarray(1, n));
  ew[n - 1] = 0;
  if (tracked) yw.set(tracked.subarray(0, n));
  state.fill(0);
  for (let l = 0; l < n; l++) {
    const status = wasm.exports.tridiagonal_ql(
      dw.byteOffset,
      ew.byteOffset,
      yw.byteOffset,
      tracked ? 1 : 0,
      n,
      l,
      l + 1,
      state.byteOffset,
    );
    if (status === 1) return false;
    if (status === 2) throw new Error(NOT_CONVERGED);
  }
  d.set(dw);
  e.set(ew);
  if (tracked) tracked.set(yw);
  return true;
}

const NOT_CONVERGED = 'symmetric eigenvalue iteration did not converge';

/**
 * sqrt(a^2 + b^2): the plain formula where neither square can overflow or underflow, which is
 * every entry of a covariance in practice, and Math.hypot (several times slower in V8) otherwise.
 */
function hypot(a: number, b: number): number {
  const big = Math.max(Math.abs(a), Math.abs(b));
  return big < 1e150 && big > 1e-150 ? Math.sqrt(a * a + b * b) : Math.hypot(a, b);
}

function ascending(d: Float64Array): number[] {
  return Array.from(d, (_, i) => i).sort((a, b) => d[a] - d[b]);
}
