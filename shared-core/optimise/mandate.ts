/**
 * A mandate in linear form: the scenario's limits as rows and bounds over the asset weights plus
 * the auxiliary variables that linearise absolute values (turnover: t_i >= |w_i - current_i|;
 * gross exposure: g_i >= |w_i|). Every row keeps a label, so a solver result (binding rows,
 * multipliers, a conflict) can be told to a person in the mandate's own terms.
 */
import type { AssetInfo, Constraints } from '../scenario/schema.js';
import type { SparseRow } from './qp/index.js';

export type RowKind =
  | 'budget'
  | 'group-max'
  | 'group-min'
  | 'illiquid-max'
  | 'turnover'
  | 'gross-exposure'
  | 'turnover-link'
  | 'gross-link';

export interface MandateRow {
  kind: RowKind;
  /** Group name, or the asset id for link rows. */
  name: string;
  /** The limit as the user wrote it (a share of the portfolio). */
  limit: number;
  /** +1 when the row reads a'x <= limit, -1 when it reads -a'x <= -limit (a minimum). */
  sign: 1 | -1;
  members?: readonly string[];
  row: SparseRow;
  /** Right-hand side in the row's own orientation (sign * limit, or a link constant). */
  rhs: number;
}

export interface LinearMandate {
  assets: readonly string[];
  /** Asset weights first (0..n-1), then auxiliaries. */
  variables: number;
  equalities: MandateRow[];
  inequalities: MandateRow[];
  lb: Float64Array;
  ub: Float64Array;
  /** Where each asset's upper bound comes from (for explanations). */
  upperSource: ('weight-bound' | 'liquidity-cap' | 'none')[];
  current: Float64Array;
  longOnly: boolean;
}

/** Per-asset bounds: `longOnly` (default true) adds w >= 0; `false` with no bounds means none. */
function assetBounds(assets: readonly string[], c: Constraints, info: Record<string, AssetInfo> | undefined) {
  const n = assets.length;
  const longOnly = c.longOnly !== false;
  const lb = new Float64Array(n);
  const ub = new Float64Array(n);
  const upperSource: LinearMandate['upperSource'] = [];
  const wb = c.weightBounds ?? {};
  assets.forEach((a, i) => {
    const given = wb[a] ?? wb.default;
    let lo = given ? given[0] : longOnly ? 0 : -Infinity;
    let hi = given ? given[1] : longOnly ? 1 : Infinity;
    if (longOnly) lo = Math.max(0, lo);
    upperSource.push(given ? 'weight-bound' : 'none');
    const cap = info?.[a]?.liquidityCap;
    if (cap !== undefined && cap < hi) {
      hi = cap;
      upperSource[i] = 'liquidity-cap';
    }
    lb[i] = lo;
    ub[i] = hi; // a cap below the floor is reported by infeasibility.ts before any solve
  });
  return { lb, ub, upperSource, longOnly };
}

export function buildMandate(
  assets: readonly string[],
  c: Constraints,
  current: Record<string, number> | undefined,
  info: Record<string, AssetInfo> | undefined,
): LinearMandate {
  const n = assets.length;
  const index = new Map(assets.map((a, i) => [a, i]));
  const { lb, ub, upperSource, longOnly } = assetBounds(assets, c, info);
  const all = [...Array(n).keys()];
  const equalities: MandateRow[] = [
    { kind: 'budget', name: 'fully invested', limit: 1, sign: 1, row: { idx: all, val: all.map(() => 1) }, rhs: 1 },
  ];
  const inequalities: MandateRow[] = [];
  for (const g of c.groups ?? []) {
    const idx = g.members.map((m) => index.get(m)).filter((i): i is number => i !== undefined);
    const members = idx.map((i) => assets[i]);
    if (g.max !== undefined)
      inequalities.push({
        kind: 'group-max',
        name: g.name,
        limit: g.max,
        sign: 1,
        members,
        row: { idx, val: idx.map(() => 1) },
        rhs: g.max,
      });
    if (g.min !== undefined && g.min > 0)
      inequalities.push({
        kind: 'group-min',
        name: g.name,
        limit: g.min,
        sign: -1,
        members,
        row: { idx, val: idx.map(() => -1) },
        rhs: -g.min,
      });
  }
  if (c.illiquidMax !== undefined) {
    const idx = all.filter((i) => info?.[assets[i]]?.liquidity === 'illiquid');
    if (idx.length > 0)
      inequalities.push({
        kind: 'illiquid-max',
        name: 'illiquid assets',
        limit: c.illiquidMax,
        sign: 1,
        members: idx.map((i) => assets[i]),
        row: { idx, val: idx.map(() => 1) },
        rhs: c.illiquidMax,
      });
  }
  const cur = Float64Array.from(assets, (a) => current?.[a] ?? 0);
  let variables = n;
  const auxLb: number[] = [];
  const auxUb: number[] = [];
  if (c.maxTurnover !== undefined) {
    // t_i >= w_i - c_i and t_i >= c_i - w_i; sum t_i <= maxTurnover (plus what leaves the universe).
    const off = variables;
    variables += n;
    let outside = 0;
    for (const [a, w] of Object.entries(current ?? {})) if (!index.has(a)) outside += Math.abs(w);
    for (let i = 0; i < n; i++) {
      auxLb.push(0);
      auxUb.push(Infinity);
      inequalities.push({
        kind: 'turnover-link',
        name: assets[i],
        limit: cur[i],
        sign: 1,
        row: { idx: [i, off + i], val: [1, -1] },
        rhs: cur[i],
      });
      inequalities.push({
        kind: 'turnover-link',
        name: assets[i],
        limit: cur[i],
        sign: -1,
        row: { idx: [i, off + i], val: [-1, -1] },
        rhs: -cur[i],
      });
    }
    const idx = [...Array(n).keys()].map((i) => off + i);
    inequalities.push({
      kind: 'turnover',
      name: 'turnover',
      limit: c.maxTurnover,
      sign: 1,
      row: { idx, val: idx.map(() => 1) },
      rhs: c.maxTurnover - outside,
    });
  }
  if (c.maxGrossExposure !== undefined && !longOnly) {
    const off = variables;
    variables += n;
    for (let i = 0; i < n; i++) {
      auxLb.push(0);
      auxUb.push(Infinity);
      inequalities.push({
        kind: 'gross-link',
        name: assets[i],
        limit: 0,
        sign: 1,
        row: { idx: [i, off + i], val: [1, -1] },
        rhs: 0,
      });
      inequalities.push({
        kind: 'gross-link',
        name: assets[i],
        limit: 0,
        sign: 1,
        row: { idx: [i, off + i], val: [-1, -1] },
        rhs: 0,
      });
    }
    const idx = [...Array(n).keys()].map((i) => off + i);
    inequalities.push({
      kind: 'gross-exposure',
      name: 'gross exposure',
      limit: c.maxGrossExposure,
      sign: 1,
      row: { idx, val: idx.map(() => 1) },
      rhs: c.maxGrossExposure,
    });
  }
  const LB = new Float64Array(variables);
  const UB = new Float64Array(variables);
  LB.set(lb);
  UB.set(ub);
  LB.set(auxLb, n);
  UB.set(auxUb, n);
  return { assets, variables, equalities, inequalities, lb: LB, ub: UB, upperSource, current: cur, longOnly };
}

/** A rule's weights count as feasible when no limit is broken by more than this. */
export const RULE_FEASIBILITY = 1e-12;

/** Largest violation of the mandate by weights w (turnover and gross exposure evaluated directly). */
export function mandateViolation(m: LinearMandate, w: ArrayLike<number>): number {
  const n = m.assets.length;
  let v = 0;
  for (let i = 0; i < n; i++) v = Math.max(v, m.lb[i] - w[i], w[i] - m.ub[i]);
  let sum = 0;
  for (let i = 0; i < n; i++) sum += w[i];
  v = Math.max(v, Math.abs(sum - 1));
  for (const r of m.inequalities) {
    if (r.kind === 'turnover-link' || r.kind === 'gross-link') continue;
    let lhs = 0;
    if (r.kind === 'turnover') {
      for (let i = 0; i < n; i++) lhs += Math.abs(w[i] - m.current[i]);
      lhs += r.limit - r.rhs; // current holdings outside the universe are sold
      v = Math.max(v, lhs - r.limit);
    } else if (r.kind === 'gross-exposure') {
      for (let i = 0; i < n; i++) lhs += Math.abs(w[i]);
      v = Math.max(v, lhs - r.limit);
    } else {
      for (let k = 0; k < r.row.idx.length; k++) lhs += r.row.val[k] * w[r.row.idx[k]];
      v = Math.max(v, lhs - r.rhs);
    }
  }
  return v;
}
