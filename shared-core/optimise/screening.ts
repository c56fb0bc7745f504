import type { Matrix } from '../linalg/matrix.js';
import type { LinearMandate } from './mandate.js';
import { addDot, QP_TOLERANCES } from './qp/index.js';

/**
 * Which assets to try first when screening: the least correlated with the inverse-volatility
 * portfolio (maximum diversification) or with the lowest covariance with it (minimum variance).
 * Lower is more promising. Undefined below QP_TOLERANCES.screenFrom assets.
 */
export function screeningScore(S: Matrix, vols: Float64Array, correlation: boolean): Float64Array | undefined {
  const n = vols.length;
  if (n < QP_TOLERANCES.screenFrom) return undefined;
  const w = new Float64Array(n);
  for (let i = 0; i < n; i++) w[i] = 1 / vols[i];
  // Sigma w, every w_i non-zero: linalg multiplyVector's dense sums, in the solver's own dot
  // product, which the interior point's residuals then find optimised (qp/kernels.ts).
  const score = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const v = addDot(0, S.data, i * n, w, n);
    score[i] = correlation ? v / vols[i] : v;
  }
  return score;
}

/** The assets a screened solve starts from, and the order it adds the others in. */
export function screenPlan(m: LinearMandate, score: Float64Array) {
  const n = m.assets.length;
  if (m.variables !== n) return null; // turnover or gross exposure: no screening
  const candidates: number[] = [];
  for (let i = 0; i < n; i++) if (m.lb[i] === 0) candidates.push(i);
  const order = [...candidates].sort((a, b) => score[a] - score[b]);
  let minCap = 1;
  for (let i = 0; i < n; i++) minCap = Math.min(minCap, m.ub[i]);
  const size = Math.min(
    n,
    Math.max(QP_TOLERANCES.screenInitial, Math.ceil(QP_TOLERANCES.screenPerCap / Math.max(minCap, 1e-3))),
  );
  const keep = withBandFillers(m, score, order.slice(0, size));
  // Caps so tight that the set above passes screenShare: a tighter one (solve-qp.ts screened).
  const tightSize = minCap > 0 ? Math.ceil(QP_TOLERANCES.screenPerCapTight / minCap) : n;
  const tight =
    n >= QP_TOLERANCES.screenTightFrom && keep.length > QP_TOLERANCES.screenShare * n && tightSize < n
      ? withBandFillers(m, score, order.slice(0, tightSize))
      : undefined;
  return { candidates, keep, order, ...(tight ? { tight } : {}) };
}

/**
 * A working set with what each band with a minimum needs to fill it: its best-scored members
 * until their caps reach screenPerCap times the minimum (all of them when they cannot). Keeping
 * every member put a universe split into bands past screenShare, to be solved whole.
 */
function withBandFillers(m: LinearMandate, score: Float64Array, first: readonly number[]): number[] {
  const set = new Set(first);
  for (const r of m.inequalities) {
    if (r.kind !== 'group-min') continue;
    const members = [...r.row.idx].sort((a, b) => score[a] - score[b]);
    let room = 0;
    for (const i of members) {
      if (room >= QP_TOLERANCES.screenPerCap * r.limit) break;
      set.add(i);
      room += m.ub[i];
    }
  }
  return [...set];
}
