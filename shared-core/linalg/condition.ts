import type { Matrix } from './matrix.js';
import { formExtremes, tridiagonalEigenvalues } from './symmetric-eigen.js';
import { tridiagonalForm, type TridiagonalForm } from './tridiagonal-form.js';

/** Up to this size the condition number comes from every eigenvalue (4/3 N^3 flops). */
export const EXACT_CONDITION_LIMIT = 600;
/** Lanczos steps for larger matrices. */
export const LANCZOS_STEPS = 30;

export interface ConditionNumber {
  /** lambda_max / lambda_min; Infinity when lambda_min <= 0 (singular up to rounding). */
  value: number;
  /**
   * `eigenvalues`: exact; `lanczos`: Ritz values lie inside the spectrum, so a lower bound;
   * `lanczos-largest`: the largest from Lanczos (it converges first), the smallest known exactly.
   */
  method: 'eigenvalues' | 'lanczos' | 'lanczos-largest';
  largest: number;
  smallest: number;
}

/**
 * Condition number of a symmetric positive semi-definite matrix. Exact up to
 * EXACT_CONDITION_LIMIT; above it the extreme Ritz values of a Lanczos run with full
 * reorthogonalisation (Golub and Van Loan, Matrix Computations, 4th ed. 2013, section 10.1),
 * which keeps the diagnostic cheap (30 matrix-vector products) for large universes. The
 * largest Ritz value converges first; the smallest is an upper bound on the smallest eigenvalue,
 * so callers that know it exactly (a shrunk rank-deficient matrix) pass it in. A caller that has
 * the matrix's tridiagonal form gets the exact figure at any size in O(N) steps (bisection).
 */
export function conditionNumber(m: Matrix, knownSmallest?: number, form?: TridiagonalForm): ConditionNumber {
  const n = m.rows;
  if (n === 0) return { value: 1, method: 'eigenvalues', largest: 0, smallest: 0 };
  let values: Float64Array;
  let method: ConditionNumber['method'] = 'eigenvalues';
  if (form && form.n !== n) throw new RangeError(`a tridiagonal form of size ${form.n} for a ${n} x ${n} matrix`);
  if (form || n <= EXACT_CONDITION_LIMIT) {
    const { smallest, largest } = formExtremes(form ?? tridiagonalForm(m));
    values = Float64Array.of(smallest, largest);
  } else {
    values = lanczosRitzValues(m, LANCZOS_STEPS);
    method = 'lanczos';
  }
  const largest = values[values.length - 1];
  const smallest = knownSmallest ?? values[0];
  if (knownSmallest !== undefined && method === 'lanczos') method = 'lanczos-largest';
  // Eigenvalues below N * eps * lambda_max are rounding noise around zero.
  const floor = n * 2 ** -52 * Math.abs(largest);
  const value = smallest <= floor ? Infinity : largest / smallest;
  return { value, method, largest, smallest };
}

/** Ritz values of `steps` Lanczos steps from a fixed start vector (deterministic), ascending. */
export function lanczosRitzValues(m: Matrix, steps: number): Float64Array {
  const n = m.rows;
  const k = Math.min(steps, n);
  const q = new Float64Array(k * n); // Lanczos vectors, one per row
  const alpha = new Float64Array(k);
  const beta = new Float64Array(k);
  // A start vector with no special alignment to the coordinate axes.
  let norm = 0;
  for (let i = 0; i < n; i++) {
    const v = 1 + 0.5 * Math.sin(1.618 * (i + 1));
    q[i] = v;
    norm += v * v;
  }
  norm = Math.sqrt(norm);
  for (let i = 0; i < n; i++) q[i] /= norm;
  const w = new Float64Array(n);
  let used = k;
  for (let j = 0; j < k; j++) {
    const qj = q.subarray(j * n, (j + 1) * n);
    symmetricTimes(m, qj, w);
    let a = 0;
    for (let i = 0; i < n; i++) a += w[i] * qj[i];
    alpha[j] = a;
    // Full reorthogonalisation against every earlier vector (twice is enough: Kahan's rule).
    for (let pass = 0; pass < 2; pass++)
      for (let p = 0; p <= j; p++) {
        const qp = q.subarray(p * n, (p + 1) * n);
        let dot = 0;
        for (let i = 0; i < n; i++) dot += w[i] * qp[i];
        for (let i = 0; i < n; i++) w[i] -= dot * qp[i];
      }
    let b = 0;
    for (let i = 0; i < n; i++) b += w[i] * w[i];
    b = Math.sqrt(b);
    if (j + 1 === k) break;
    if (b <= 1e-14 * Math.abs(alpha[0] || 1)) {
      used = j + 1; // an invariant subspace: its Ritz values are exact eigenvalues
      break;
    }
    beta[j] = b;
    const next = q.subarray((j + 1) * n, (j + 2) * n);
    for (let i = 0; i < n; i++) next[i] = w[i] / b;
  }
  return tridiagonalEigenvalues(alpha.subarray(0, used), beta.subarray(0, used - 1));
}

/**
 * w = A q reading only the lower triangle of the symmetric A: each entry is loaded once and
 * used twice, which halves the memory traffic of a product that is bound by it.
 */
function symmetricTimes(a: Matrix, q: Float64Array, w: Float64Array): void {
  const n = a.rows;
  const d = a.data;
  w.fill(0);
  for (let i = 0; i < n; i++) {
    const off = i * n;
    const qi = q[i];
    let s = d[off + i] * qi;
    for (let j = 0; j < i; j++) {
      const aij = d[off + j];
      s += aij * q[j];
      w[j] += aij * qi;
    }
    w[i] += s;
  }
}
