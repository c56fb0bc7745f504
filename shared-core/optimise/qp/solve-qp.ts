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
import { nowMs } from '../clock.js';
import { interiorPoint } from './interior-point.js';
import { kktResidual } from './kkt.js';
import { phaseOne } from './phase-one.js';
import { polish, type Polished } from './polish.js';
import { QP_TOLERANCES, type QpProblem, type QpResult, type QpSolution, type QpWarmStart } from './types.js';

export interface SolveQpOptions {
  warmStart?: QpWarmStart;
  shouldCancel?: () => boolean;
  /**
   * Screening for problems where most variables end at a zero lower bound (most assets left out
   * of a long-only portfolio): solve on `keep` only with the rest held at their lower bounds,
   * check the full problem's dual condition for those held out, add the violators, repeat; then
   * polish on the full problem from the active set found. Exact: the final answer satisfies the
   * full problem's KKT conditions, or the solver falls back to a full interior-point solve.
   */
  screen?: { candidates: readonly number[]; keep: readonly number[]; order: readonly number[] };
  /**
   * Give up (status error) instead of running phase one when the interior point fails: screening
   * only needs to know that a working set is too small, and phase one on a problem with many rows
   * is the costliest step of the solver (its elastic variables make the normal matrix large).
   */
  skipPhaseOne?: boolean;
}

const NOT_SOLVED = 'the interior point did not converge (phase one skipped)';

/** Most variables screening adds per round, as a share of the working set (and at least SCREEN_BATCH_MIN). */
const SCREEN_BATCH_SHARE = 0.5;
const SCREEN_BATCH_MIN = 20;
/** Relative dual tolerance of the screening test. */
const SCREEN_TOLERANCE = 1e-10;

function screenedGuess(problem: QpProblem, options: SolveQpOptions): { guess: QpWarmStart; iterations: number } | null {
  const sc = options.screen!;
  const n = problem.q.length;
  const inSet = new Uint8Array(n).fill(1);
  const screenable = new Uint8Array(n);
  for (const i of sc.candidates) if (Number.isFinite(problem.lb[i])) screenable[i] = 1;
  for (let i = 0; i < n; i++) if (screenable[i]) inSet[i] = 0;
  for (const i of sc.keep) inSet[i] = 1;
  const values = Float64Array.from(problem.lb, (v) => (Number.isFinite(v) ? v : 0));
  let iterations = 0;
  for (let round = 0; round < 50; round++) {
    const keep: number[] = [];
    for (let i = 0; i < n; i++) if (inSet[i]) keep.push(i);
    if (keep.length === n) return null;
    const sub = solveQp(restrict(problem, keep, values), { shouldCancel: options.shouldCancel, skipPhaseOne: true });
    iterations += sub.iterations;
    const working = keep.length;
    if (sub.status === 'infeasible' || (sub.status === 'error' && sub.reason === NOT_SOLVED)) {
      // Too few variables to meet the limits: take the next ones in the caller's order.
      let added = 0;
      for (const i of sc.order)
        if (!inSet[i] && added < Math.max(SCREEN_BATCH_MIN, working)) {
          inSet[i] = 1;
          added++;
        }
      if (added === 0) return null;
      continue;
    }
    if (sub.status !== 'optimal') return null;
    const x = Float64Array.from(values);
    keep.forEach((i, a) => (x[i] = sub.solution.x[a]));
    // Dual residual of each held-out variable: its lower-bound multiplier must be >= 0. Only the
    // non-zero entries of x enter P x (most held-out variables sit at a zero bound).
    const g = Float64Array.from(problem.q);
    const scale = { v: 1e-300 };
    const nonZero: number[] = [];
    for (let j = 0; j < n; j++) if (x[j] !== 0) nonZero.push(j);
    for (let i = 0; i < n; i++) {
      if (inSet[i]) continue;
      const off = i * n;
      let v = 0;
      for (const j of nonZero) v += problem.P.data[off + j] * x[j];
      g[i] += v;
    }
    problem.A.forEach((r, j) => r.idx.forEach((i, t) => (g[i] += r.val[t] * sub.solution.y[j])));
    problem.G.forEach((r, j) => r.idx.forEach((i, t) => (g[i] += r.val[t] * sub.solution.z[j])));
    for (let a = 0; a < working; a++)
      scale.v = Math.max(scale.v, Math.abs(sub.solution.zl[a]), Math.abs(sub.solution.zu[a]));
    for (const v of sub.solution.y) scale.v = Math.max(scale.v, Math.abs(v));
    const violators: number[] = [];
    for (let i = 0; i < n; i++) if (!inSet[i] && g[i] < -SCREEN_TOLERANCE * scale.v) violators.push(i);
    if (violators.length === 0) {
      const atLower: number[] = [];
      for (let i = 0; i < n; i++) if (!inSet[i]) atLower.push(i);
      sub.warmStart.atLower.forEach((a) => atLower.push(keep[a]));
      return {
        guess: { activeRows: sub.warmStart.activeRows, atLower, atUpper: sub.warmStart.atUpper.map((a) => keep[a]) },
        iterations,
      };
    }
    violators.sort((a, b) => g[a] - g[b]);
    const batch = Math.max(SCREEN_BATCH_MIN, Math.ceil(SCREEN_BATCH_SHARE * working));
    for (const i of violators.slice(0, batch)) inSet[i] = 1;
  }
  return null;
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
  keep.forEach((i, a) => (pos[i] = a));
  const P = zeros(k, k);
  const q = new Float64Array(k);
  for (let a = 0; a < k; a++) {
    const off = keep[a] * n;
    let extra = 0;
    for (let j = 0; j < n; j++) if (pos[j] < 0 && values[j] !== 0) extra += p.P.data[off + j] * values[j];
    for (let c = 0; c < k; c++) P.data[a * k + c] = p.P.data[off + keep[c]];
    q[a] = p.q[keep[a]] + extra;
  }
  const cut = (rows: QpProblem['A'], rhs: Float64Array) => {
    const out = rows.map(() => ({ idx: [] as number[], val: [] as number[] }));
    const newRhs = Float64Array.from(rhs);
    rows.forEach((r, j) => {
      for (let t = 0; t < r.idx.length; t++) {
        const a = pos[r.idx[t]];
        if (a >= 0) {
          out[j].idx.push(a);
          out[j].val.push(r.val[t]);
        } else newRhs[j] -= r.val[t] * values[r.idx[t]];
      }
    });
    return { rows: out, rhs: newRhs };
  };
  const A = cut(p.A, p.b);
  const G = cut(p.G, p.h);
  return {
    P,
    q,
    A: A.rows,
    b: A.rhs,
    G: G.rows,
    h: G.rhs,
    lb: Float64Array.from(keep, (i) => p.lb[i]),
    ub: Float64Array.from(keep, (i) => p.ub[i]),
  };
}

function identify(out: ReturnType<typeof interiorPoint>): QpWarmStart {
  const { solution, slackG, slackL, slackU } = out;
  const activeRows: number[] = [];
  for (let r = 0; r < slackG.length; r++) if (solution.z[r] > slackG[r]) activeRows.push(r);
  const atLower: number[] = [];
  const atUpper: number[] = [];
  for (let i = 0; i < solution.x.length; i++) {
    if (solution.zl[i] > slackL[i]) atLower.push(i);
    if (solution.zu[i] > slackU[i]) atUpper.push(i);
  }
  return { activeRows, atLower, atUpper };
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
  keep.forEach((i, a) => (pos[i] = a));

  const lift = (s: QpSolution): QpSolution => {
    if (keep.length === n) return s;
    const x = Float64Array.from(values);
    const zl = new Float64Array(n);
    const zu = new Float64Array(n);
    keep.forEach((i, a) => {
      x[i] = s.x[a];
      zl[i] = s.zl[a];
      zu[i] = s.zu[a];
    });
    // Multipliers of the fixed variables from stationarity (a fixed variable is at both bounds).
    const g = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      if (pos[i] >= 0) continue;
      let v = problem.q[i];
      const off = i * n;
      for (let j = 0; j < n; j++) v += problem.P.data[off + j] * x[j];
      g[i] = v;
    }
    problem.A.forEach((r, j) => r.idx.forEach((i, t) => pos[i] < 0 && (g[i] += r.val[t] * s.y[j])));
    problem.G.forEach((r, j) => r.idx.forEach((i, t) => pos[i] < 0 && (g[i] += r.val[t] * s.z[j])));
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
      kktResidual: kktResidual(problem, solution),
      ms: ms(),
      path,
    };
  };

  let screenIterations = 0;
  if (options.screen && !options.warmStart && keep.length === n) {
    const found = screenedGuess(problem, options);
    if (found) {
      screenIterations = found.iterations;
      const pol = polish(p, found.guess);
      if (pol && pol.residual <= QP_TOLERANCES.optimality) return done(pol, screenIterations + 1, 'screened');
    }
  }

  if (options.warmStart) {
    const w = options.warmStart;
    const guess: QpWarmStart = {
      activeRows: w.activeRows,
      atLower: w.atLower.map((i) => pos[i]).filter((a) => a >= 0),
      atUpper: w.atUpper.map((i) => pos[i]).filter((a) => a >= 0),
    };
    const pol = polish(p, guess);
    if (pol && pol.residual <= QP_TOLERANCES.optimality) return done(pol, 1, 'warm-start');
  }

  let iterations = screenIterations;
  const first = interiorPoint(p, {
    tolerance: QP_TOLERANCES.interiorPointHandover,
    detectInfeasibility: true,
    shouldCancel: options.shouldCancel,
  });
  iterations += first.iterations;
  if (options.shouldCancel?.())
    return { status: 'error', reason: 'cancelled', iterations, kktResidual: NaN, ms: ms(), path: 'interior-point' };
  if (first.status === 'converged') {
    const pol = polish(p, identify(first));
    if (pol && pol.residual <= QP_TOLERANCES.optimality) return done(pol, iterations + 1, 'interior-point+polish');
    const second = interiorPoint(p, {
      tolerance: QP_TOLERANCES.interiorPointFinal,
      shouldCancel: options.shouldCancel,
    });
    iterations += second.iterations;
    const pol2 = polish(p, identify(second));
    if (pol2 && pol2.residual <= QP_TOLERANCES.optimality) return done(pol2, iterations + 1, 'interior-point+polish');
    const solution = lift(second.solution);
    const residual = kktResidual(problem, solution);
    if (second.status === 'converged' && residual <= QP_TOLERANCES.optimality)
      return {
        status: 'optimal',
        solution,
        warmStart: liftWarm(identify(second)),
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
  if (first.status === 'stalled-infeasible') {
    // Phase one found a feasible point: the stall was slow progress, not infeasibility.
    const again = interiorPoint(p, {
      tolerance: QP_TOLERANCES.interiorPointHandover,
      shouldCancel: options.shouldCancel,
    });
    iterations += again.iterations;
    if (again.status === 'converged') {
      const pol = polish(p, identify(again));
      if (pol && pol.residual <= QP_TOLERANCES.optimality) return done(pol, iterations + 1, 'interior-point+polish');
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
  if (first.status === 'breakdown')
    return {
      status: 'error',
      reason: 'the linear systems of the interior point became singular',
      iterations,
      kktResidual: NaN,
      ms: ms(),
      path: 'interior-point',
    };
  const solution = lift(first.solution);
  return {
    status: 'iteration-limit',
    solution,
    iterations,
    kktResidual: kktResidual(problem, solution),
    ms: ms(),
    path: 'interior-point',
  };
}
