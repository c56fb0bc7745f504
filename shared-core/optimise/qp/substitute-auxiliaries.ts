/**
 * Polishing's equality-constrained KKT system with the auxiliaries substituted out. Under a
 * turnover limit most auxiliaries t_i = |x_i - c_i| sit on one of their two link rows, which is
 * then an equality row with two entries, a t_i + b x_i = s: t_i = (s - b x_i) / a is substituted
 * into the other rows (the limit's sum among them), and the row and t_i leave the system. The
 * system keeps the size of the problem without the limit (its Cholesky costs an eighth, its
 * Schur complement loses one row per asset). t_i has no curvature, so the objective keeps its
 * quadratic part; t_i's linear term moves onto x_i. The row's multiplier comes back from t_i's
 * own stationarity: a l_r = r_t - sum over t_i's other rows of their coefficient times multiplier.
 * An exact elimination: the KKT conditions of the full problem are checked afterwards as always.
 * An auxiliary here is tied to one variable with curvature (its asset) by all its rows: the
 * homogenised form's scale, in every asset's rows, is left alone, and with it the choice among
 * equal multipliers of a degenerate active set that the explanations have always made.
 */
import { solveEqualityKkt, type EqualityKkt } from './equality-kkt.js';

export function solveEqualityKktSubstituted(e: EqualityKkt, r: Float64Array, s: Float64Array): Float64Array | null {
  const { P, n, free, C } = e;
  const k = free.length;
  const m = s.length;
  const flat = new Uint8Array(k); // no curvature: P's row of the variable is zero
  for (let a = 0; a < k; a++) {
    let zero = true;
    const off = free[a] * n;
    for (let j = 0; j < n && zero; j++) zero = P[off + j] === 0;
    flat[a] = zero ? 1 : 0;
  }
  // The variables with curvature that each flat one's rows touch, in all.
  const support: Set<number>[] = Array.from({ length: k }, () => new Set<number>());
  for (let j = 0; j < m; j++)
    for (let q = C.start[j]; q < C.start[j + 1]; q++)
      if (flat[C.col[q]])
        for (let u = C.start[j]; u < C.start[j + 1]; u++) if (!flat[C.col[u]]) support[C.col[q]].add(C.col[u]);
  for (let a = 0; a < k; a++) if (support[a].size > 1) flat[a] = 0;
  // Each flat variable's defining row: two entries, the other one on a variable with curvature.
  const byRow = new Int32Array(k).fill(-1);
  const usedRow = new Uint8Array(m);
  for (let j = 0; j < m; j++) {
    if (C.start[j + 1] - C.start[j] !== 2) continue;
    const u = C.col[C.start[j]];
    const v = C.col[C.start[j] + 1];
    const [t, other] = flat[u] && !flat[v] ? [u, v] : flat[v] && !flat[u] ? [v, u] : [-1, -1];
    if (t < 0 || other < 0 || byRow[t] >= 0) continue;
    byRow[t] = j;
    usedRow[j] = 1;
  }
  let substituted = 0;
  for (let a = 0; a < k; a++) if (byRow[a] >= 0) substituted++;
  if (substituted === 0) return solveEqualityKkt(e, r, s);

  // t = (s_j - b x_other) / a for each substituted t (a its coefficient, b the other's).
  const coefT = new Float64Array(k);
  const coefOther = new Float64Array(k);
  const otherOf = new Int32Array(k).fill(-1);
  for (let a = 0; a < k; a++) {
    const j = byRow[a];
    if (j < 0) continue;
    for (let q = C.start[j]; q < C.start[j + 1]; q++)
      if (C.col[q] === a) coefT[a] = C.val[q];
      else {
        otherOf[a] = C.col[q];
        coefOther[a] = C.val[q];
      }
  }
  const newPos = new Int32Array(k).fill(-1);
  const kept: number[] = [];
  for (let a = 0; a < k; a++)
    if (byRow[a] < 0) {
      newPos[a] = kept.length;
      kept.push(a);
    }
  const rowsKept: number[] = [];
  for (let j = 0; j < m; j++) if (!usedRow[j]) rowsKept.push(j);
  const start = new Int32Array(rowsKept.length + 1);
  const col: number[] = [];
  const val: number[] = [];
  const s2 = new Float64Array(rowsKept.length);
  rowsKept.forEach((j, jj) => {
    const entries = new Map<number, number>();
    let rhs = s[j];
    for (let q = C.start[j]; q < C.start[j + 1]; q++) {
      const a = C.col[q];
      const c = C.val[q];
      if (byRow[a] < 0) entries.set(newPos[a], (entries.get(newPos[a]) ?? 0) + c);
      else {
        const o = newPos[otherOf[a]];
        entries.set(o, (entries.get(o) ?? 0) - (c * coefOther[a]) / coefT[a]);
        rhs -= (c * s[byRow[a]]) / coefT[a];
      }
    }
    for (const [a, c] of [...entries].sort((x, y) => x[0] - y[0])) {
      col.push(a);
      val.push(c);
    }
    s2[jj] = rhs;
    start[jj + 1] = col.length;
  });
  const r2 = new Float64Array(kept.length);
  kept.forEach((a, aa) => (r2[aa] = r[a]));
  for (let a = 0; a < k; a++) if (byRow[a] >= 0) r2[newPos[otherOf[a]]] -= (r[a] * coefOther[a]) / coefT[a];
  const reduced = solveEqualityKkt(
    {
      P,
      n,
      free: Int32Array.from(kept, (a) => free[a]),
      C: { start, col: Int32Array.from(col), val: Float64Array.from(val) },
    },
    r2,
    s2,
  );
  if (!reduced) return null;

  const k2 = kept.length;
  const sol = new Float64Array(k + m);
  kept.forEach((a, aa) => (sol[a] = reduced[aa]));
  rowsKept.forEach((j, jj) => (sol[k + j] = reduced[k2 + jj]));
  for (let a = 0; a < k; a++) {
    const j = byRow[a];
    if (j >= 0) sol[a] = (s[j] - coefOther[a] * sol[otherOf[a]]) / coefT[a];
  }
  // Each defining row's multiplier from its variable's stationarity: sum_rows c l = r (no curvature).
  const other = new Float64Array(k);
  for (let j = 0; j < m; j++) {
    if (usedRow[j]) continue;
    const l = sol[k + j];
    if (l === 0) continue;
    for (let q = C.start[j]; q < C.start[j + 1]; q++) if (byRow[C.col[q]] >= 0) other[C.col[q]] += C.val[q] * l;
  }
  for (let a = 0; a < k; a++) {
    const j = byRow[a];
    if (j >= 0) sol[k + j] = (r[a] - other[a]) / coefT[a];
  }
  return sol;
}
