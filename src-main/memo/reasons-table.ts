import { objectiveDefinition, type ObjectiveSpec } from '../../shared-core/methods/objective-registry.js';
import type { AssetExplanation, SolvedCandidate } from '../../shared-core/optimise/result.js';
import { formatFixed, formatPct } from '../../shared-core/present/format.js';

/**
 * The appendix's reasons as a table, one row per asset and the figures in columns: the solver's
 * per-asset explanation (shared-core/optimise/explain.ts) read from its numbers, not its
 * sentences, so thirty assets take thirty lines instead of three pages of near-identical prose.
 * The rule the figures obey is said once, above the table, in the objective's own words (its
 * definition's `optimality`).
 */
export interface ReasonsTable {
  /** The optimality condition behind the two figure columns, in one sentence; null for rule-based weights. */
  rule: string | null;
  /** Headers of the figure and threshold columns; null when the objective has no such figure. */
  measureHeader: string | null;
  thresholdHeader: string | null;
  rows: ReasonRow[];
}

export interface ReasonRow {
  asset: string;
  weight: number;
  /** Where the asset sits: "at its cap", "held", "left out", with the binding band when one applies. */
  position: string;
  measure: string;
  threshold: string;
}

function position(a: AssetExplanation, liquidityCap: boolean): string {
  const binds = a.limitBinding ? `; ${a.limitBinding.replace(/^the /, '')}` : '';
  switch (a.reason) {
    case 'at-upper-bound':
      return `at its ${liquidityCap ? 'liquidity cap' : 'cap'}${binds}`;
    case 'at-lower-bound':
      return `at its floor${binds}`;
    case 'excluded':
      return `left out${binds}`;
    default:
      return `held${binds}`;
  }
}

/** Held assets by weight, then those left out; null when the solver gave no explanation. */
export function reasonsTable(candidate: SolvedCandidate, objective: ObjectiveSpec | undefined): ReasonsTable | null {
  const ex = candidate.explanations;
  if (!ex || ex.assets.length === 0) return null;
  const words = objective ? objectiveDefinition(objective.method).optimality : undefined;
  const format = (x: number | undefined) =>
    words && x !== undefined
      ? words.percentDigits !== undefined
        ? formatPct(x, undefined, words.percentDigits)
        : formatFixed(x, 2)
      : '\u2013';
  const held = ex.assets
    .filter((a) => Math.abs(a.weight) >= 0.0005)
    .sort((a, b) => b.weight - a.weight || (a.asset < b.asset ? -1 : 1));
  const out = ex.assets.filter((a) => Math.abs(a.weight) < 0.0005);
  return {
    rule: words?.rule ?? null,
    measureHeader: words?.measure ?? null,
    thresholdHeader: words?.threshold ?? null,
    rows: [...held, ...out].map((a) => ({
      asset: a.asset,
      weight: a.weight,
      position: position(a, a.text.includes('liquidity cap')),
      measure: format(a.measure),
      threshold: format(a.threshold),
    })),
  };
}
