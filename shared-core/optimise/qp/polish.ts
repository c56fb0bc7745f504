/**
 * Polishing: given a guess of the active set (from the interior point, or the previous solve as a
 * warm start), solve the equality-constrained QP on it exactly and keep the answer only if it is
 * primal feasible and every multiplier has the right sign, i.e. the KKT conditions hold. The
 * linear algebra (one Cholesky on the free variables, iterative refinement) is equality-kkt.ts.
 */
import { allFinite } from '../../linalg/matrix.js';
import { equalityKktRefinement } from './substitute-two-entry-rows.js';
import { addRowsTimes, maxAbs, packedRows, rowsTimes } from './kernels.js';
import { kktResidual, symmetricTimes } from './kkt.js';
import { QP_TOLERANCES, type QpProblem, type QpSolution, type QpWarmStart } from './types.js';

export interface Polished {
  solution: QpSolution;
  residual: number;
  active: QpWarmStart;
}

export function polishOnce(p: QpProblem, guess: QpWarmStart): Judged {
  const n = p.q.length;
  const me = p.A.length;
  const mi = p.G.length;
  const fixed = new Int8Array(n); // 0 free, -1 at lower, +1 at upper
  for (const i of guess.atLower) if (Number.isFinite(p.lb[i])) fixed[i] = -1;
  for (const i of guess.atUpper) if (Number.isFinite(p.ub[i])) fixed[i] = 1;
  let k = 0;
  for (let i = 0; i < n; i++) if (fixed[i] === 0) k++;
  const free = new Int32Array(k);
  const pos = new Int32Array(n).fill(-1);
  const x = new Float64Array(n);
  for (let i = 0, a = 0; i < n; i++) {
    if (fixed[i] === 0) {
      pos[i] = a;
      free[a++] = i;
    } else x[i] = fixed[i] < 0 ? p.lb[i] : p.ub[i];
  }
  const act = [...new Set(guess.activeRows)].filter((r) => r >= 0 && r < mi).sort((a, b) => a - b);
  const m = me + act.length;
  const rhs = new Float64Array(k);
  const Pfixed = symmetricTimes(p.P, x, n); // contribution of the fixed variables
  for (let a = 0; a < k; a++) rhs[a] = -p.q[free[a]] - Pfixed[free[a]];
  // The equality rows and the active inequality rows on the free variables, the fixed ones'
  // terms moved to the right-hand side.
  const start = new Int32Array(m + 1);
  const col: number[] = [];
  const val: number[] = [];
  const s = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    const row = j < me ? p.A[j] : p.G[act[j - me]];
    let v = j < me ? p.b[j] : p.h[act[j - me]];
    for (let t = 0; t < row.idx.length; t++) {
      const i = row.idx[t];
      if (pos[i] >= 0) {
        col.push(pos[i]);
        val.push(row.val[t]);
      } else v -= row.val[t] * x[i];
    }
    s[j] = v;
    start[j + 1] = col.length;
  }
  const C = { start, col: Int32Array.from(col), val: Float64Array.from(val) };
  const refine = equalityKktRefinement({ P: p.P.data, n, free, C }, rhs, s);
  if (!refine) return null;
  // A wrong guess shows at tolerances (polishFeasibility) far above the residual of a first,
  // backward-stable solve: the guess is judged from that solve, and only an answer that passes
  // is refined to the rounding level and judged again (the answer and its residual as one
  // refinement to the end gives them).
  const enough = QP_TOLERANCES.polishDecision * (1 + Math.max(maxAbs(rhs), maxAbs(s)));
  const judged = refine.until(enough);
  const round = { p, fixed, free, act, x };
  const first = verdict(round, judged, refine.ended);
  if (first !== 'passes') return first;
  return verdict(round, refine.until(0), true);
}

/** A polishing round's outcome: the answer, the next guess, or null (the system is singular). */
type Judged = Polished | { next: QpWarmStart; changes: number } | null;

/** A polishing round's guess: the problem, each variable fixed at a bound or free, the active rows, x. */
interface Round {
  p: QpProblem;
  fixed: Int8Array;
  free: Int32Array;
  act: number[];
  /** The fixed variables' values; judging a solution writes the free ones'. */
  x: Float64Array;
}

/**
 * The solution (x on the free variables, then the multipliers) of polishOnce's system judged:
 * the next guess when a constraint is violated or a multiplier has the wrong sign, else the
 * answer with its KKT residual, or only 'passes' where the solution is not `final` (it is refined
 * and judged again).
 */
function verdict(round: Round, sol: Float64Array, final: true): Judged;
function verdict(round: Round, sol: Float64Array, final: boolean): Judged | 'passes';
function verdict(round: Round, sol: Float64Array, final: boolean): Judged | 'passes' {
  const { p, fixed, free, act, x } = round;
  const n = p.q.length;
  const me = p.A.length;
  const mi = p.G.length;
  const k = free.length;
  if (!allFinite(sol)) return null;
  for (let a = 0; a < k; a++) x[free[a]] = sol[a];
  const y = new Float64Array(me);
  for (let j = 0; j < me; j++) y[j] = sol[k + j];
  const z = new Float64Array(mi);
  for (let j = 0; j < act.length; j++) z[act[j]] = sol[k + me + j];

  // Bound multipliers from the stationarity condition of the fixed variables. P x serves the
  // objective and the KKT residual below as well.
  const Px = symmetricTimes(p.P, x, n);
  const g = new Float64Array(n);
  for (let i = 0; i < n; i++) g[i] = Px[i] + p.q[i];
  addRowsTimes(packedRows(p.A), y, g);
  addRowsTimes(packedRows(p.G), z, g);
  const zl = new Float64Array(n);
  const zu = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (fixed[i] < 0) zl[i] = g[i];
    else if (fixed[i] > 0) zu[i] = -g[i];
  }
  // Feasibility and dual signs, relative to the magnitudes involved. Violations become the next
  // guess (add the violated constraints, drop those with a wrong-signed multiplier).
  let dualScale = 1e-300;
  for (let i = 0; i < n; i++) dualScale = Math.max(dualScale, Math.abs(p.q[i]), Math.abs(g[i] - p.q[i]));
  for (let j = 0; j < mi; j++) dualScale = Math.max(dualScale, Math.abs(z[j]));
  const tol = QP_TOLERANCES.polishFeasibility;
  const rowIn = new Uint8Array(mi);
  for (const j of act) rowIn[j] = 1;
  const lowerIn = new Uint8Array(n);
  const upperIn = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    if (fixed[i] < 0) lowerIn[i] = 1;
    else if (fixed[i] > 0) upperIn[i] = 1;
  }
  const Gx = new Float64Array(mi);
  rowsTimes(packedRows(p.G), x, Gx);
  let changes = 0;
  for (let j = 0; j < mi; j++) {
    if (z[j] < -tol * dualScale) {
      rowIn[j] = 0;
      changes++;
    } else if (z[j] < 0) z[j] = 0;
    if (!rowIn[j] && Gx[j] - p.h[j] > tol * (1 + Math.abs(p.h[j]))) {
      rowIn[j] = 1;
      changes++;
    }
  }
  for (let i = 0; i < n; i++) {
    if (zl[i] < -tol * dualScale) {
      lowerIn[i] = 0;
      changes++;
    } else if (zl[i] < 0) zl[i] = 0;
    if (zu[i] < -tol * dualScale) {
      upperIn[i] = 0;
      changes++;
    } else if (zu[i] < 0) zu[i] = 0;
    if (fixed[i] === 0 && x[i] < p.lb[i] - tol * (1 + Math.abs(p.lb[i]))) {
      lowerIn[i] = 1;
      changes++;
    }
    if (fixed[i] === 0 && x[i] > p.ub[i] + tol * (1 + Math.abs(p.ub[i]))) {
      upperIn[i] = 1;
      changes++;
    }
  }
  const members = (flags: Uint8Array): number[] => {
    const out: number[] = [];
    for (let i = 0; i < flags.length; i++) if (flags[i]) out.push(i);
    return out;
  };
  if (changes > 0)
    return { next: { activeRows: members(rowIn), atLower: members(lowerIn), atUpper: members(upperIn) }, changes };
  if (!final) return 'passes';
  let objective = 0;
  for (let i = 0; i < n; i++) objective += x[i] * (0.5 * Px[i] + p.q[i]);
  const solution: QpSolution = { x, y, z, zl, zu, objective };
  const residual = kktResidual(p, solution, Px);
  const atLower: number[] = [];
  const atUpper: number[] = [];
  for (let i = 0; i < n; i++) {
    if (fixed[i] < 0) atLower.push(i);
    else if (fixed[i] > 0) atUpper.push(i);
  }
  return { solution, residual, active: { activeRows: act, atLower, atUpper } };
}

/**
 * Polishing with a few active-set corrections: each failed solve names the constraints to add
 * (violated) and to drop (wrong-signed multiplier), which repairs an identification spoilt by a
 * weakly active constraint. Repeated, this is a primal-dual active-set method (Hintermueller, Ito
 * and Kunisch 2002, SIAM J. Optimization 13), which screening runs from a rough guess. Where it
 * converges it does so fast, the number of constraints changed falling several-fold per round;
 * on an ill-conditioned problem it may crawl or cycle. With `stall`, it gives up once that many
 * rounds in a row have not halved the fewest changes of a round before them (screening then
 * solves the full problem, which a crawling method only delays). `solves` counts the linear
 * solves made, successful or not.
 */
export function polish(
  p: QpProblem,
  guess: QpWarmStart,
  rounds: number = QP_TOLERANCES.polishRounds,
  stall = Infinity,
): { polished: Polished | null; solves: number } {
  let current = guess;
  let fewest = Infinity;
  let stalled = 0;
  for (let k = 0; k < rounds; k++) {
    const out = polishOnce(p, current);
    if (out === null) return { polished: null, solves: k + 1 };
    if ('solution' in out) return { polished: out, solves: k + 1 };
    if (out.changes <= fewest / 2) {
      fewest = out.changes;
      stalled = 0;
    } else if (++stalled >= stall) return { polished: null, solves: k + 1 };
    current = out.next;
  }
  return { polished: null, solves: rounds };
}
