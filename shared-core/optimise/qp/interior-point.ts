/**
 * Primal-dual interior-point method with Mehrotra's predictor-corrector (Mehrotra 1992, SIAM J.
 * Optimization 2; the form of Nocedal and Wright, Numerical Optimization, 2nd ed. 2006, ch. 16.6)
 * for the QP of types.ts. Slacks s (G x + s = h) and bound slacks are eliminated, leaving the
 * n x n normal matrix H = P + G'WG + diag(bound terms), factored once per iteration and used for
 * the predictor, the corrector and Gondzio's centrality correctors (centralityTargets); equality
 * rows go through the small Schur complement A H^-1 A'. It stops at a modest residual and leaves
 * the last digits to polishing (polish.ts), which solves the identified active set exactly.
 *
 * A finite bound is carried as one more inequality row with a single entry (-x <= -lb, x <= ub),
 * after the rows of G, so every step is one pass over all the inequalities; the sums it makes are
 * those of the separate bound terms, in the same order. Every loop is a small kernel
 * (kernels.ts and below) over buffers allocated once per solve, and an iteration only calls them:
 * a command-line run solves once in a fresh process, where V8 optimises a small loop called many
 * times within its first few calls, and one long function with many loops late and at length.
 */
import { allFinite } from '../../linalg/matrix.js';
import { throwIfCancelled, type CancelCheck } from '../../stability/cancel.js';
import {
  auxiliaryWorkspace,
  factorEliminated,
  planAuxiliaries,
  solveEliminated,
  type AuxiliaryFactor,
  type AuxiliaryPlan,
} from './auxiliary-elimination.js';
import { choleskyInPlace, choleskySolveInPlace } from './dense-factor.js';
import {
  addDot,
  addRowsTimes,
  addRowTimes,
  maxAbs,
  packedRows,
  rowsTimes,
  rowTimes,
  type PackedRows,
} from './kernels.js';
import { QP_TOLERANCES, type QpProblem, type QpSolution, type QpWarmStart } from './types.js';

export interface InteriorPointOutcome {
  status: 'converged' | 'iteration-limit' | 'breakdown' | 'stalled-infeasible';
  solution: QpSolution;
  /** The constraints the last iterate takes for active (activeSet), polishing's first guess. */
  active: QpWarmStart;
  /** Iterations so far, over every run of a resumed interior point. */
  iterations: number;
  residual: number;
}

export interface InteriorPointOptions {
  tolerance: number;
  maxIterations?: number;
  /** Stop early (to let phase one decide) when primal infeasibility stalls. */
  detectInfeasibility?: boolean;
  /** Polled at every iteration; a true answer throws CancelledError (stability/cancel.ts). */
  shouldCancel?: CancelCheck;
  /**
   * Start from the middle of the bounds with unit slacks and multipliers instead of the
   * least-squares point (leastSquaresStart). Phase one's elastic problem, a linear programme
   * but for a 1e-10 proximal term, takes longer from the least-squares point: seed 37 of the
   * random problems of qp-solver.test.ts 68 -> 188 iterations.
   */
  middleStart?: boolean;
}

/** out = q + P x (P n x n, row-major), each entry summed from q_i in increasing column. */
function denseTimesPlus(out: Float64Array, P: Float64Array, n: number, x: Float64Array, q: Float64Array): void {
  for (let i = 0; i < n; i++) out[i] = addDot(q[i], P, i * n, x, n);
}

/** acc + sum_k a_k b_k, added in increasing k. */
function complementarity(s: Float64Array, z: Float64Array, rc: Float64Array): number {
  let acc = 0;
  for (let k = 0; k < s.length; k++) {
    rc[k] = s[k] * z[k];
    acc += rc[k];
  }
  return acc;
}

/** v += alpha dv */
function stepBy(v: Float64Array, dv: Float64Array, alpha: number): void {
  for (let k = 0; k < v.length; k++) v[k] += alpha * dv[k];
}

/** acc + sum_k (s_k + alpha ds_k)(z_k + alpha dz_k): the complementarity after a step. */
function addSteppedProducts(
  acc: number,
  s: Float64Array,
  ds: Float64Array,
  z: Float64Array,
  dz: Float64Array,
  alpha: number,
): number {
  for (let k = 0; k < s.length; k++) acc += (s[k] + alpha * ds[k]) * (z[k] + alpha * dz[k]);
  return acc;
}

/** out_k = s_k z_k + ds_k dz_k - sigma mu (the corrector's: centring plus the second-order term). */
function corrected(
  out: Float64Array,
  s: Float64Array,
  z: Float64Array,
  ds: Float64Array,
  dz: Float64Array,
  sigma: number,
  mu: number,
): void {
  for (let k = 0; k < s.length; k++) out[k] = s[k] * z[k] + ds[k] * dz[k] - sigma * mu;
}

/**
 * out_k = rc_k - t_k, Gondzio's centrality corrector (Gondzio 1996, "Multiple centrality
 * corrections in a primal-dual method for linear programming", Computational Optimization and
 * Applications 6): at the trial step `aim` along (ds, dz) each product v_k = (s_k + aim ds_k)
 * (z_k + aim dz_k) is pushed back into the box [lo, hi] around the target sigma mu, t_k = lo - v_k
 * below it, hi - v_k (no less than -hi, as Colombo and Gondzio 2008, COAP 41) above it, 0 inside.
 * The Newton system is linear in its complementarity right-hand side, so the direction for
 * rc - t is the current direction plus the corrector.
 */
function centralityTargets(
  out: Float64Array,
  rc: Float64Array,
  s: Float64Array,
  z: Float64Array,
  ds: Float64Array,
  dz: Float64Array,
  aim: number,
  lo: number,
  hi: number,
): void {
  for (let k = 0; k < s.length; k++) {
    const v = (s[k] + aim * ds[k]) * (z[k] + aim * dz[k]);
    out[k] = rc[k] - (v < lo ? lo - v : v > hi ? Math.max(hi - v, -hi) : 0);
  }
}

/** out_r = row_r . x - b_r (A x - b), each dot product from 0 over the row's entries in order. */
function rowsLess(m: PackedRows, x: Float64Array, b: Float64Array, out: Float64Array): void {
  for (let r = 0; r < out.length; r++) out[r] = rowTimes(m, r, x) - b[r];
}

/** out_r = row_r . x + c_r */
function rowsPlus(m: PackedRows, x: Float64Array, c: Float64Array, out: Float64Array): void {
  for (let r = 0; r < out.length; r++) out[r] = rowTimes(m, r, x) + c[r];
}

/** out_r = row_r . x + s_r - h_r: the inequality rows' residuals. */
function rowResiduals(m: PackedRows, x: Float64Array, s: Float64Array, h: Float64Array, out: Float64Array): void {
  for (let r = 0; r < out.length; r++) out[r] = rowTimes(m, r, x) + s[r] - h[r];
}

/** H += w row_r row_r' (H n x n, row-major). */
function addOuter(m: PackedRows, r: number, w: number, H: Float64Array, n: number): void {
  const { start, col, val } = m;
  for (let a = start[r]; a < start[r + 1]; a++) {
    const off = col[a] * n;
    const wa = w * val[a];
    for (let c = start[r]; c < start[r + 1]; c++) H[off + col[c]] += wa * val[c];
  }
}

/** H += sum_r (z_r / s_r) row_r row_r', row by row. */
function addWeightedOuters(m: PackedRows, z: Float64Array, s: Float64Array, H: Float64Array, n: number): void {
  for (let r = 0; r < s.length; r++) addOuter(m, r, z[r] / s[r], H, n);
}

/**
 * f = -rd + sum_r f_r row_r with f_r = -(z_r r_r - rc_r) / s_r, rows in order, f_r = 0 skipped:
 * the Newton right-hand side with the inequality rows eliminated.
 */
function newtonRhs(
  m: PackedRows,
  rd: Float64Array,
  z: Float64Array,
  ri: Float64Array,
  rc: Float64Array,
  s: Float64Array,
  f: Float64Array,
): void {
  for (let i = 0; i < f.length; i++) f[i] = -rd[i];
  for (let r = 0; r < s.length; r++) {
    const fr = -(z[r] * ri[r] - rc[r]) / s[r];
    if (fr !== 0) addRowTimes(m, r, fr, f);
  }
}

/** Each inequality row's slack step ds_r = -ri_r - row_r . dx and multiplier step dz_r = (-rc_r - z_r ds_r) / s_r. */
function slackSteps(
  m: PackedRows,
  dx: Float64Array,
  ri: Float64Array,
  rc: Float64Array,
  z: Float64Array,
  s: Float64Array,
  d: Direction,
): void {
  const { ds, dz } = d;
  for (let r = 0; r < s.length; r++) {
    ds[r] = -ri[r] - rowTimes(m, r, dx);
    dz[r] = (-rc[r] - z[r] * ds[r]) / s[r];
  }
}

function maxAbsDiagonal(H: Float64Array, n: number): number {
  let m = 0;
  for (let i = 0; i < n; i++) m = Math.max(m, Math.abs(H[i * n + i]));
  return m;
}

/** x'(P x)/2 + q'x from rd's P x + q (the multiplier terms do not matter at the scale it serves). */
function primalObjective(x: Float64Array, rd: Float64Array, q: Float64Array): number {
  let pObj = 0;
  for (let i = 0; i < x.length; i++) pObj += x[i] * (0.5 * (rd[i] - q[i]) + q[i]);
  return pObj;
}

/** Largest step in (0, cap] that keeps v + a dv >= 0. */
function maxStep(v: Float64Array, dv: Float64Array, cap: number): number {
  let a = cap;
  for (let k = 0; k < v.length; k++) if (dv[k] < 0) a = Math.min(a, -v[k] / dv[k]);
  return a;
}

/** One Newton direction: dx, dy, and the slacks' and multipliers' of every inequality row. */
interface Direction {
  dx: Float64Array;
  dy: Float64Array;
  ds: Float64Array;
  dz: Float64Array;
}

const newDirection = (n: number, me: number, m: number): Direction => ({
  dx: new Float64Array(n),
  dy: new Float64Array(me),
  ds: new Float64Array(m),
  dz: new Float64Array(m),
});

/** The problem, the iterate and the buffers of one solve. */
interface State {
  n: number;
  me: number;
  p: QpProblem;
  A: PackedRows;
  /** The inequality rows: G's, then one per finite lower bound, then one per finite upper bound. */
  R: PackedRows;
  /** Their right-hand sides (h, -lb, ub). */
  hR: Float64Array;
  x: Float64Array;
  y: Float64Array;
  s: Float64Array;
  z: Float64Array;
  rd: Float64Array;
  rp: Float64Array;
  /** Residuals of the inequality rows, R x + s - hR. */
  ri: Float64Array;
  /**
   * The normal matrix, formed here and factored in place (empty when auxiliaries are
   * eliminated). A factorisation that fails forms it again for its ridge, rather than every
   * iteration copying a matrix kept aside: an n x n copy (18 MB at n = 1501) less an iteration.
   */
  Hf: Float64Array;
  /**
   * Auxiliary variables (turnover, gross exposure) eliminated from the normal matrix
   * (auxiliary-elimination.ts): the plan, its factor and the row weights z/s.
   */
  eliminated: { plan: AuxiliaryPlan; factor: AuxiliaryFactor; w: Float64Array } | null;
  /** H^-1 a_r for each equality row r, the Schur complement A H^-1 A' and its factor. */
  M: Float64Array[];
  Sm: Float64Array;
  Sf: Float64Array;
  /** Right-hand side of a Newton solve. */
  f: Float64Array;
  /** The factors hold for the current iterate (the starting point's, reused by the first iteration). */
  factored: boolean;
}

/** rd = P x + q + A'y + R'z, rp = A x - b, ri = R x + s - hR. */
function residuals(st: State): void {
  const { n, x, rd } = st;
  denseTimesPlus(rd, st.p.P.data, n, x, st.p.q);
  addRowsTimes(st.A, st.y, rd);
  addRowsTimes(st.R, st.z, rd);
  rowsLess(st.A, x, st.p.b, st.rp);
  rowResiduals(st.R, x, st.s, st.hR, st.ri);
}

/** H = P + R' (Z/S) R into Hf; the largest |diagonal entry|. */
function normalMatrix(st: State): number {
  const { n, Hf } = st;
  Hf.set(st.p.P.data.subarray(0, n * n));
  addWeightedOuters(st.R, st.z, st.s, Hf, n);
  return maxAbsDiagonal(Hf, n);
}

/**
 * Cholesky of the normal matrix in Hf, formed by normalMatrix; a singular one (a direction free
 * of curvature and constraints) is formed again with a small ridge.
 */
function factorNormal(st: State, maxDiag: number): boolean {
  const { n, Hf } = st;
  let factored = choleskyInPlace(Hf, n);
  for (
    let attempt = 0, reg = QP_TOLERANCES.ridgeStart * (maxDiag || 1);
    !factored && attempt < QP_TOLERANCES.ridgeAttempts;
    attempt++, reg *= 100
  ) {
    normalMatrix(st);
    for (let i = 0; i < n; i++) Hf[i * n + i] += reg;
    factored = choleskyInPlace(Hf, n);
  }
  return factored;
}

/** v = H^-1 v with the iteration's factor. */
function solveNormal(st: State, v: Float64Array): void {
  if (st.eliminated) solveEliminated(st.eliminated.plan, st.eliminated.factor, v);
  else choleskySolveInPlace(st.Hf, st.n, v);
}

/** The normal matrix's factor with the auxiliaries eliminated; false when it does not factor. */
function factorWithoutAuxiliaries(st: State): boolean {
  const e = st.eliminated!;
  for (let r = 0; r < e.w.length; r++) e.w[r] = st.z[r] / st.s[r];
  if (!allFinite(e.w)) return false;
  return factorEliminated(e.plan, e.factor, e.w);
}

/** Schur complement of the equality rows, S = A H^-1 A', factored into Sf. */
function factorSchur(st: State): boolean {
  const { me, A, M, Sm, Sf } = st;
  for (let r = 0; r < me; r++) {
    const col = M[r];
    col.fill(0);
    addRowTimes(A, r, 1, col);
    solveNormal(st, col);
  }
  for (let a = 0; a < me; a++) for (let c = 0; c < me; c++) Sm[a * me + c] = rowTimes(A, a, M[c]);
  let sMax = 0;
  for (let a = 0; a < me; a++) sMax = Math.max(sMax, Sm[a * me + a]);
  // Dependent equality rows make S singular: a small ridge picks one of the equal solutions.
  Sf.set(Sm);
  let sFactored = me === 0 || choleskyInPlace(Sf, me);
  for (
    let attempt = 0, reg = QP_TOLERANCES.ridgeStart * (sMax || 1);
    !sFactored && attempt < QP_TOLERANCES.ridgeAttempts;
    attempt++, reg *= 100
  ) {
    Sf.set(Sm);
    for (let a = 0; a < me; a++) Sf[a * me + a] += reg;
    sFactored = choleskyInPlace(Sf, me);
  }
  return sFactored;
}

/** dx, dy of the reduced Newton system for right-hand side st.f. */
function solveNewton(st: State, dx: Float64Array, dy: Float64Array): void {
  const { me, M } = st;
  dx.set(st.f);
  solveNormal(st, dx);
  rowsPlus(st.A, dx, st.rp, dy);
  if (me > 0) choleskySolveInPlace(st.Sf, me, dy);
  for (let r = 0; r < me; r++) stepBy(dx, M[r], -dy[r]); // dx - dy_r M_r, as dx + (-dy_r) M_r
}

/** The Newton direction for complementarity targets rc (one per inequality row), into d. */
function direction(st: State, rc: Float64Array, d: Direction): void {
  newtonRhs(st.R, st.rd, st.z, st.ri, rc, st.s, st.f);
  solveNewton(st, d.dx, d.dy);
  slackSteps(st.R, d.dx, st.ri, rc, st.z, st.s, d);
}

/** Largest step in (0, 1] that keeps every slack and multiplier non-negative. */
const stepOf = (st: State, d: Direction): number => maxStep(st.z, d.dz, maxStep(st.s, d.ds, 1));

function advance(st: State, d: Direction, alpha: number): void {
  stepBy(st.x, d.dx, alpha);
  stepBy(st.y, d.dy, alpha);
  stepBy(st.s, d.ds, alpha);
  stepBy(st.z, d.dz, alpha);
}

/** G's rows, then -x_i <= -lb_i for each finite lower bound, then x_i <= ub_i for each finite upper one. */
function inequalityRows(p: QpProblem, L: readonly number[], U: readonly number[]): { R: PackedRows; hR: Float64Array } {
  const G = packedRows(p.G);
  const mi = p.G.length;
  const m = mi + L.length + U.length;
  const e = G.col.length;
  const start = new Int32Array(m + 1);
  const col = new Int32Array(e + L.length + U.length);
  const val = new Float64Array(e + L.length + U.length);
  const hR = new Float64Array(m);
  start.set(G.start);
  col.set(G.col);
  val.set(G.val);
  hR.set(p.h);
  for (let k = 0; k < L.length; k++) {
    col[e + k] = L[k];
    val[e + k] = -1;
    start[mi + k + 1] = e + k + 1;
    hR[mi + k] = -p.lb[L[k]];
  }
  for (let k = 0, o = e + L.length; k < U.length; k++, o++) {
    col[o] = U[k];
    val[o] = 1;
    start[mi + L.length + k + 1] = o + 1;
    hR[mi + L.length + k] = p.ub[U[k]];
  }
  return { R: { start, col, val }, hR };
}

function startingState(p: QpProblem, L: readonly number[], U: readonly number[]): State {
  const n = p.q.length;
  const me = p.A.length;
  const { R, hR } = inequalityRows(p, L, U);
  const m = hR.length;
  // Inside the bounds, unit slacks and multipliers (an infeasible start): the starting point
  // when the least-squares one (leastSquaresStart) cannot be had.
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const lo = p.lb[i];
    const hi = p.ub[i];
    if (Number.isFinite(lo) && Number.isFinite(hi)) x[i] = 0.5 * (lo + hi);
    else if (Number.isFinite(lo)) x[i] = lo + 1;
    else if (Number.isFinite(hi)) x[i] = hi - 1;
  }
  const s = new Float64Array(m);
  rowsTimes(R, x, s);
  for (let r = 0; r < m; r++) s[r] = Math.max(hR[r] - s[r], 1);
  const plan = planAuxiliaries(p.P.data, n, R);
  const dim = plan ? 0 : n * n;
  return {
    n,
    me,
    p,
    A: packedRows(p.A),
    R,
    hR,
    x,
    y: new Float64Array(me),
    s,
    z: new Float64Array(m).fill(1),
    rd: new Float64Array(n),
    rp: new Float64Array(me),
    ri: new Float64Array(m),
    Hf: new Float64Array(dim),
    eliminated: plan ? { plan, factor: auxiliaryWorkspace(plan), w: new Float64Array(m) } : null,
    M: Array.from({ length: me }, () => new Float64Array(n)),
    Sm: new Float64Array(me * me),
    Sf: new Float64Array(me * me),
    f: new Float64Array(n),
    factored: false,
  };
}

/**
 * How many centrality correctors an iteration may try after Mehrotra's. Each reuses the
 * iteration's factor and costs one solve, so Gondzio (1996) sets their number by the ratio of a
 * factorisation's cost to a solve's. Cholesky of order k costs about k^3/3 multiply-adds and its
 * two triangular solves 2k^2 (Golub and Van Loan, Matrix Computations, 4th ed., 4.2): a ratio
 * of k/6. One corrector per 20 of that ratio, at most 4: none below k = 120 (screened working
 * sets, small problems), where a solve is not cheap beside a factorisation.
 */
function centralityCorrections(st: State): number {
  const k = st.eliminated ? st.eliminated.plan.dense.length : st.n;
  return Math.min(4, Math.floor(k / 6 / 20));
}

/** Factor the normal matrix and the equality rows' Schur complement at the current s, z. */
function factorAll(st: State): boolean {
  let factored: boolean;
  if (st.eliminated) factored = factorWithoutAuxiliaries(st);
  else {
    const maxDiag = normalMatrix(st);
    factored = Number.isFinite(maxDiag) && factorNormal(st, maxDiag);
  }
  return factored && factorSchur(st);
}

/**
 * The starting point, from one factorisation with unit scaling (every z_r / s_r = 1, the
 * normal matrix P + R'R). Its solution is the least-squares point that cvxopt's coneqp starts
 * from by default (cvxopt's coneprog.py; Vandenberghe 2010, "The CVXOPT linear and quadratic
 * cone program solvers"):
 *
 *   minimise 1/2 x'Px + q'x + 1/2 |R x - hR|^2  subject to  A x = b,
 *
 * with y its equality multipliers. Each row's residual r = |hR - R x| (its slack where the row
 * holds, its violation where not) is shifted as Mehrotra (1992, SIAM J. Optimization 2, his
 * starting point) shifts least-squares slacks and multipliers (Nocedal and Wright, Numerical
 * Optimization, 2nd ed., section 14.2, the starting-point heuristic): r + delta with
 * delta = 1/2 r'r / sum_k r_k (his first shift, -3/2 min r, is zero for r >= 0), and taken as both
 * the slack and the multiplier. With s = z the scaling stays the unit one, so the factorisation
 * that gave the point also serves the first iteration: the start costs two triangular solves.
 * False (the caller keeps the middle of the bounds) when the factorisation fails or the point is
 * not finite.
 */
function leastSquaresStart(st: State): boolean {
  const { x, y, s, z, f, R, hR, p } = st;
  const m = s.length;
  s.fill(1);
  z.fill(1);
  if (!factorAll(st)) return false;
  for (let i = 0; i < st.n; i++) f[i] = -p.q[i];
  addRowsTimes(R, hR, f);
  for (let r = 0; r < st.me; r++) st.rp[r] = -p.b[r];
  solveNewton(st, x, y);
  if (!allFinite(x) || !allFinite(y)) return false;
  rowsTimes(R, x, s);
  let squares = 0;
  let sum = 0;
  for (let r = 0; r < m; r++) {
    s[r] = Math.abs(hR[r] - s[r]);
    squares += s[r] * s[r];
    sum += s[r];
  }
  const delta = (0.5 * squares) / sum;
  if (!(delta > 0) || !Number.isFinite(delta)) return false;
  for (let r = 0; r < m; r++) z[r] = s[r] += delta;
  return true;
}

/**
 * Which inequality rows the iterate takes for active. With the iterate before the last step,
 * the Tapia indicators (El-Bakry, Tapia and Zhang 1994, "A study of indicators for identifying
 * zero variables in interior-point methods", SIAM Review 36): near a solution an active row's
 * slack falls by a factor that tends to 0 while its multiplier's tends to 1, and the other way
 * round for an inactive row, so a row is active when its slack fell by more than its multiplier,
 * s / s_before < z / z_before. Before any step: z > s. The bench's N = 500 problems (seeds 1-2,
 * handover at 1e-9) needed 1-3 polishing solves from the indicators against 1-4 from z > s,
 * one solve on 12 of 14 problems: z > s kept weakly active bounds (slack 1e-5, multiplier 1e-6
 * and both still falling) out of the first guess.
 */
function activeSet(
  s: Float64Array,
  z: Float64Array,
  sBefore: Float64Array | null,
  zBefore: Float64Array | null,
): Uint8Array {
  const out = new Uint8Array(s.length);
  for (let r = 0; r < s.length; r++)
    out[r] = (sBefore && zBefore ? s[r] * zBefore[r] < z[r] * sBefore[r] : z[r] > s[r]) ? 1 : 0;
  return out;
}

/**
 * An interior point that can be resumed: `run(tolerance)` iterates from where the last call
 * stopped until the residual meets `tolerance` (or the iteration limit, a breakdown or a stall),
 * and returns the iterate. The solver hands over to polishing early and, when polishing's
 * identification fails, resumes to a tighter tolerance instead of starting again.
 */
export interface InteriorPointRun {
  /** `detectInfeasibility` overrides the option of the start (a resumed run has converged once). */
  run(tolerance: number, detectInfeasibility?: boolean): InteriorPointOutcome;
}

export function interiorPoint(p: QpProblem, options: InteriorPointOptions): InteriorPointOutcome {
  return startInteriorPoint(p, options).run(options.tolerance);
}

export function startInteriorPoint(p: QpProblem, options: Omit<InteriorPointOptions, 'tolerance'>): InteriorPointRun {
  const n = p.q.length;
  const mi = p.G.length;
  const L: number[] = [];
  const U: number[] = [];
  for (let i = 0; i < n; i++) {
    if (Number.isFinite(p.lb[i])) L.push(i);
    if (Number.isFinite(p.ub[i])) U.push(i);
  }
  const st = startingState(p, L, U);
  const { x, y, s, z, rd, rp, ri } = st;
  const mTotal = s.length;
  const maxIt = options.maxIterations ?? QP_TOLERANCES.maxIterations;

  const qScale = 1 + maxAbs(p.q);
  let bScale = 1 + maxAbs(p.b) + maxAbs(p.h);
  for (const i of L) bScale = Math.max(bScale, 1 + Math.abs(p.lb[i]));
  for (const i of U) bScale = Math.max(bScale, 1 + Math.abs(p.ub[i]));

  const rc = new Float64Array(mTotal);
  // The slacks and multipliers before the last step, for the indicators of activeSet.
  const sBefore = new Float64Array(mTotal);
  const zBefore = new Float64Array(mTotal);
  let stepped = false;
  const aff = newDirection(n, st.me, mTotal);
  let cor = newDirection(n, st.me, mTotal);
  let spare = newDirection(n, st.me, mTotal);
  const rcG1 = new Float64Array(mTotal);
  const rcG2 = new Float64Array(mTotal);
  let rcNow = rc;
  const corrections = centralityCorrections(st);
  let it = 0;
  let residual = Infinity;
  let bestPrimal = Infinity;
  let stallCount = 0;
  let started = false;
  let status: InteriorPointOutcome['status'] = 'iteration-limit';

  const run = (tolerance: number, detectInfeasibility = options.detectInfeasibility): InteriorPointOutcome => {
    if (!started) {
      started = true;
      if (mTotal > 0 && !options.middleStart) {
        const middle = { x: x.slice(), s: s.slice() };
        st.factored = leastSquaresStart(st);
        if (!st.factored) {
          x.set(middle.x);
          y.fill(0);
          s.set(middle.s);
          z.fill(1);
        }
      }
    }
    if (status === 'breakdown' || status === 'stalled-infeasible') return outcome();
    status = 'iteration-limit';
    for (; it < maxIt; it++) {
      throwIfCancelled(options.shouldCancel);
      residuals(st);
      // rc = s z is also the predictor's complementarity target (s and z do not change before it).
      const gap = complementarity(s, z, rc);
      const mu = mTotal > 0 ? gap / mTotal : 0;
      const pObj = primalObjective(x, rd, p.q);
      const primalRes = Math.max(maxAbs(rp), maxAbs(ri)) / bScale;
      const dualRes = maxAbs(rd) / qScale;
      residual = Math.max(primalRes, dualRes, gap / (1 + Math.abs(pObj)));
      if (residual <= tolerance) {
        status = 'converged';
        break;
      }
      if (detectInfeasibility && it >= 25) {
        if (primalRes < bestPrimal * 0.5) {
          bestPrimal = primalRes;
          stallCount = 0;
        } else if (primalRes > 1e-7 && ++stallCount >= 12) {
          status = 'stalled-infeasible';
          break;
        }
      } else if (primalRes < bestPrimal) bestPrimal = primalRes;

      if (!st.factored && !factorAll(st)) {
        status = 'breakdown';
        break;
      }

      // Predictor (affine scaling).
      direction(st, rc, aff);
      let d = aff;
      if (mTotal > 0) {
        const aAff = stepOf(st, aff);
        const gapAff = addSteppedProducts(0, s, aff.ds, z, aff.dz, aAff);
        const sigma = Math.pow(gapAff / mTotal / mu, 3);
        // Corrector: centring plus the second-order term of the predictor.
        corrected(rc, s, z, aff.ds, aff.dz, sigma, mu);
        direction(st, rc, cor);
        d = cor;
        // Gondzio's centrality correctors, each one solve with the iteration's factor: aim at a
        // longer step (1.5 alpha + 0.3, Colombo and Gondzio 2008), keep a corrector only when
        // it lengthens the step by 0.01 or more, stop at the first that does not.
        rcNow = rc;
        let aD = stepOf(st, cor);
        for (let k = 0; k < corrections && aD < 1; k++) {
          const aim = Math.min(1, 1.5 * aD + 0.3);
          const rcSpare = rcNow === rcG1 ? rcG2 : rcG1;
          centralityTargets(rcSpare, rcNow, s, z, cor.ds, cor.dz, aim, 0.1 * sigma * mu, 10 * sigma * mu);
          direction(st, rcSpare, spare);
          const aT = stepOf(st, spare);
          if (!(aT >= aD + 0.01)) break;
          [cor, spare] = [spare, cor];
          rcNow = rcSpare;
          aD = aT;
          d = cor;
        }
      }
      // The share of the way to the boundary a step takes grows towards 1 as the residual falls
      // (Nocedal and Wright, Numerical Optimization, 2nd ed., section 14.2: a fraction that tends
      // to 1 speeds the last iterations), between the two settings of QP_TOLERANCES.
      const tau = Math.min(QP_TOLERANCES.stepToBoundaryMost, Math.max(QP_TOLERANCES.stepToBoundary, 1 - residual));
      const alpha = mTotal > 0 ? Math.min(1, tau * stepOf(st, d)) : 1;
      sBefore.set(s);
      zBefore.set(z);
      stepped = true;
      advance(st, d, alpha);
      st.factored = false;
      if (!allFinite(x)) {
        status = 'breakdown';
        break;
      }
    }
    return outcome();
  };

  /** The iterate as a solution, copied: a later run moves on from it. */
  const outcome = (): InteriorPointOutcome => {
    const zlFull = new Float64Array(n);
    const zuFull = new Float64Array(n);
    for (let k = 0; k < L.length; k++) zlFull[L[k]] = z[mi + k];
    for (let k = 0; k < U.length; k++) zuFull[U[k]] = z[mi + L.length + k];
    const isActive = activeSet(s, z, stepped ? sBefore : null, stepped ? zBefore : null);
    const activeRows: number[] = [];
    const atLower: number[] = [];
    const atUpper: number[] = [];
    for (let r = 0; r < mi; r++) if (isActive[r]) activeRows.push(r);
    for (let k = 0; k < L.length; k++) if (isActive[mi + k]) atLower.push(L[k]);
    for (let k = 0; k < U.length; k++) if (isActive[mi + L.length + k]) atUpper.push(U[k]);
    let obj = 0;
    for (let i = 0; i < n; i++) obj += x[i] * (0.5 * addDot(0, p.P.data, i * n, x, n) + p.q[i]);
    return {
      status,
      solution: { x: x.slice(), y: y.slice(), z: z.slice(0, mi), zl: zlFull, zu: zuFull, objective: obj },
      active: { activeRows, atLower, atUpper },
      iterations: it,
      residual,
    };
  };
  return { run };
}
