/**
 * Infeasible mandates told in a user's words. The QP's phase one is the judge (it proves the
 * conflict); these sums say which limits collide and by how much, checking the usual culprits
 * first and falling back on the constraints the phase-one certificate names.
 */
import type { LinearMandate } from './mandate.js';
import type { QpConflict } from './qp/index.js';
import type { Formulation } from './formulate.js';

const pct = (v: number): string => `${Number((v * 100).toFixed(2))}%`;

/** Conflicts visible from the bounds and bands alone (checked before any solve). */
export function arithmeticConflicts(m: LinearMandate): string[] {
  const n = m.assets.length;
  const out: string[] = [];
  for (let i = 0; i < n; i++)
    if (m.lb[i] > m.ub[i])
      out.push(
        `the ${m.upperSource[i] === 'liquidity-cap' ? 'liquidity cap' : 'upper bound'} of ${m.assets[i]} (${pct(m.ub[i])}) is below its lower bound (${pct(m.lb[i])})`,
      );
  let sumUb = 0;
  let sumLb = 0;
  for (let i = 0; i < n; i++) {
    sumUb += m.ub[i];
    sumLb += m.lb[i];
  }
  if (sumUb < 1 - 1e-12) out.push(`the per-asset upper bounds add to ${pct(sumUb)}, below the 100% invested`);
  if (sumLb > 1 + 1e-12) out.push(`the per-asset lower bounds add to ${pct(sumLb)}, above the 100% invested`);
  for (const r of m.inequalities) {
    const idx = r.row.idx;
    if (r.kind === 'group-min') {
      const caps = idx.map((i) => m.ub[i]);
      const total = caps.reduce((a, b) => a + b, 0);
      if (total < r.limit - 1e-12) {
        const same = caps.every((c) => c === caps[0]);
        out.push(
          `${r.name} band minimum ${pct(r.limit)} and the caps on its ${idx.length} member${idx.length === 1 ? '' : 's'} (${same ? `${pct(caps[0])} each` : `adding to ${pct(total)}`}) cannot both hold`,
        );
      }
    }
    if (r.kind === 'group-max' || r.kind === 'illiquid-max') {
      const floors = idx.map((i) => m.lb[i]);
      const total = floors.reduce((a, b) => a + b, 0);
      if (total > r.limit + 1e-12) {
        const what = r.kind === 'group-max' ? `${r.name} band maximum` : 'the illiquid cap';
        out.push(`${what} ${pct(r.limit)} is below the lower bounds of its members, which add to ${pct(total)}`);
      }
    }
  }
  return out;
}

/** Words for the constraints a phase-one certificate names. */
export function describeConflict(m: LinearMandate, f: Formulation, c: QpConflict): string {
  const parts = new Set<string>();
  const rowWords = (index: number): string | null => {
    const r = m.inequalities[index];
    switch (r.kind) {
      case 'group-max':
        return `${r.name} band maximum ${pct(r.limit)}`;
      case 'group-min':
        return `${r.name} band minimum ${pct(r.limit)}`;
      case 'illiquid-max':
        return `the illiquid cap of ${pct(r.limit)}`;
      case 'turnover':
        return `the ${pct(r.limit)} turnover limit`;
      case 'gross-exposure':
        return `the gross-exposure limit of ${pct(r.limit)}`;
      case 'turnover-link':
        return `the current holdings (turnover is measured from them)`;
      default:
        return null;
    }
  };
  const bound = (i: number, upper: boolean): string | null => {
    if (i >= m.assets.length) return null;
    if (upper)
      return `the ${m.upperSource[i] === 'liquidity-cap' ? 'liquidity cap' : 'cap'} of ${pct(m.ub[i])} on ${m.assets[i]}`;
    return m.lb[i] === 0 ? `no short position in ${m.assets[i]}` : `the floor of ${pct(m.lb[i])} on ${m.assets[i]}`;
  };
  for (const r of c.rowsA) {
    const p = f.rowsA[r];
    if (p?.type === 'equality') parts.add('100% invested');
    if (p?.type === 'numerator') parts.add('a positive expected return');
  }
  for (const r of c.rowsG) {
    const p = f.rowsG[r];
    const w =
      p.type === 'inequality'
        ? rowWords(p.index)
        : p.type === 'upper'
          ? bound(p.variable, true)
          : p.type === 'lower'
            ? bound(p.variable, false)
            : null;
    if (w) parts.add(w);
  }
  for (const i of c.upper) {
    const w = bound(i, true);
    if (w) parts.add(w);
  }
  for (const i of c.lower) {
    const w = bound(i, false);
    if (w) parts.add(w);
  }
  const list = [...parts];
  const shown = list.length > 8 ? [...list.slice(0, 8), `${list.length - 8} more`] : list;
  return `these limits cannot all hold: ${shown.join('; ')}`;
}
