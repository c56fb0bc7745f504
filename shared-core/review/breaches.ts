import { buildMandate } from '../optimise/mandate.js';
import { formatPct } from '../present/format.js';
import type { AssetInfo, Constraints } from '../scenario/schema.js';

/**
 * The mandate limits that given weights break: per-asset caps and floors (a liquidity cap
 * included), group bands and the illiquid limit, read from the same linear mandate the optimiser
 * solves under (optimise/mandate.ts), so a limit means here what it means to the solve. Turnover
 * and gross exposure limit a change or a long-short book, not a holding, and are not checked.
 */
export type BreachKind = 'cap' | 'floor' | 'group-max' | 'group-min' | 'illiquid-max';

export interface Breach {
  kind: BreachKind;
  /** The asset or the group (for the illiquid limit: "illiquid assets"). */
  subject: string;
  /** The weight (or the group's sum) as held. */
  value: number;
  /** The limit it breaks. */
  limit: number;
  /** In words, for the screen, the table and the memo: "GOLD 18.2% is above its cap of 15.0%". */
  text: string;
}

/** Weights within this of a limit keep it: holdings valued to the cent are not a breach by rounding. */
export const BREACH_TOLERANCE = 1e-6;

export function mandateBreaches(
  assets: readonly string[],
  constraints: Constraints,
  info: Readonly<Record<string, AssetInfo>> | undefined,
  weights: Readonly<Record<string, number>>,
): Breach[] {
  const { maxTurnover: _turnover, maxGrossExposure: _gross, ...limits } = constraints;
  const mandate = buildMandate(assets, limits, undefined, info as Record<string, AssetInfo> | undefined);
  const w = assets.map((a) => weights[a] ?? 0);
  const out: Breach[] = [];
  assets.forEach((asset, i) => {
    const ub = mandate.ub[i];
    const lb = mandate.lb[i];
    if (w[i] > ub + BREACH_TOLERANCE) {
      const what = mandate.upperSource[i] === 'liquidity-cap' ? 'liquidity cap' : 'cap';
      out.push({
        kind: 'cap',
        subject: asset,
        value: w[i],
        limit: ub,
        text: `${asset} ${formatPct(w[i])} is above its ${what} of ${formatPct(ub)}`,
      });
    }
    if (w[i] < lb - BREACH_TOLERANCE)
      out.push({
        kind: 'floor',
        subject: asset,
        value: w[i],
        limit: lb,
        text: `${asset} ${formatPct(w[i])} is below its floor of ${formatPct(lb)}`,
      });
  });
  for (const row of mandate.inequalities) {
    if (row.kind !== 'group-max' && row.kind !== 'group-min' && row.kind !== 'illiquid-max') continue;
    let sum = 0;
    for (let k = 0; k < row.row.idx.length; k++) sum += w[row.row.idx[k]];
    if (row.kind === 'group-min') {
      if (sum < row.limit - BREACH_TOLERANCE)
        out.push({
          kind: 'group-min',
          subject: row.name,
          value: sum,
          limit: row.limit,
          text: `${row.name} ${formatPct(sum)} is below its minimum of ${formatPct(row.limit)}`,
        });
    } else if (sum > row.limit + BREACH_TOLERANCE) {
      const what = row.kind === 'illiquid-max' ? 'limit' : 'maximum';
      out.push({
        kind: row.kind,
        subject: row.name,
        value: sum,
        limit: row.limit,
        text: `${row.kind === 'illiquid-max' ? 'Illiquid assets' : row.name} ${formatPct(sum)} ${row.kind === 'illiquid-max' ? 'are' : 'is'} above the ${what} of ${formatPct(row.limit)}`,
      });
    }
  }
  return out;
}
