/**
 * Polishing's equality-constrained KKT system with variables substituted out on active rows of
 * one and two entries, a x_t + b x_o = s: x_t = (s - b x_o) / a goes into the other rows and the
 * objective, and the row and x_t leave the system. Three kinds of variable are substituted:
 * - A fixed variable, which active rows determine outright: a row with one free entry, or two
 *   rows on the same two variables (a pair, both fixed by a 2 x 2 solve). Under a turnover limit
 *   the optimum keeps many assets exactly at their current weight: both link rows of t_i are
 *   active (or one, with t_i at its bound), x_i = c_i, and x_i and t_i leave the system, which
 *   keeps the assets that trade. Their rows' multipliers come from their own stationarity (a
 *   1 x 1 or 2 x 2 solve each); several single rows on one variable are dependent and split what
 *   its stationarity asks by least squares, the choice the whole system's ridge makes.
 * - An auxiliary. Under a turnover limit most auxiliaries t_i = |x_i - c_i| sit on one of their
 *   two link rows, t_i = (s - b x_i) / a is substituted into the other rows (the limit's sum among
 *   them), and the system keeps the size of the problem without the limit (its Cholesky costs an
 *   eighth, its Schur complement loses one row per asset). t_i has no curvature, so the objective
 *   keeps its quadratic part; t_i's linear term moves onto x_i.
 * - A variable tied to a hub: a variable v that many such rows share. The homogenised form's
 *   binding cap y_i - cap kappa <= 0 (a floor likewise) is the equality y_i = cap kappa, and
 *   with many caps binding the Cholesky and the Schur complement shrink by one each. y_i's
 *   curvature folds into the hub's row and column: with e = -b / a, P_vv gains
 *   2 e sum_i P_iv + e^2 sum_ij P_ij over the substituted set, P_Fv gains e sum_i P_Fi; y_i's
 *   linear term moves onto v.
 * The system solved is E'PE z + (CE)'l = E'(r - P g), CE z = s - C g, for x = E z + g (the
 * substituted rows drop out, as CE is zero on them; a fixed variable's row of E is zero). Each
 * substituted row's multiplier comes back from its variable's own stationarity: a l_r = r_t -
 * (P x)_t - sum over t's other rows of their coefficient times multiplier (t is in no other
 * substituted row but its pair's). An exact elimination: the KKT conditions of the full problem
 * are checked afterwards as always.
 * An auxiliary here is tied to one variable with curvature (its asset) by all its rows: the
 * homogenised form's scale, in every asset's rows, is left alone, and with it the choice among
 * equal multipliers of a degenerate active set that the explanations have always made. The scale
 * is never substituted as a hub's member either, and a hub's rows are substituted only where the
 * active rows are independent (the reduced system factors without a ridge, equality-kkt.ts
 * `independent`), and so are the fixed variables: a degenerate active set is solved as before,
 * with the auxiliaries alone (but for several single rows on one variable, above).
 */
import { factorEqualityKkt, refinement, solveEqualityKkt, type EqualityKkt, type Refinement } from './equality-kkt.js';
import { gatherInto, gatheredRowsTimes, type PackedRows } from './kernels.js';
import { QP_TOLERANCES } from './types.js';

/** Which variables (positions in F) leave the system, each on its defining row. */
export interface Substitution {
  /** The defining row of each position, -1 where the variable stays. */
  byRow: Int32Array;
  /**
   * The row's other variable (-1 for a fixed one), and the coefficients a (of the substituted
   * one) and b (of the other; of the partner for a pair).
   */
  otherOf: Int32Array;
  coefT: Float64Array;
  coefOther: Float64Array;
  /** A fixed pair's other member (its defining row is the partner's second row), -1 otherwise. */
  pairOf: Int32Array;
  /**
   * A variable fixed by several single rows (dependent: x_i <= c_i and -x_i <= -c_i with t_i at
   * its bound): all of them, the first defining it.
   */
  singleRows: Map<number, number[]>;
  usedRow: Uint8Array;
  /** The substituted positions whose row of P is not zero. */
  curved: number[];
  /** Substituted by kind. */
  auxiliaries: number;
  hubMembers: number;
  fixed: number;
}

/** Positions of F whose row of P is zero (no curvature). */
function flatPositions(e: EqualityKkt): Uint8Array {
  const { P, n, free } = e;
  const flat = new Uint8Array(free.length);
  for (let a = 0; a < free.length; a++) {
    let zero = true;
    const off = free[a] * n;
    for (let j = 0; j < n && zero; j++) zero = P[off + j] === 0;
    flat[a] = zero ? 1 : 0;
  }
  return flat;
}

function emptySubstitution(k: number, m: number): Substitution {
  return {
    byRow: new Int32Array(k).fill(-1),
    otherOf: new Int32Array(k).fill(-1),
    coefT: new Float64Array(k),
    coefOther: new Float64Array(k),
    pairOf: new Int32Array(k).fill(-1),
    singleRows: new Map(),
    usedRow: new Uint8Array(m),
    curved: [],
    auxiliaries: 0,
    hubMembers: 0,
    fixed: 0,
  };
}

function copied(sub: Substitution): Substitution {
  return {
    ...sub,
    byRow: Int32Array.from(sub.byRow),
    otherOf: Int32Array.from(sub.otherOf),
    coefT: Float64Array.from(sub.coefT),
    coefOther: Float64Array.from(sub.coefOther),
    pairOf: Int32Array.from(sub.pairOf),
    usedRow: Uint8Array.from(sub.usedRow),
    curved: [...sub.curved],
  };
}

function substitute(sub: Substitution, e: EqualityKkt, j: number, t: number, other: number, flat: Uint8Array): void {
  const { C } = e;
  sub.byRow[t] = j;
  sub.usedRow[j] = 1;
  sub.otherOf[t] = other;
  for (let q = C.start[j]; q < C.start[j + 1]; q++)
    if (C.col[q] === t) sub.coefT[t] = C.val[q];
    else sub.coefOther[t] = C.val[q];
  if (!flat[t]) sub.curved.push(t);
}

/**
 * Variables the active rows determine outright: a row with a single entry fixes its variable, and
 * two rows on the same two variables with independent coefficients fix both (an asset kept at its
 * current weight under a turnover limit: x_i - t_i <= c_i and -x_i - t_i <= -c_i both active give
 * x_i = c_i, t_i = 0; with t_i at its bound the first alone is x_i <= c_i). Several single rows
 * on one variable fix it too (with t_i at its bound both link rows are x_i alone); their
 * multipliers are then not determined, and they get the choice that the whole system's ridge
 * makes, the least-squares split of what the variable's stationarity asks of them (the ridge's
 * solve and its refinement leave nothing in the null space of C'). 'degenerate' where rows are
 * otherwise plainly dependent: three rows on two variables, a pair with a single row on one of its
 * variables or dependent coefficients.
 */
function fixedByRows(e: EqualityKkt, flat: Uint8Array, m: number): Substitution | 'degenerate' {
  const { C } = e;
  const k = e.free.length;
  const sub = emptySubstitution(k, m);
  const singleRow = new Int32Array(k).fill(-1);
  const onPair = new Map<number, number[]>();
  for (let j = 0; j < m; j++) {
    const q = C.start[j];
    const len = C.start[j + 1] - q;
    if (len === 1 && C.val[q] !== 0) {
      const a = C.col[q];
      if (singleRow[a] < 0) singleRow[a] = j;
      else {
        const rows = sub.singleRows.get(a);
        if (rows) rows.push(j);
        else sub.singleRows.set(a, [singleRow[a], j]);
        sub.usedRow[j] = 1;
      }
    } else if (len === 2 && C.col[q] !== C.col[q + 1] && C.val[q] !== 0 && C.val[q + 1] !== 0) {
      const key = Math.min(C.col[q], C.col[q + 1]) * k + Math.max(C.col[q], C.col[q + 1]);
      const rows = onPair.get(key);
      if (rows) rows.push(j);
      else onPair.set(key, [j]);
    }
  }
  const coefIn = (j: number, a: number) => (C.col[C.start[j]] === a ? C.val[C.start[j]] : C.val[C.start[j] + 1]);
  for (const rows of onPair.values()) {
    if (rows.length < 2) continue;
    if (rows.length > 2) return 'degenerate';
    const [j1, j2] = rows;
    const u = C.col[C.start[j1]];
    const v = C.col[C.start[j1] + 1];
    if (singleRow[u] >= 0 || singleRow[v] >= 0 || sub.byRow[u] >= 0 || sub.byRow[v] >= 0) return 'degenerate';
    // Row j1 fixes u and row j2 v: a1 x_u + b1 x_v = s1, a2 x_u + b2 x_v = s2.
    const [a1, b1, a2, b2] = [coefIn(j1, u), coefIn(j1, v), coefIn(j2, u), coefIn(j2, v)];
    const det = a1 * b2 - b1 * a2;
    // The second row's part off the first's direction, squared, relative to both rows' lengths:
    // the pivot test of equality-kkt.ts's Schur complement on these two rows.
    if (!(det * det >= QP_TOLERANCES.independentRows * (a1 * a1 + b1 * b1) * (a2 * a2 + b2 * b2))) return 'degenerate';
    for (const [a, j, own, partner, other] of [
      [u, j1, a1, b1, v],
      [v, j2, b2, a2, u],
    ] as const) {
      sub.byRow[a] = j;
      sub.usedRow[j] = 1;
      sub.coefT[a] = own;
      sub.coefOther[a] = partner;
      sub.pairOf[a] = other;
      if (!flat[a]) sub.curved.push(a);
      sub.fixed++;
    }
  }
  for (let a = 0; a < k; a++) {
    const j = singleRow[a];
    if (j < 0) continue;
    sub.byRow[a] = j;
    sub.usedRow[j] = 1;
    sub.coefT[a] = C.val[C.start[j]];
    if (!flat[a]) sub.curved.push(a);
    sub.fixed++;
  }
  return sub;
}

/**
 * Auxiliaries: flat variables whose rows touch one variable with curvature, each on a two-entry
 * row with it; on top of `base` (the fixed variables), whose variables and their rows are left.
 */
function auxiliaries(e: EqualityKkt, flat: Uint8Array, m: number, base?: Substitution): Substitution {
  const { C } = e;
  const k = e.free.length;
  const eligible = Uint8Array.from(flat);
  // The variables with curvature that each flat one's rows touch, in all.
  const support: Set<number>[] = Array.from({ length: k }, () => new Set<number>());
  for (let j = 0; j < m; j++)
    for (let q = C.start[j]; q < C.start[j + 1]; q++)
      if (eligible[C.col[q]])
        for (let u = C.start[j]; u < C.start[j + 1]; u++) if (!eligible[C.col[u]]) support[C.col[q]].add(C.col[u]);
  for (let a = 0; a < k; a++) if (support[a].size > 1) eligible[a] = 0;
  const sub = base ? copied(base) : emptySubstitution(k, m);
  for (let j = 0; j < m; j++) {
    if (C.start[j + 1] - C.start[j] !== 2) continue;
    const u = C.col[C.start[j]];
    const v = C.col[C.start[j] + 1];
    const [t, other] = eligible[u] && !eligible[v] ? [u, v] : eligible[v] && !eligible[u] ? [v, u] : [-1, -1];
    if (t < 0 || other < 0 || sub.byRow[t] >= 0 || sub.byRow[other] >= 0) continue;
    substitute(sub, e, j, t, other, flat);
    sub.auxiliaries++;
  }
  return sub;
}

/**
 * The auxiliaries' substitution with the hubs' members added: on each remaining two-entry row
 * whose one variable is in no other such row and whose other is in several (the hub), the first
 * leaves the system, unless an auxiliary leaves on it (no chains). Null when there is none.
 */
function withHubMembers(e: EqualityKkt, flat: Uint8Array, aux: Substitution, m: number): Substitution | null {
  const { C } = e;
  const k = e.free.length;
  const isOther = new Uint8Array(k);
  for (let a = 0; a < k; a++) if (aux.byRow[a] >= 0) isOther[aux.otherOf[a]] = 1;
  const candidate = new Uint8Array(m);
  const degree = new Int32Array(k);
  for (let j = 0; j < m; j++) {
    if (aux.usedRow[j] || C.start[j + 1] - C.start[j] !== 2) continue;
    const q = C.start[j];
    const [u, v] = [C.col[q], C.col[q + 1]];
    if (u === v || C.val[q] === 0 || C.val[q + 1] === 0 || aux.byRow[u] >= 0 || aux.byRow[v] >= 0) continue;
    candidate[j] = 1;
    degree[u]++;
    degree[v]++;
  }
  let sub: Substitution | null = null;
  for (let j = 0; j < m; j++) {
    if (!candidate[j]) continue;
    const [u, v] = [C.col[C.start[j]], C.col[C.start[j] + 1]];
    const [t, hub] = degree[u] === 1 && degree[v] > 1 ? [u, v] : degree[v] === 1 && degree[u] > 1 ? [v, u] : [-1, -1];
    if (t < 0 || isOther[t]) continue;
    sub ??= copied(aux);
    substitute(sub, e, j, t, hub, flat);
    sub.hubMembers++;
  }
  return sub;
}

/**
 * The substitution polishing makes on this system: the auxiliaries alone (a degenerate active
 * set's), and all of them (the fixed variables, then the auxiliaries, then the hubs' members),
 * null when that adds nothing to the auxiliaries or the rows are plainly dependent.
 */
export function substitutionOf(e: EqualityKkt): { auxiliaries: Substitution; all: Substitution | null } {
  const m = e.C.start.length - 1;
  const flat = flatPositions(e);
  const aux = auxiliaries(e, flat, m);
  const fixed = fixedByRows(e, flat, m);
  if (fixed === 'degenerate') return { auxiliaries: aux, all: null };
  const base = fixed.fixed > 0 ? auxiliaries(e, flat, m, fixed) : aux;
  return { auxiliaries: aux, all: withHubMembers(e, flat, base, m) ?? (fixed.fixed > 0 ? base : null) };
}

/** The substituted variables with curvature that are tied to another (not fixed). */
const tiedCurved = (sub: Substitution): number[] => sub.curved.filter((t) => sub.otherOf[t] >= 0);

/**
 * E'PE on the kept positions, for substituted variables with curvature tied to another (a fixed
 * one's column of E is zero): row f of PE is P's row on
 * the kept columns plus e_t P_ft on the column of t's other; row o of E'PE then gains e_t (PE)_t.
 */
function reducedHessian(e: EqualityKkt, sub: Substitution, kept: number[], newPos: Int32Array): Float64Array {
  const { P, n, free } = e;
  const k = free.length;
  const k2 = kept.length;
  const keptFree = Int32Array.from(kept, (a) => free[a]);
  const curved = tiedCurved(sub);
  const slope = Float64Array.from(curved, (t) => -sub.coefOther[t] / sub.coefT[t]);
  const column = Int32Array.from(curved, (t) => newPos[sub.otherOf[t]]);
  const curvedFree = Int32Array.from(curved, (t) => free[t]);
  const PE = new Float64Array(k * k2);
  // The curved variables grouped by their other's column (a stable order, so each column's terms
  // are added in the order above): one running sum per column instead of a store per term.
  const byColumn = Int32Array.from(curved.keys()).sort((a, b) => column[a] - column[b] || a - b);
  const groupColumn = Int32Array.from(byColumn, (c) => column[c]);
  const groupSlope = Float64Array.from(byColumn, (c) => slope[c]);
  const groupFree = Int32Array.from(byColumn, (c) => curvedFree[c]);
  const row = (f: number): void => {
    const off = free[f] * n;
    const o = f * k2;
    gatherInto(PE, o, P, off, keptFree);
    addSlopedTerms(PE, o, P, off, groupColumn, groupSlope, groupFree);
  };
  for (const a of kept) row(a);
  for (const t of curved) row(t);
  const Pr = new Float64Array(k2 * k2);
  kept.forEach((a, aa) => Pr.set(PE.subarray(a * k2, (a + 1) * k2), aa * k2));
  curved.forEach((t, c) => {
    const o = column[c] * k2;
    const s = slope[c];
    for (let b = 0; b < k2; b++) Pr[o + b] += s * PE[t * k2 + b];
  });
  return Pr;
}

/**
 * out[o + column_c] += slope_c a[ao + at_c] for each c, the c of one column consecutive: each
 * column's sum runs in a local, in the order of c.
 */
function addSlopedTerms(
  out: Float64Array,
  o: number,
  a: Float64Array,
  ao: number,
  column: Int32Array,
  slope: Float64Array,
  at: Int32Array,
): void {
  for (let c = 0; c < column.length;) {
    const col = column[c];
    let sum = out[o + col];
    for (; c < column.length && column[c] === col; c++) sum += slope[c] * a[ao + at[c]];
    out[o + col] = sum;
  }
}

/**
 * A sum with its rounding error carried (Neumaier 1974, ZAMM 54): a hub's coefficient in a row
 * gathers one term per member, and a plain sum's error, some hundred roundings, would show in
 * the full problem's residual. Two terms give the plain sum's value.
 */
class Compensated {
  private sum: number;
  private carry = 0;
  constructor(first: number) {
    this.sum = first;
  }
  add(v: number): void {
    const t = this.sum + v;
    this.carry += Math.abs(this.sum) >= Math.abs(v) ? this.sum - t + v : v - t + this.sum;
    this.sum = t;
  }
  value(): number {
    return this.sum + this.carry;
  }
}

/**
 * The kept rows on the kept positions: a substituted x_t's coefficient c moves to its other as
 * -c b / a, a fixed one's leaves (its value goes to the right-hand side).
 */
function reducedRows(
  e: EqualityKkt,
  sub: Substitution,
  rowsKept: readonly number[],
  newPos: Int32Array,
  k2: number,
): PackedRows {
  const { C } = e;
  const { byRow, otherOf, coefT, coefOther } = sub;
  const start = new Int32Array(rowsKept.length + 1);
  const col: number[] = [];
  const val: number[] = [];
  const sums: (Compensated | undefined)[] = new Array<Compensated | undefined>(k2);
  const touched: number[] = [];
  rowsKept.forEach((j, jj) => {
    const add = (at: number, v: number): void => {
      const s = sums[at];
      if (s) s.add(v);
      else {
        sums[at] = new Compensated(v);
        touched.push(at);
      }
    };
    for (let q = C.start[j]; q < C.start[j + 1]; q++) {
      const a = C.col[q];
      const c = C.val[q];
      if (byRow[a] < 0) add(newPos[a], c);
      else if (otherOf[a] >= 0) add(newPos[otherOf[a]], -(c * coefOther[a]) / coefT[a]);
    }
    touched.sort((x, y) => x - y);
    for (const at of touched) {
      col.push(at);
      val.push(sums[at]!.value());
      sums[at] = undefined;
    }
    touched.length = 0;
    start[jj + 1] = col.length;
  });
  return { start, col: Int32Array.from(col), val: Float64Array.from(val) };
}

/** The reduced system, and the maps of a right-hand side to it and of its solution back. */
interface Reduced {
  system: EqualityKkt;
  /** (r, s) of the whole system to the reduced one's. */
  toReduced(r: Float64Array, s: Float64Array): { r2: Float64Array; s2: Float64Array };
  /** The reduced solution for (r, s) to the whole system's, x and then every row's multiplier. */
  fromReduced(reduced: Float64Array, r: Float64Array, s: Float64Array): Float64Array;
}

function reducedSystem(e: EqualityKkt, sub: Substitution): Reduced {
  const { P, n, free, C } = e;
  const k = free.length;
  const m = C.start.length - 1;
  const { byRow, otherOf, coefT, coefOther, pairOf, usedRow } = sub;
  const newPos = new Int32Array(k).fill(-1);
  const kept: number[] = [];
  for (let a = 0; a < k; a++)
    if (byRow[a] < 0) {
      newPos[a] = kept.length;
      kept.push(a);
    }
  const k2 = kept.length;
  const rowsKept: number[] = [];
  for (let j = 0; j < m; j++) if (!usedRow[j]) rowsKept.push(j);
  const C2 = reducedRows(e, sub, rowsKept, newPos, k2);
  // Without curvature among the substituted, E'PE is P on the kept variables: no copy.
  const system: EqualityKkt =
    tiedCurved(sub).length === 0
      ? { P, n, free: Int32Array.from(kept, (a) => free[a]), C: C2 }
      : { P: reducedHessian(e, sub, kept, newPos), n: k2, free: Int32Array.from(kept, (_, aa) => aa), C: C2 };

  // Each substituted variable's constant part: s_r / a, or a fixed pair's solution (Cramer's rule).
  const constants = (s: Float64Array): Float64Array => {
    const g = new Float64Array(k);
    for (let a = 0; a < k; a++) {
      const j = byRow[a];
      if (j < 0) continue;
      const p = pairOf[a];
      g[a] =
        p < 0
          ? s[j] / coefT[a]
          : (s[j] * coefT[p] - s[byRow[p]] * coefOther[a]) / (coefT[a] * coefT[p] - coefOther[a] * coefOther[p]);
    }
    return g;
  };

  const toReduced = (r: Float64Array, s: Float64Array) => {
    const g = constants(s);
    // s - C g on the kept rows.
    const s2 = new Float64Array(rowsKept.length);
    rowsKept.forEach((j, jj) => {
      const rhs = new Compensated(s[j]);
      for (let q = C.start[j]; q < C.start[j + 1]; q++) {
        const a = C.col[q];
        if (byRow[a] >= 0) rhs.add(pairOf[a] < 0 ? -(C.val[q] * s[byRow[a]]) / coefT[a] : -C.val[q] * g[a]);
      }
      s2[jj] = rhs.value();
    });
    // E'(r - P g) (P g is zero but for curvature).
    let rg = r;
    const gc = new Float64Array(k);
    for (const t of sub.curved) gc[t] = g[t];
    if (gc.some((v) => v !== 0)) {
      rg = Float64Array.from(r);
      const Pg = new Float64Array(k);
      gatheredRowsTimes(P, n, free, free, gc, Pg);
      for (let a = 0; a < k; a++) rg[a] -= Pg[a];
    }
    const r2 = new Float64Array(k2);
    kept.forEach((a, aa) => (r2[aa] = rg[a]));
    const gathered: (Compensated | undefined)[] = new Array<Compensated | undefined>(k2);
    for (let a = 0; a < k; a++)
      if (byRow[a] >= 0 && otherOf[a] >= 0) {
        const o = newPos[otherOf[a]];
        (gathered[o] ??= new Compensated(r2[o])).add(-(rg[a] * coefOther[a]) / coefT[a]);
      }
    gathered.forEach((sum, o) => (r2[o] = sum!.value()));
    return { r2, s2 };
  };

  const curvedRows = Int32Array.from(sub.curved, (t) => free[t]);
  const fromReduced = (reduced: Float64Array, r: Float64Array, s: Float64Array): Float64Array => {
    const sol = new Float64Array(k + m);
    kept.forEach((a, aa) => (sol[a] = reduced[aa]));
    rowsKept.forEach((j, jj) => (sol[k + j] = reduced[k2 + jj]));
    const g = constants(s);
    for (let a = 0; a < k; a++) {
      const j = byRow[a];
      if (j >= 0) sol[a] = otherOf[a] >= 0 ? (s[j] - coefOther[a] * sol[otherOf[a]]) / coefT[a] : g[a];
    }
    // Each defining row's multiplier from its variable's stationarity: (P x)_t + sum_rows c l = r_t,
    // a fixed pair's two from both members' (the transposed 2 x 2 system), a variable's several
    // single rows' as the least-squares split c_j (r_t - ...) / sum c^2.
    const other = new Float64Array(k);
    for (let j = 0; j < m; j++) {
      if (usedRow[j]) continue;
      const l = sol[k + j];
      if (l === 0) continue;
      for (let q = C.start[j]; q < C.start[j + 1]; q++) if (byRow[C.col[q]] >= 0) other[C.col[q]] += C.val[q] * l;
    }
    const x = sol.subarray(0, k);
    const Px = new Float64Array(curvedRows.length);
    gatheredRowsTimes(P, n, curvedRows, free, x, Px);
    sub.curved.forEach((t, c) => (other[t] += Px[c]));
    for (let a = 0; a < k; a++) {
      const j = byRow[a];
      const p = pairOf[a];
      if (j < 0 || (p >= 0 && p < a)) continue;
      const group = sub.singleRows.get(a);
      if (group) {
        let norm2 = 0;
        for (const g of group) norm2 += C.val[C.start[g]] * C.val[C.start[g]];
        for (const g of group) sol[k + g] = (C.val[C.start[g]] * (r[a] - other[a])) / norm2;
        continue;
      }
      if (p < 0) {
        sol[k + j] = (r[a] - other[a]) / coefT[a];
        continue;
      }
      const [Ra, Rp] = [r[a] - other[a], r[p] - other[p]];
      const det = coefT[a] * coefT[p] - coefOther[a] * coefOther[p];
      sol[k + j] = (Ra * coefT[p] - Rp * coefOther[p]) / det;
      sol[k + byRow[p]] = (Rp * coefT[a] - Ra * coefOther[a]) / det;
    }
    return sol;
  };
  return { system, toReduced, fromReduced };
}

/**
 * (x, l) as solveEqualityKkt gives them, from the smaller system with the substitutions above,
 * as a refinement (equality-kkt.ts) to be taken as far as the caller needs. With the hubs'
 * members substituted, iterative refinement runs on the whole system (its residual in the sums
 * that the KKT check makes, each correction from the reduced system's factor), which also takes
 * out the rounding of E'PE's sums; a degenerate active set goes to the auxiliaries alone, refined
 * on the reduced system as before.
 */
export function equalityKktRefinement(e: EqualityKkt, r: Float64Array, s: Float64Array): Refinement | null {
  const { auxiliaries: aux, all } = substitutionOf(e);
  if (all) {
    const reduced = reducedSystem(e, all);
    const solve = factorEqualityKkt(reduced.system, 'independent');
    if (solve === null) return null;
    if (solve !== 'dependent') {
      const k2 = reduced.system.free.length;
      const part = new Float64Array(k2 + reduced.system.C.start.length - 1);
      return refinement(e, r, s, (rx, rs, out) => {
        const { r2, s2 } = reduced.toReduced(rx, rs);
        solve(r2, s2, part);
        out.set(reduced.fromReduced(part, rx, rs));
      });
    }
  }
  if (aux.auxiliaries === 0) {
    const solve = factorEqualityKkt(e);
    return solve && solve !== 'dependent' ? refinement(e, r, s, solve) : null;
  }
  const reduced = reducedSystem(e, aux);
  const { r2, s2 } = reduced.toReduced(r, s);
  const part = solveEqualityKkt(reduced.system, r2, s2);
  if (!part) return null;
  const sol = reduced.fromReduced(part, r, s);
  return { until: () => sol, ended: true };
}

/** (x, l) as solveEqualityKkt gives them (equalityKktRefinement refined to the end). */
export function solveEqualityKktSubstituted(e: EqualityKkt, r: Float64Array, s: Float64Array): Float64Array | null {
  return equalityKktRefinement(e, r, s)?.until(0) ?? null;
}
