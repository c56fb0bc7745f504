/**
 * Polishing: given a guess of the active set (from the interior point, or the previous solve as a
 * warm start), solve the equality-constrained QP on it exactly and keep the answer only if it is
 * primal feasible and every multiplier has the right sign, i.e. the KKT conditions hold. The KKT
 * matrix is regularised (so degenerate active sets still factor) and the regularisation is removed
 * by iterative refinement, the device OSQP's polishing uses (Stellato et al. 2020, Math.
 * Programming Computation 12).
 */
import { luFactor, luSolve } from './dense-factor.js';
import { addRow, kktResidual, objectiveValue, rowDot, symmetricTimes } from './kkt.js';
import { QP_TOLERANCES, type QpProblem, type QpSolution, type QpWarmStart } from './types.js';

export interface Polished {
  solution: QpSolution;
  residual: number;
  active: QpWarmStart;
}

export function polishOnce(p: QpProblem, guess: QpWarmStart): Polished | { next: QpWarmStart } | null {
  const n = p.q.length;
  const me = p.A.length;
  const fixed = new Int8Array(n); // 0 free, -1 at lower, +1 at upper
  for (const i of guess.atLower) if (Number.isFinite(p.lb[i])) fixed[i] = -1;
  for (const i of guess.atUpper) if (Number.isFinite(p.ub[i])) fixed[i] = 1;
  const free: number[] = [];
  const pos = new Int32Array(n).fill(-1);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    if (fixed[i] === 0) {
      pos[i] = free.length;
      free.push(i);
    } else x[i] = fixed[i] < 0 ? p.lb[i] : p.ub[i];
  }
  const act = [...new Set(guess.activeRows)].filter((r) => r >= 0 && r < p.G.length).sort((a, b) => a - b);
  const k = free.length;
  const m = me + act.length;
  const dim = k + m;
  const K = new Float64Array(dim * dim);
  const rhs = new Float64Array(dim);
  const Px = symmetricTimes(p.P, x, n); // contribution of the fixed variables
  for (let a = 0; a < k; a++) {
    const ia = free[a];
    const off = ia * n;
    for (let c = 0; c < k; c++) K[a * dim + c] = p.P.data[off + free[c]];
    rhs[a] = -p.q[ia] - Px[ia];
  }
  const rows = [...p.A, ...act.map((r) => p.G[r])];
  const rowRhs = [...p.b, ...act.map((r) => p.h[r])];
  rows.forEach((row, j) => {
    let v = rowRhs[j];
    for (let t = 0; t < row.idx.length; t++) {
      const i = row.idx[t];
      if (pos[i] >= 0) {
        K[(k + j) * dim + pos[i]] += row.val[t];
        K[pos[i] * dim + k + j] += row.val[t];
      } else v -= row.val[t] * x[i];
    }
    rhs[k + j] = v;
  });
  let scale = 0;
  for (let t = 0; t < K.length; t++) scale = Math.max(scale, Math.abs(K[t]));
  const delta = QP_TOLERANCES.polishRegularisation * (scale || 1);
  const Kr = Float64Array.from(K);
  for (let a = 0; a < dim; a++) Kr[a * dim + a] += a < k ? delta : -delta;
  const f = luFactor(Kr, dim);
  if (!f) return null;
  const sol = luSolve(f, rhs);
  for (let step = 0; step < QP_TOLERANCES.refinementSteps; step++) {
    const r = new Float64Array(dim);
    let rmax = 0;
    for (let a = 0; a < dim; a++) {
      let v = rhs[a];
      const off = a * dim;
      for (let c = 0; c < dim; c++) v -= K[off + c] * sol[c];
      r[a] = v;
      rmax = Math.max(rmax, Math.abs(v));
    }
    if (rmax === 0) break;
    const d = luSolve(f, r);
    for (let a = 0; a < dim; a++) sol[a] += d[a];
  }
  if (!sol.every(Number.isFinite)) return null;
  for (let a = 0; a < k; a++) x[free[a]] = sol[a];
  const y = new Float64Array(me);
  for (let j = 0; j < me; j++) y[j] = sol[k + j];
  const z = new Float64Array(p.G.length);
  act.forEach((r, j) => (z[r] = sol[k + me + j]));

  // Bound multipliers from the stationarity condition of the fixed variables.
  const g = symmetricTimes(p.P, x, n);
  for (let i = 0; i < n; i++) g[i] += p.q[i];
  p.A.forEach((row, j) => addRow(g, row, y[j]));
  p.G.forEach((row, j) => addRow(g, row, z[j]));
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
  for (const v of z) dualScale = Math.max(dualScale, Math.abs(v));
  const tol = QP_TOLERANCES.polishFeasibility;
  const next = { rows: new Set(act), lower: new Set<number>(), upper: new Set<number>() };
  for (let i = 0; i < n; i++) {
    if (fixed[i] < 0) next.lower.add(i);
    else if (fixed[i] > 0) next.upper.add(i);
  }
  let changed = false;
  for (let r = 0; r < p.G.length; r++) {
    if (z[r] < -tol * dualScale) {
      next.rows.delete(r);
      changed = true;
    } else if (z[r] < 0) z[r] = 0;
    if (!next.rows.has(r) && rowDot(p.G[r], x) - p.h[r] > tol * (1 + Math.abs(p.h[r]))) {
      next.rows.add(r);
      changed = true;
    }
  }
  for (let i = 0; i < n; i++) {
    if (zl[i] < -tol * dualScale) {
      next.lower.delete(i);
      changed = true;
    } else if (zl[i] < 0) zl[i] = 0;
    if (zu[i] < -tol * dualScale) {
      next.upper.delete(i);
      changed = true;
    } else if (zu[i] < 0) zu[i] = 0;
    if (fixed[i] === 0 && x[i] < p.lb[i] - tol * (1 + Math.abs(p.lb[i]))) {
      next.lower.add(i);
      changed = true;
    }
    if (fixed[i] === 0 && x[i] > p.ub[i] + tol * (1 + Math.abs(p.ub[i]))) {
      next.upper.add(i);
      changed = true;
    }
  }
  if (changed)
    return {
      next: { activeRows: [...next.rows], atLower: [...next.lower], atUpper: [...next.upper] },
    };
  const solution: QpSolution = { x, y, z, zl, zu, objective: objectiveValue(p, x) };
  const residual = kktResidual(p, solution);
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
 * weakly active constraint.
 */
export function polish(p: QpProblem, guess: QpWarmStart, rounds = QP_TOLERANCES.polishRounds): Polished | null {
  let current = guess;
  for (let k = 0; k < rounds; k++) {
    const out = polishOnce(p, current);
    if (out === null) return null;
    if ('solution' in out) return out;
    current = out.next;
  }
  return null;
}
