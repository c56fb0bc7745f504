/**
 * The interior point's normal matrix H = P + R'WR with the auxiliary variables eliminated. A
 * turnover limit (or a gross-exposure limit) adds one auxiliary t_i >= |x_i - c_i| per asset,
 * with no curvature, tied to its asset by two rows and to the other auxiliaries only by the limit
 * itself (sum t_i <= limit): H doubles in size and its Cholesky costs eight times as much. Split
 * the variables into the dense ones d and the auxiliaries e:
 *
 *   H = [ H_dd  B  ]      H_ee = Delta + U W_D U'
 *       [ B'   H_ee ],
 *
 * Delta diagonal (each auxiliary's own rows and bounds), U the few rows that sum auxiliaries
 * (the limits, weights W_D), B sparse (each auxiliary's rows touch one or two dense variables).
 * H's solves go through the Schur complement K = H_dd - B H_ee^-1 B' (Golub and Van Loan, Matrix
 * Computations, block elimination; H_ee^-1 by the Sherman-Morrison-Woodbury formula with the
 * capacitance I + W_D^1/2 U' Delta^-1 U W_D^1/2, which is at least I). K is the size of the
 * dense variables, so the factorisation costs what the problem without the limit costs.
 *
 * Rounding: B Delta^-1 B' would take its value as the difference of two numbers of the size of
 * the largest row weight (an active row's z/s grows without bound as the interior point
 * converges). Each auxiliary's share of K is instead summed over pairs of its rows,
 * (1/Delta_j) sum_{r<s} w_r w_s (a_rk a_sj - a_sk a_rj)(a_rl a_sj - a_sl a_rj) (the Lagrange
 * identity), a sum of products with no cancellation; the limits' share W_D^1/2 (...) C^-1 (...)
 * is added, never subtracted.
 */
import { choleskyInPlace, choleskySolveInPlace } from './dense-factor.js';
import type { PackedRows } from './kernels.js';
import { QP_TOLERANCES } from './types.js';

/** The structure found once per solve: which variables are eliminated and how the rows touch them. */
export interface AuxiliaryPlan {
  /** Dense variables (original indices, increasing) and the auxiliaries. */
  dense: Int32Array;
  aux: Int32Array;
  /** P on the dense variables, nd x nd. */
  Pdd: Float64Array;
  /** The inequality rows themselves, for the residual of iterative refinement. */
  R: PackedRows;
  /** Rows with no auxiliary, their columns renumbered over the dense variables, and their index in R. */
  plain: PackedRows;
  plainRows: Int32Array;
  /**
   * Per auxiliary j: its rows (indices in R) from ownStart[j] to ownStart[j + 1], each row's
   * coefficient on j (ownA), and its coefficients on j's dense support (ownD, `width` each).
   */
  ownStart: Int32Array;
  ownRows: Int32Array;
  ownA: Float64Array;
  ownD: Float64Array;
  /** j's dense support (renumbered), `width` slots each, -1 where unused. */
  support: Int32Array;
  width: number;
  /** The rows that sum auxiliaries (indices in R) and their coefficients over all auxiliaries (p x ne). */
  limitRows: Int32Array;
  limitU: Float64Array;
}

/** Workspace and factors of one iteration. */
export interface AuxiliaryFactor {
  K: Float64Array;
  delta: Float64Array;
  /** b_j on j's support, `width` each. */
  b: Float64Array;
  /** sqrt(w) of each limit row, the capacitance's Cholesky factor (p x p). */
  rootW: Float64Array;
  Cf: Float64Array;
  fd: Float64Array;
  fe: Float64Array;
  te: Float64Array;
  alpha: Float64Array;
  /** The row weights of the factor, and the refinement's residual and correction over all variables. */
  w: Float64Array;
  residual: Float64Array;
  correction: Float64Array;
}

/**
 * The plan, or null when there is nothing to eliminate. An auxiliary is a variable without
 * curvature (its row and column of P are zero) whose rows, except a few that sum auxiliaries
 * (at most AUX_LIMIT_ROWS, touching no dense variable), touch it and at most AUX_SUPPORT dense
 * variables; at least one of its own rows (a bound counts) keeps Delta_j > 0.
 */
export function planAuxiliaries(P: Float64Array, n: number, R: PackedRows): AuxiliaryPlan | null {
  const m = R.start.length - 1;
  const isAux = new Uint8Array(n);
  for (let j = 0; j < n; j++) {
    let zero = true;
    for (let k = 0; k < n && zero; k++) zero = P[j * n + k] === 0 && P[k * n + j] === 0;
    isAux[j] = zero ? 1 : 0;
  }
  // Drop candidates until every row either touches at most one auxiliary (with a small dense
  // support) or touches only auxiliaries (a limit row).
  for (let changed = true; changed;) {
    changed = false;
    const own = new Int32Array(n);
    const supportOf: Set<number>[] = Array.from({ length: n }, () => new Set<number>());
    for (let r = 0; r < m; r++) {
      let auxCount = 0;
      let denseCount = 0;
      let last = -1;
      for (let a = R.start[r]; a < R.start[r + 1]; a++)
        if (isAux[R.col[a]]) {
          auxCount++;
          last = R.col[a];
        } else denseCount++;
      if (auxCount === 1) {
        own[last]++;
        for (let a = R.start[r]; a < R.start[r + 1]; a++) if (!isAux[R.col[a]]) supportOf[last].add(R.col[a]);
      } else if (auxCount > 1 && denseCount > 0) {
        // A limit that also holds a dense variable (the homogenised form's scale): not covered.
        for (let a = R.start[r]; a < R.start[r + 1]; a++) isAux[R.col[a]] = 0;
        changed = true;
      }
    }
    for (let j = 0; j < n; j++)
      if (isAux[j] && (own[j] === 0 || supportOf[j].size > AUX_SUPPORT)) {
        isAux[j] = 0;
        changed = true;
      }
  }
  const aux: number[] = [];
  const dense: number[] = [];
  for (let j = 0; j < n; j++) (isAux[j] ? aux : dense).push(j);
  if (aux.length === 0) return null;
  const limitRows: number[] = [];
  const plainRows: number[] = [];
  const rowsOf: number[][] = aux.map(() => []);
  const auxPos = new Int32Array(n).fill(-1);
  aux.forEach((j, e) => (auxPos[j] = e));
  const densePos = new Int32Array(n).fill(-1);
  dense.forEach((j, d) => (densePos[j] = d));
  for (let r = 0; r < m; r++) {
    let auxCount = 0;
    let last = -1;
    for (let a = R.start[r]; a < R.start[r + 1]; a++)
      if (isAux[R.col[a]]) {
        auxCount++;
        last = R.col[a];
      }
    if (auxCount === 0) plainRows.push(r);
    else if (auxCount === 1) rowsOf[auxPos[last]].push(r);
    else limitRows.push(r);
  }
  if (limitRows.length > AUX_LIMIT_ROWS) return null;
  const nd = dense.length;
  const ne = aux.length;
  const Pdd = new Float64Array(nd * nd);
  for (let a = 0; a < nd; a++) for (let b = 0; b < nd; b++) Pdd[a * nd + b] = P[dense[a] * n + dense[b]];
  const width = AUX_SUPPORT;
  const support = new Int32Array(ne * width).fill(-1);
  const ownStart = new Int32Array(ne + 1);
  const ownRows: number[] = [];
  const ownA: number[] = [];
  const ownD: number[] = [];
  for (let e = 0; e < ne; e++) {
    const slots: number[] = [];
    for (const r of rowsOf[e]) {
      const d = new Array<number>(width).fill(0);
      let coefficient = 0;
      for (let a = R.start[r]; a < R.start[r + 1]; a++) {
        const c = R.col[a];
        if (c === aux[e]) coefficient += R.val[a];
        else {
          let slot = slots.indexOf(densePos[c]);
          if (slot < 0) {
            slot = slots.length;
            slots.push(densePos[c]);
          }
          d[slot] += R.val[a];
        }
      }
      ownRows.push(r);
      ownA.push(coefficient);
      ownD.push(...d);
    }
    slots.forEach((d, k) => (support[e * width + k] = d));
    ownStart[e + 1] = ownRows.length;
  }
  const limitU = new Float64Array(limitRows.length * ne);
  limitRows.forEach((r, k) => {
    for (let a = R.start[r]; a < R.start[r + 1]; a++) limitU[k * ne + auxPos[R.col[a]]] += R.val[a];
  });
  const plainStart = new Int32Array(plainRows.length + 1);
  const plainCol: number[] = [];
  const plainVal: number[] = [];
  plainRows.forEach((r, k) => {
    for (let a = R.start[r]; a < R.start[r + 1]; a++) {
      plainCol.push(densePos[R.col[a]]);
      plainVal.push(R.val[a]);
    }
    plainStart[k + 1] = plainCol.length;
  });
  return {
    dense: Int32Array.from(dense),
    aux: Int32Array.from(aux),
    Pdd,
    R,
    plain: { start: plainStart, col: Int32Array.from(plainCol), val: Float64Array.from(plainVal) },
    plainRows: Int32Array.from(plainRows),
    ownStart,
    ownRows: Int32Array.from(ownRows),
    ownA: Float64Array.from(ownA),
    ownD: Float64Array.from(ownD),
    support,
    width,
    limitRows: Int32Array.from(limitRows),
    limitU,
  };
}

/** Dense variables an auxiliary's own rows may touch (a turnover or gross-exposure link touches one). */
const AUX_SUPPORT = 4;
/** Rows summing auxiliaries (one per turnover or gross-exposure limit) the capacitance holds. */
const AUX_LIMIT_ROWS = 4;

export function auxiliaryWorkspace(plan: AuxiliaryPlan): AuxiliaryFactor {
  const nd = plan.dense.length;
  const ne = plan.aux.length;
  const p = plan.limitRows.length;
  return {
    K: new Float64Array(nd * nd),
    delta: new Float64Array(ne),
    b: new Float64Array(ne * plan.width),
    rootW: new Float64Array(p),
    Cf: new Float64Array(p * p),
    fd: new Float64Array(nd),
    fe: new Float64Array(ne),
    te: new Float64Array(ne),
    alpha: new Float64Array(p),
    w: new Float64Array(plan.R.start.length - 1),
    residual: new Float64Array(nd + ne),
    correction: new Float64Array(nd + ne),
  };
}

/** K += w row row' for a row over the dense variables. */
function addPlainOuter(m: PackedRows, r: number, w: number, K: Float64Array, nd: number): void {
  for (let a = m.start[r]; a < m.start[r + 1]; a++) {
    const off = m.col[a] * nd;
    const wa = w * m.val[a];
    for (let c = m.start[r]; c < m.start[r + 1]; c++) K[off + m.col[c]] += wa * m.val[c];
  }
}

/**
 * Auxiliary e's Delta_e, b_e and its share of K: sum over pairs of its rows of
 * (w_r w_s / Delta_e) g g' with g_k = a_rk a_se - a_sk a_re on its support.
 */
function eliminateOne(plan: AuxiliaryPlan, f: AuxiliaryFactor, e: number, w: Float64Array, nd: number): boolean {
  const { ownStart, ownRows, ownA, ownD, support, width } = plan;
  const s0 = ownStart[e];
  const s1 = ownStart[e + 1];
  let delta = 0;
  const bo = e * width;
  for (let k = 0; k < width; k++) f.b[bo + k] = 0;
  for (let r = s0; r < s1; r++) {
    const wr = w[ownRows[r]];
    delta += wr * ownA[r] * ownA[r];
    for (let k = 0; k < width; k++) f.b[bo + k] += wr * ownA[r] * ownD[r * width + k];
  }
  if (!(delta > 0) || !Number.isFinite(delta)) return false;
  f.delta[e] = delta;
  for (let r = s0; r < s1; r++)
    for (let s = r + 1; s < s1; s++) {
      const c = (w[ownRows[r]] * w[ownRows[s]]) / delta;
      if (c === 0) continue;
      for (let k = 0; k < width; k++) {
        const dk = support[bo + k];
        if (dk < 0) break;
        const gk = ownD[r * width + k] * ownA[s] - ownD[s * width + k] * ownA[r];
        if (gk === 0) continue;
        for (let l = 0; l < width; l++) {
          const dl = support[bo + l];
          if (dl < 0) break;
          f.K[dk * nd + dl] += c * gk * (ownD[r * width + l] * ownA[s] - ownD[s * width + l] * ownA[r]);
        }
      }
    }
  return true;
}

/** y = H_ee^-1 g for the auxiliaries (Delta plus the limits' rank-p term), into y. */
function solveAux(plan: AuxiliaryPlan, f: AuxiliaryFactor, g: Float64Array, y: Float64Array): void {
  const ne = plan.aux.length;
  const p = plan.limitRows.length;
  for (let e = 0; e < ne; e++) y[e] = g[e] / f.delta[e];
  if (p === 0) return;
  const U = plan.limitU;
  for (let k = 0; k < p; k++) {
    let s = 0;
    for (let e = 0; e < ne; e++) s += U[k * ne + e] * y[e];
    f.alpha[k] = f.rootW[k] * s;
  }
  choleskySolveInPlace(f.Cf, p, f.alpha);
  for (let k = 0; k < p; k++) {
    const c = f.rootW[k] * f.alpha[k];
    if (c === 0) continue;
    for (let e = 0; e < ne; e++) y[e] -= (U[k * ne + e] * c) / f.delta[e];
  }
}

/**
 * K for row weights w (z/s of every row of R) and its Cholesky factor in place; false when K is
 * not positive definite even with a ridge.
 */
export function factorEliminated(plan: AuxiliaryPlan, f: AuxiliaryFactor, w: Float64Array): boolean {
  const nd = plan.dense.length;
  const ne = plan.aux.length;
  const p = plan.limitRows.length;
  const { K } = f;
  f.w.set(w);
  K.set(plan.Pdd);
  for (let k = 0; k < plan.plainRows.length; k++) addPlainOuter(plan.plain, k, w[plan.plainRows[k]], K, nd);
  for (let e = 0; e < ne; e++) if (!eliminateOne(plan, f, e, w, nd)) return false;
  if (p > 0) {
    // Capacitance C = I + W^1/2 U' Delta^-1 U W^1/2, and K += X C^-1 X' with X = B Delta^-1 U W^1/2.
    const U = plan.limitU;
    for (let k = 0; k < p; k++) f.rootW[k] = Math.sqrt(w[plan.limitRows[k]]);
    for (let k = 0; k < p; k++)
      for (let l = 0; l < p; l++) {
        let q = 0;
        for (let e = 0; e < ne; e++) q += (U[k * ne + e] * U[l * ne + e]) / f.delta[e];
        f.Cf[k * p + l] = (k === l ? 1 : 0) + f.rootW[k] * q * f.rootW[l];
      }
    if (!choleskyInPlace(f.Cf, p)) return false;
    // Columns of X L_C^-T, one at a time: x_k = (X column k - sum_{l<k} L_kl x_l) / L_kk.
    const X: Float64Array[] = [];
    for (let k = 0; k < p; k++) {
      const x = new Float64Array(nd);
      for (let e = 0; e < ne; e++) {
        const c = (U[k * ne + e] * f.rootW[k]) / f.delta[e];
        if (c === 0) continue;
        for (let s = 0; s < plan.width; s++) {
          const d = plan.support[e * plan.width + s];
          if (d < 0) break;
          x[d] += f.b[e * plan.width + s] * c;
        }
      }
      for (let l = 0; l < k; l++) for (let i = 0; i < nd; i++) x[i] -= f.Cf[k * p + l] * X[l][i];
      const pivot = f.Cf[k * p + k];
      for (let i = 0; i < nd; i++) x[i] /= pivot;
      X.push(x);
      for (let i = 0; i < nd; i++) {
        const xi = x[i];
        if (xi === 0) continue;
        for (let j = 0; j < nd; j++) K[i * nd + j] += xi * x[j];
      }
    }
  }
  const A = Float64Array.from(K);
  if (choleskyInPlace(K, nd)) return true;
  let maxDiag = 0;
  for (let i = 0; i < nd; i++) maxDiag = Math.max(maxDiag, Math.abs(A[i * nd + i]));
  for (
    let attempt = 0, reg = QP_TOLERANCES.ridgeStart * (maxDiag || 1);
    attempt < QP_TOLERANCES.ridgeAttempts;
    attempt++, reg *= 100
  ) {
    K.set(A);
    for (let i = 0; i < nd; i++) K[i * nd + i] += reg;
    if (choleskyInPlace(K, nd)) return true;
  }
  return false;
}

/**
 * Solves H v = rhs in place (v over all the variables) with the factor of factorEliminated, with
 * REFINEMENT_STEPS steps of iterative refinement: eliminating a variable whose rows weigh 1e10
 * leaves a backward error near 1e-10 (a difference of two numbers of that size), which one step
 * against H itself (P v + R'WRv, O(N^2)) brings back to the rounding of a dense Cholesky.
 */
export function solveEliminated(plan: AuxiliaryPlan, f: AuxiliaryFactor, v: Float64Array): void {
  const rhs = f.residual;
  rhs.set(v);
  solveOnce(plan, f, v);
  for (let step = 0; step < REFINEMENT_STEPS; step++) {
    // correction = H^-1 (rhs - H v)
    const r = f.correction;
    timesH(plan, f.w, v, r);
    for (let i = 0; i < r.length; i++) r[i] = rhs[i] - r[i];
    solveOnce(plan, f, r);
    for (let i = 0; i < v.length; i++) v[i] += r[i];
  }
}

const REFINEMENT_STEPS = 1;

/** out = H v = P v + R' diag(w) R v (P only on the dense variables). */
function timesH(plan: AuxiliaryPlan, w: Float64Array, v: Float64Array, out: Float64Array): void {
  const { dense, Pdd, R } = plan;
  const nd = dense.length;
  out.fill(0);
  for (let a = 0; a < nd; a++) {
    let s = 0;
    const off = a * nd;
    for (let b = 0; b < nd; b++) s += Pdd[off + b] * v[dense[b]];
    out[dense[a]] = s;
  }
  for (let r = 0; r + 1 < R.start.length; r++) {
    let s = 0;
    for (let a = R.start[r]; a < R.start[r + 1]; a++) s += R.val[a] * v[R.col[a]];
    const ws = w[r] * s;
    if (ws === 0) continue;
    for (let a = R.start[r]; a < R.start[r + 1]; a++) out[R.col[a]] += R.val[a] * ws;
  }
}

/** One solve of H v = rhs in place through the block elimination. */
function solveOnce(plan: AuxiliaryPlan, f: AuxiliaryFactor, v: Float64Array): void {
  const { dense, aux, support, width } = plan;
  const nd = dense.length;
  const ne = aux.length;
  for (let d = 0; d < nd; d++) f.fd[d] = v[dense[d]];
  for (let e = 0; e < ne; e++) f.fe[e] = v[aux[e]];
  // t = H_ee^-1 f_e; K x_d = f_d - B t; x_e = H_ee^-1 (f_e - B' x_d).
  solveAux(plan, f, f.fe, f.te);
  for (let e = 0; e < ne; e++) {
    const t = f.te[e];
    if (t === 0) continue;
    for (let s = 0; s < width; s++) {
      const d = support[e * width + s];
      if (d < 0) break;
      f.fd[d] -= f.b[e * width + s] * t;
    }
  }
  choleskySolveInPlace(f.K, nd, f.fd);
  for (let e = 0; e < ne; e++) {
    let g = f.fe[e];
    for (let s = 0; s < width; s++) {
      const d = support[e * width + s];
      if (d < 0) break;
      g -= f.b[e * width + s] * f.fd[d];
    }
    f.fe[e] = g;
  }
  solveAux(plan, f, f.fe, f.te);
  for (let d = 0; d < nd; d++) v[dense[d]] = f.fd[d];
  for (let e = 0; e < ne; e++) v[aux[e]] = f.te[e];
}
