/**
 * The equality-constrained QP that polishing solves on a guessed active set,
 *
 *   [ P_FF  C' ] [x]   [r]
 *   [ C     0  ] [l] = [s],
 *
 * on the free variables F, with C the equality rows and the active inequality rows. Instead of
 * an LU of the whole indefinite matrix (2/3 (k + m)^3 flops, pivoting), the rows are added to the
 * Hessian as an augmented Lagrangian: C x = s makes the first block equal to
 * (P_FF + C'DC) x + C'l = r + C'Ds for any diagonal D >= 0, and H = P_FF + C'DC is positive
 * definite whenever the KKT matrix is non-singular (the reduced Hessian is), even where P_FF is
 * not (the homogenised form's scale variable has no curvature). One Cholesky of H (k^3 / 3) and
 * the small Schur complement S = C H^-1 C' then solve it; iterative refinement on the original
 * system removes the rounding and any ridge a singular case needed (the device of OSQP's
 * polishing, Stellato et al. 2020, Math. Programming Computation 12). D_j = d / |c_j|^2, with d
 * the largest diagonal entry of P_FF, gives each row curvature of P's own size.
 */
import { addRowTimes, gatheredRowsTimes, rowTimes, subtractDot, type PackedRows } from './kernels.js';
import { backSubstituteTransposed, choleskyInPlace, forwardSubstitute } from './dense-factor.js';
import { QP_TOLERANCES } from './types.js';

export interface EqualityKkt {
  /** P (n x n row-major) and the free variables F (indices into P). */
  P: Float64Array;
  n: number;
  free: Int32Array;
  /** The rows C on F's positions 0..k-1, packed. */
  C: PackedRows;
}

interface Factor {
  L: Float64Array;
  /** M_j = L^-1 c_j, and the Cholesky factor of S = M'M. */
  M: Float64Array[];
  Sf: Float64Array;
  D: Float64Array;
}

/** H's Cholesky factor; a ridge (removed again by refinement) only when H is not positive definite. */
function factorWithRidge(H: Float64Array, k: number, scale: number): Float64Array | null {
  const L = Float64Array.from(H);
  if (choleskyInPlace(L, k)) return L;
  for (let a = 0, reg = QP_TOLERANCES.ridgeStart * scale; a < QP_TOLERANCES.ridgeAttempts; a++, reg *= 100) {
    L.set(H);
    for (let i = 0; i < k; i++) L[i * k + i] += reg;
    if (choleskyInPlace(L, k)) return L;
  }
  return null;
}

/** H = P_FF + sum_j D_j c_j c_j' */
function augmentedHessian(e: EqualityKkt, D: Float64Array): Float64Array {
  const { P, n, free, C } = e;
  const k = free.length;
  const H = new Float64Array(k * k);
  for (let a = 0; a < k; a++) {
    const off = free[a] * n;
    for (let b = 0; b < k; b++) H[a * k + b] = P[off + free[b]];
  }
  for (let j = 0; j + 1 < C.start.length; j++) {
    const w = D[j];
    if (w === 0) continue;
    for (let t = C.start[j]; t < C.start[j + 1]; t++) {
      const off = C.col[t] * k;
      const wt = w * C.val[t];
      for (let u = C.start[j]; u < C.start[j + 1]; u++) H[off + C.col[u]] += wt * C.val[u];
    }
  }
  return H;
}

/**
 * With `independent`, a system that would need a ridge is refused instead ('dependent'): H not
 * positive definite, or a row of S whose pivot falls below QP_TOLERANCES.independentRows of its
 * diagonal entry (the row within rounding of the span of the rows before it).
 */
function factor(e: EqualityKkt, independent: boolean): Factor | null | 'dependent' {
  const k = e.free.length;
  const m = e.C.start.length - 1;
  let d = 0;
  for (let a = 0; a < k; a++) d = Math.max(d, Math.abs(e.P[e.free[a] * e.n + e.free[a]]));
  if (!(d > 0)) d = 1;
  const D = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    let norm2 = 0;
    for (let t = e.C.start[j]; t < e.C.start[j + 1]; t++) norm2 += e.C.val[t] * e.C.val[t];
    D[j] = norm2 > 0 ? d / norm2 : 0;
  }
  const H = augmentedHessian(e, D);
  const L = independent ? (choleskyInPlace(H, k) ? H : null) : factorWithRidge(H, k, d);
  if (!L) return independent ? 'dependent' : null;
  const M: Float64Array[] = [];
  for (let j = 0; j < m; j++) {
    const col = new Float64Array(k);
    addRowTimes(e.C, j, 1, col);
    forwardSubstitute(L, k, col);
    M.push(col);
  }
  const S = new Float64Array(m * m);
  const sDiag = new Float64Array(m);
  let sMax = 0;
  for (let a = 0; a < m; a++)
    for (let b = 0; b <= a; b++) {
      const v = -subtractDot(0, M[a], 0, M[b], 0, k);
      S[a * m + b] = v;
      S[b * m + a] = v;
      if (a === b) {
        sDiag[a] = v;
        sMax = Math.max(sMax, v);
      }
    }
  if (independent) {
    if (m > 0 && !choleskyInPlace(S, m)) return 'dependent';
    for (let a = 0; a < m; a++) {
      const pivot = S[a * m + a] * S[a * m + a];
      if (!(pivot >= QP_TOLERANCES.independentRows * sDiag[a])) return 'dependent';
    }
    return { L, M, Sf: S, D };
  }
  // Dependent rows (a degenerate active set) make S singular: a ridge picks one of the equal solutions.
  const Sf = m === 0 ? S : factorWithRidge(S, m, sMax || 1);
  if (!Sf) return null;
  return { L, M, Sf, D };
}

/** The solution (x, l) of the regularised system for right-hand side (rx, rs), into out. */
function solveWith(e: EqualityKkt, f: Factor, rx: Float64Array, rs: Float64Array, out: Float64Array): void {
  const k = e.free.length;
  const m = rs.length;
  const u = Float64Array.from(rx);
  for (let j = 0; j < m; j++) if (f.D[j] !== 0 && rs[j] !== 0) addRowTimes(e.C, j, f.D[j] * rs[j], u);
  forwardSubstitute(f.L, k, u);
  const lam = new Float64Array(m);
  for (let j = 0; j < m; j++) lam[j] = -subtractDot(0, f.M[j], 0, u, 0, k) - rs[j];
  if (m > 0) {
    forwardSubstitute(f.Sf, m, lam);
    backSubstituteTransposed(f.Sf, m, lam);
  }
  for (let j = 0; j < m; j++) if (lam[j] !== 0) for (let a = 0; a < k; a++) u[a] -= f.M[j][a] * lam[j];
  backSubstituteTransposed(f.L, k, u);
  out.set(u, 0);
  out.set(lam, k);
}

/** rx = r - P_FF x - C'l, rs = s - C x; the largest |entry|. */
function residualOf(
  e: EqualityKkt,
  sol: Float64Array,
  r: Float64Array,
  s: Float64Array,
  rx: Float64Array,
  rs: Float64Array,
): number {
  const { P, n, free, C } = e;
  const k = free.length;
  const x = sol.subarray(0, k);
  let big = 0;
  gatheredRowsTimes(P, n, free, free, x, rx);
  for (let a = 0; a < k; a++) rx[a] = r[a] - rx[a];
  for (let j = 0; j < rs.length; j++) {
    const l = sol[k + j];
    if (l !== 0) addRowTimes(C, j, -l, rx);
    rs[j] = s[j] - rowTimes(C, j, x);
    big = Math.max(big, Math.abs(rs[j]));
  }
  for (let a = 0; a < k; a++) big = Math.max(big, Math.abs(rx[a]));
  return big;
}

/** A solve of the system, (x, l) for the right-hand side (rx, rs) into out, before refinement. */
export type KktSolve = (rx: Float64Array, rs: Float64Array, out: Float64Array) => void;

/**
 * The factorised system's solve; null when it is singular beyond what a ridge can repair. With
 * `independent`, 'dependent' instead of a ridge where the rows are dependent (a degenerate active
 * set, whose multipliers the system does not determine) or H is singular: for a caller with
 * another way to solve such a system.
 */
export function factorEqualityKkt(e: EqualityKkt, rows?: 'independent'): KktSolve | null | 'dependent' {
  const f = factor(e, rows === 'independent');
  if (!f || f === 'dependent') return f;
  return (rx, rs, out) => solveWith(e, f, rx, rs, out);
}

/**
 * Iterative refinement that can stop half-way: `until(enough)` refines until the residual is at
 * most `enough` (or refinement ends) and returns the solution, which a later call refines further
 * in place, making the same corrections as one call to the end. Polishing decides a wrong guess
 * of the active set from a solution that is already far more exact than its tolerances, and
 * refines to the rounding level only the solution it keeps.
 */
export interface Refinement {
  until(enough: number): Float64Array;
  /** No further correction would be made: the residual stopped falling, or the steps ran out. */
  readonly ended: boolean;
}

/**
 * (x, l) for (r, s) by iterative refinement on the system e: `solve` gives a first answer and
 * then each correction from the residual (it may solve a smaller system that stands for e, as
 * substitute-two-entry-rows.ts does), until the residual stops falling.
 */
export function refinement(e: EqualityKkt, r: Float64Array, s: Float64Array, solve: KktSolve): Refinement {
  const k = e.free.length;
  const m = s.length;
  const sol = new Float64Array(k + m);
  solve(r, s, sol);
  const rx = new Float64Array(k);
  const rs = new Float64Array(m);
  const d = new Float64Array(k + m);
  let last = Infinity;
  let step = 0;
  let ended = false;
  // The residual of sol as it stands.
  let big = residualOf(e, sol, r, s, rx, rs);
  return {
    get ended() {
      return ended;
    },
    until(enough: number): Float64Array {
      while (!ended) {
        if (!(big < last)) {
          // The last correction did not help (rounding level reached): take it back.
          for (let a = 0; a < k + m; a++) sol[a] -= d[a];
          ended = true;
        } else if (big === 0 || step === QP_TOLERANCES.refinementSteps) ended = true;
        else if (big <= enough) break;
        else {
          last = big;
          solve(rx, rs, d);
          for (let a = 0; a < k + m; a++) sol[a] += d[a];
          step++;
          big = residualOf(e, sol, r, s, rx, rs);
        }
      }
      return sol;
    },
  };
}

/**
 * (x, l) solving the system above, x in F's order followed by one multiplier per row; null when
 * it is singular beyond what a ridge can repair.
 */
export function solveEqualityKkt(e: EqualityKkt, r: Float64Array, s: Float64Array): Float64Array | null {
  const solve = factorEqualityKkt(e);
  return solve && solve !== 'dependent' ? refinement(e, r, s, solve).until(0) : null;
}
