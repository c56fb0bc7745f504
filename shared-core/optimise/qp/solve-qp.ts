/**
 * The QP solver's entry point: interior point to identify the active set, polishing to solve it
 * exactly (relative KKT residual near machine precision), phase one when the interior point
 * cannot reach feasibility. A warm start (the active set of the previous solve) is tried first
 * and costs one linear solve when it still holds, which is the common case between neighbouring
 * walk-forward dates.
 *
 * Why this combination (measured on this machine, see DEVELOPERS note in shared-core/optimise/
 * README.md): the interior point takes 12 to 30 iterations whatever the number of assets at their
 * bounds, where an active-set method from a cold start needs about one iteration per asset that
 * changes state; polishing turns the interior point's 1e-9 into the 1e-10 and gives exact
 * multipliers for the shadow prices.
 */
import { allFinite, zeros } from '../../linalg/matrix.js';
import type { CancelCheck } from '../../stability/cancel.js';
import { nowMs } from '../clock.js';
import { interiorPoint, startInteriorPoint } from './interior-point.js';
import { addGatheredDot, gatherInto } from './kernels.js';
import { kktResidual } from './kkt.js';
import { phaseOne } from './phase-one.js';
import { polish, type Polished } from './polish.js';
import { QP_TOLERANCES, type QpProblem, type QpResult, type QpSolution, type QpWarmStart } from './types.js';

export interface SolveQpOptions {
  warmStart?: QpWarmStart;
  /**
   * Polled at every interior-point iteration: a true answer throws CancelledError
   * (stability/cancel.ts), the core's one way of saying a computation was stopped.
   */
  shouldCancel?: CancelCheck;
  /**
   * Screening for problems where most variables end at a zero lower bound (most assets left out
   * of a long-only portfolio): solve on `keep` only with the rest held at their lower bounds,
   * check the full problem's dual condition for those held out, add the violators, repeat; then
   * polish on the full problem from the active set found. Exact: the final answer satisfies the
   * full problem's KKT conditions, or the solver falls back to a full interior-point solve.
   */
  screen?: {
    candidates: readonly number[];
    keep: readonly number[];
    order: readonly number[];
    /**
     * A tighter first working set, tried once where `keep` passes QP_TOLERANCES.screenShare of
     * the variables (screening.ts screenPlan; screenPerCapTight, screenShareTight).
     */
    tight?: readonly number[];
  };
  /**
   * Give up (status error) instead of running phase one when the interior point fails: screening
   * only needs to know that a working set is too small, and phase one on a problem with many rows
   * is the costliest step of the solver (its elastic variables make the normal matrix large).
   */
  skipPhaseOne?: boolean;
}

const NOT_SOLVED = 'the interior point did not converge (phase one skipped)';

/**
 * Screening's answer: the full problem polished (its KKT conditions checked), or a guess of its
 * active set for polishing, with the interior-point iterations and polishing solves it took.
 */
type Screened = { polished: Polished; iterations: number } | { guess: QpWarmStart; iterations: number };

function screened(problem: QpProblem, options: SolveQpOptions): Screened | null {
  const sc = options.screen!;
  const n = problem.q.length;
  const inSet = new Uint8Array(n).fill(1);
  const screenable = new Uint8Array(n);
  for (const i of sc.candidates) if (Number.isFinite(problem.lb[i])) screenable[i] = 1;
  for (let i = 0; i < n; i++) if (screenable[i]) inSet[i] = 0;
  // Where the first working set passes screenShare, the tighter one is tried for one round.
  const once = sc.keep.length > QP_TOLERANCES.screenShare * n && sc.tight !== undefined;
  const first = once ? sc.tight! : sc.keep;
  for (const i of first) inSet[i] = 1;
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) values[i] = Number.isFinite(problem.lb[i]) ? problem.lb[i] : 0;
  let iterations = 0;
  for (let round = 0; round < (once ? 1 : QP_TOLERANCES.screenRounds); round++) {
    const keep: number[] = [];
    for (let i = 0; i < n; i++) if (inSet[i]) keep.push(i);
    // A working set past this share of the variables saves too little over the full problem.
    if (keep.length > (once ? QP_TOLERANCES.screenShareTight : QP_TOLERANCES.screenShare) * n) return null;
    const sub = solveQp(restrict(problem, keep, values), { shouldCancel: options.shouldCancel, skipPhaseOne: true });
    iterations += sub.iterations;
    const working = keep.length;
    if (sub.status === 'infeasible' || (sub.status === 'error' && sub.reason === NOT_SOLVED)) {
      // Too few variables to meet the limits: take the next ones in the caller's order.
      let added = 0;
      for (const i of sc.order)
        if (!inSet[i] && added < Math.max(QP_TOLERANCES.screenBatchMin, working)) {
          inSet[i] = 1;
          added++;
        }
      if (added === 0) return null;
      continue;
    }
    if (sub.status !== 'optimal') return null;
    const x = Float64Array.from(values);
    for (let a = 0; a < working; a++) x[keep[a]] = sub.solution.x[a];
    // Dual residual of each held-out variable: its lower-bound multiplier must be >= 0. Only the
    // non-zero entries of x enter P x (most held-out variables sit at a zero bound).
    const g = heldOutGradient(problem, x, inSet, sub.solution);
    let scale = 1e-300;
    for (let a = 0; a < working; a++)
      scale = Math.max(scale, Math.abs(sub.solution.zl[a]), Math.abs(sub.solution.zu[a]));
    for (const v of sub.solution.y) scale = Math.max(scale, Math.abs(v));
    const violating = new Uint8Array(n);
    let violators = 0;
    for (let i = 0; i < n; i++)
      if (!inSet[i] && g[i] < -QP_TOLERANCES.screenDual * scale) {
        violating[i] = 1;
        violators++;
      }
    const atLower: number[] = [];
    for (let i = 0; i < n; i++) if (!inSet[i] && !violating[i]) atLower.push(i);
    for (const a of sub.warmStart.atLower) atLower.push(keep[a]);
    const guess = { activeRows: sub.warmStart.activeRows, atLower, atUpper: sub.warmStart.atUpper.map((a) => keep[a]) };
    if (violators === 0) return { guess, iterations };
    // The violators free, the rest as the working set left them: polishing's active-set
    // corrections (a primal-dual active-set method) usually finish from here in a few solves on
    // the free variables alone, where another interior point would factor the working set at
    // every iteration.
    const pol = polish(problem, guess, QP_TOLERANCES.screenPolishRounds, QP_TOLERANCES.screenPolishStall);
    iterations += pol.solves;
    if (pol.polished && pol.polished.residual <= QP_TOLERANCES.optimality)
      return { polished: pol.polished, iterations };
    for (let i = 0; i < n; i++) if (violating[i]) inSet[i] = 1;
  }
  return null;
}

/** The non-zero entries of x: their indices in increasing order and their values. */
function nonZeros(x: Float64Array): { at: Int32Array; u: Float64Array } {
  let count = 0;
  for (let j = 0; j < x.length; j++) if (x[j] !== 0) count++;
  const at = new Int32Array(count);
  const u = new Float64Array(count);
  for (let j = 0, k = 0; j < x.length; j++)
    if (x[j] !== 0) {
      at[k] = j;
      u[k++] = x[j];
    }
  return { at, u };
}

/**
 * out += factor * row for each row, with its own factor (the A'y or G'z of a gradient); only on
 * the variables whose `only` entry is negative when it is given.
 */
function addRows(out: Float64Array, rows: QpProblem['A'], factors: Float64Array, only?: Int32Array): void {
  for (let j = 0; j < rows.length; j++) {
    const { idx, val } = rows[j];
    const f = factors[j];
    for (let t = 0; t < idx.length; t++) if (!only || only[idx[t]] < 0) out[idx[t]] += val[t] * f;
  }
}

/**
 * q + P x + A'y + G'z on the variables outside the working set (`inSet` 0), where x is the
 * working set's solution with the others at their bounds; the other entries hold q + A'y + G'z.
 */
function heldOutGradient(problem: QpProblem, x: Float64Array, inSet: Uint8Array, s: QpSolution): Float64Array {
  const n = problem.q.length;
  const g = Float64Array.from(problem.q);
  const { at, u } = nonZeros(x);
  for (let i = 0; i < n; i++) if (!inSet[i]) g[i] += addGatheredDot(0, problem.P.data, i * n, at, u, at.length);
  addRows(g, problem.A, s.y);
  addRows(g, problem.G, s.z);
  return g;
}

function checkShapes(p: QpProblem): string | null {
  const n = p.q.length;
  if (p.P.rows !== n || p.P.cols !== n) return `P is ${p.P.rows} x ${p.P.cols}, expected ${n} x ${n}`;
  if (p.b.length !== p.A.length) return 'b and A have different lengths';
  if (p.h.length !== p.G.length) return 'h and G have different lengths';
  if (p.lb.length !== n || p.ub.length !== n) return 'bounds have the wrong length';
  for (const rows of [p.A, p.G])
    for (const r of rows) for (const i of r.idx) if (!(i >= 0 && i < n)) return `row index ${i} out of range`;
  for (let i = 0; i < n; i++) if (p.lb[i] > p.ub[i]) return `lower bound above upper bound for variable ${i}`;
  if (!allFinite(p.P.data) || !allFinite(p.q)) return 'objective has non-finite entries';
  return null;
}

/** The QP on the variables `keep`, the others held at `values`; rows keep their indices. */
export function restrict(p: QpProblem, keep: readonly number[], values: Float64Array): QpProblem {
  const n = p.q.length;
  const k = keep.length;
  const pos = new Int32Array(n).fill(-1);
  const at = Int32Array.from(keep);
  for (let a = 0; a < k; a++) pos[at[a]] = a;
  // The held variables with a non-zero value move P's linear term; most sit at a zero bound.
  const held = new Float64Array(n);
  for (let j = 0; j < n; j++) if (pos[j] < 0) held[j] = values[j];
  const moved = nonZeros(held);
  const P = zeros(k, k);
  const q = new Float64Array(k);
  const lb = new Float64Array(k);
  const ub = new Float64Array(k);
  for (let a = 0; a < k; a++) {
    const off = at[a] * n;
    gatherInto(P.data, a * k, p.P.data, off, at);
    q[a] = p.q[at[a]] + addGatheredDot(0, p.P.data, off, moved.at, moved.u, moved.at.length);
    lb[a] = p.lb[at[a]];
    ub[a] = p.ub[at[a]];
  }
  const A = cutRows(p.A, p.b, pos, values);
  const G = cutRows(p.G, p.h, pos, values);
  return { P, q, A: A.rows, b: A.rhs, G: G.rows, h: G.rhs, lb, ub };
}

/** Rows on the kept variables (`pos` their new index, -1 held), the held ones' terms moved to the right-hand side. */
function cutRows(rows: QpProblem['A'], rhs: Float64Array, pos: Int32Array, values: Float64Array) {
  const out: { idx: number[]; val: number[] }[] = [];
  const newRhs = Float64Array.from(rhs);
  for (let j = 0; j < rows.length; j++) {
    const r = rows[j];
    const idx: number[] = [];
    const val: number[] = [];
    for (let t = 0; t < r.idx.length; t++) {
      const a = pos[r.idx[t]];
      if (a >= 0) {
        idx.push(a);
        val.push(r.val[t]);
      } else newRhs[j] -= r.val[t] * values[r.idx[t]];
    }
    out.push({ idx, val });
  }
  return { rows: out, rhs: newRhs };
}

export function solveQp(problem: QpProblem, options: SolveQpOptions = {}): QpResult {
  const t0 = nowMs();
  const ms = () => nowMs() - t0;
  const shapeError = checkShapes(problem);
  if (shapeError)
    return { status: 'error', reason: shapeError, iterations: 0, kktResidual: NaN, ms: ms(), path: 'interior-point' };
  const n = problem.q.length;

  // Variables with equal bounds are fixed, not solved for (an interior point needs an interior).
  const keep: number[] = [];
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (problem.lb[i] === problem.ub[i]) values[i] = problem.lb[i];
    else keep.push(i);
  }
  const p = keep.length === n ? problem : restrict(problem, keep, values);
  const pos = new Int32Array(n).fill(-1);
  for (let a = 0; a < keep.length; a++) pos[keep[a]] = a;

  const lift = (s: QpSolution): QpSolution => {
    if (keep.length === n) return s;
    const x = Float64Array.from(values);
    const zl = new Float64Array(n);
    const zu = new Float64Array(n);
    for (let a = 0; a < keep.length; a++) {
      const i = keep[a];
      x[i] = s.x[a];
      zl[i] = s.zl[a];
      zu[i] = s.zu[a];
    }
    // Multipliers of the fixed variables from stationarity (a fixed variable is at both bounds).
    const g = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      if (pos[i] >= 0) continue;
      let v = problem.q[i];
      const off = i * n;
      for (let j = 0; j < n; j++) v += problem.P.data[off + j] * x[j];
      g[i] = v;
    }
    addRows(g, problem.A, s.y, pos);
    addRows(g, problem.G, s.z, pos);
    for (let i = 0; i < n; i++) {
      if (pos[i] >= 0) continue;
      if (g[i] >= 0) zl[i] = g[i];
      else zu[i] = -g[i];
    }
    return { x, y: s.y, z: s.z, zl, zu, objective: s.objective };
  };
  const liftWarm = (w: QpWarmStart): QpWarmStart => ({
    activeRows: w.activeRows,
    atLower: w.atLower.map((a) => keep[a]),
    atUpper: w.atUpper.map((a) => keep[a]),
  });
  const done = (
    pol: Polished,
    iterations: number,
    path: 'warm-start' | 'screened' | 'interior-point+polish',
  ): QpResult => {
    const solution = lift(pol.solution);
    return {
      status: 'optimal',
      solution,
      warmStart: liftWarm(pol.active),
      iterations,
      // Polishing measured it on this very problem and point when no variable was fixed.
      kktResidual: p === problem ? pol.residual : kktResidual(problem, solution),
      ms: ms(),
      path,
    };
  };

  let iterations = 0;
  /** Polishing from a guess; the answer only when its KKT residual meets the target. */
  const polished = (guess: QpWarmStart): Polished | null => {
    const out = polish(p, guess);
    iterations += out.solves;
    return out.polished && out.polished.residual <= QP_TOLERANCES.optimality ? out.polished : null;
  };

  if (options.screen && !options.warmStart && keep.length === n) {
    const found = screened(problem, options);
    if (found) {
      iterations += found.iterations;
      if ('polished' in found) return done(found.polished, iterations, 'screened');
      const pol = polished(found.guess);
      if (pol) return done(pol, iterations, 'screened');
    }
  }

  if (options.warmStart) {
    const w = options.warmStart;
    const guess: QpWarmStart = {
      activeRows: w.activeRows,
      atLower: w.atLower.map((i) => pos[i]).filter((a) => a >= 0),
      atUpper: w.atUpper.map((i) => pos[i]).filter((a) => a >= 0),
    };
    const pol = polished(guess);
    if (pol) return done(pol, iterations, 'warm-start');
  }

  // Hand over to polishing at a modest residual; when polishing cannot confirm the active set
  // identified, the same interior point resumes to a residual 100 times smaller (not a new one
  // from the start) and polishing tries again.
  const ip = startInteriorPoint(p, { detectInfeasibility: true, shouldCancel: options.shouldCancel });
  let tolerance: number = QP_TOLERANCES.interiorPointHandover;
  let out = ip.run(tolerance);
  while (out.status === 'converged') {
    const pol = polished(out.active);
    if (pol) return done(pol, iterations + out.iterations, 'interior-point+polish');
    if (tolerance <= QP_TOLERANCES.interiorPointFinal) break;
    tolerance = Math.max(tolerance * QP_TOLERANCES.interiorPointResume, QP_TOLERANCES.interiorPointFinal);
    out = ip.run(tolerance, false);
  }
  iterations += out.iterations;
  if (out.status === 'converged' || tolerance < QP_TOLERANCES.interiorPointHandover) {
    const solution = lift(out.solution);
    const residual = kktResidual(problem, solution);
    if (out.status === 'converged' && residual <= QP_TOLERANCES.optimality)
      return {
        status: 'optimal',
        solution,
        warmStart: liftWarm(out.active),
        iterations,
        kktResidual: residual,
        ms: ms(),
        path: 'interior-point',
      };
    return { status: 'iteration-limit', solution, iterations, kktResidual: residual, ms: ms(), path: 'interior-point' };
  }

  if (options.skipPhaseOne)
    return { status: 'error', reason: NOT_SOLVED, iterations, kktResidual: NaN, ms: ms(), path: 'interior-point' };
  const one = phaseOne(p, options.shouldCancel);
  iterations += one.iterations;
  if (!one.feasible) {
    const c = one.conflict;
    return {
      status: 'infeasible',
      conflict: { ...c, lower: c.lower.map((a) => keep[a]), upper: c.upper.map((a) => keep[a]) },
      iterations,
      kktResidual: NaN,
      ms: ms(),
      path: 'interior-point',
    };
  }
  if (out.status === 'stalled-infeasible') {
    // Phase one found a feasible point: the stall was slow progress, not infeasibility.
    const again = interiorPoint(p, {
      tolerance: QP_TOLERANCES.interiorPointHandover,
      shouldCancel: options.shouldCancel,
    });
    iterations += again.iterations;
    if (again.status === 'converged') {
      const pol = polished(again.active);
      if (pol) return done(pol, iterations, 'interior-point+polish');
    }
    const solution = lift(again.solution);
    return {
      status: 'iteration-limit',
      solution,
      iterations,
      kktResidual: kktResidual(problem, solution),
      ms: ms(),
      path: 'interior-point',
    };
  }
  if (out.status === 'breakdown')
    return {
      status: 'error',
      reason: 'the linear systems of the interior point became singular',
      iterations,
      kktResidual: NaN,
      ms: ms(),
      path: 'interior-point',
    };
  const solution = lift(out.solution);
  return {
    status: 'iteration-limit',
    solution,
    iterations,
    kktResidual: kktResidual(problem, solution),
    ms: ms(),
    path: 'interior-point',
  };
}
