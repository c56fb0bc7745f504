import type { AssetExplanation, CandidateResult } from '../../shared-core/optimise/result.js';
import type { ObjectiveSpec } from '../../shared-core/scenario/objective-spec.js';
import { formatFixed, formatPct } from '../../shared-core/present/format.js';

/**
 * The appendix's reasons as a table, one row per asset and the figures in columns: the solver's
 * per-asset explanation (shared-core/optimise/explain.ts) read from its numbers, not its
 * sentences, so thirty assets take thirty lines instead of three pages of near-identical prose.
 * The rule the figures obey is said once, above the table (`rule`).
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

interface Figures {
  rule: string;
  measure: string;
  threshold: string;
  format: (x: number) => string;
}

const two = (x: number) => formatFixed(x, 2);
const pct2 = (x: number) => `${formatFixed(x * 100, 2)}%`;

/**
 * What each objective's optimality condition compares (explain.ts states and cites each):
 * maximum diversification after Choueifaty, Froidure and Reynier (2013); minimum variance and
 * maximum decorrelation from their first-order conditions (common practice).
 */
function figuresFor(method: ObjectiveSpec['method']): Figures | null {
  switch (method) {
    case 'max-diversification':
      return {
        rule: 'At the most diversified portfolio an asset held between its limits has a correlation with the portfolio equal to its threshold (1/DR when no limit binds; binding caps and bands move each asset\u2019s own); an asset left out has at least its threshold, one at its cap at most.',
        measure: 'Correlation with portfolio',
        threshold: 'Threshold',
        format: two,
      };
    case 'min-variance':
      return {
        rule: 'At the minimum-variance portfolio an asset held between its limits has a beta to the portfolio equal to its threshold (1 when no limit binds); an asset left out has at least its threshold, one at its cap at most.',
        measure: 'Beta to portfolio',
        threshold: 'Threshold',
        format: two,
      };
    case 'max-decorrelation':
      return {
        rule: 'At the most decorrelated portfolio an asset held between its limits has a beta to the portfolio, measured on the correlation matrix, equal to its threshold (1 when no limit binds); an asset left out has at least its threshold.',
        measure: 'Beta on correlations',
        threshold: 'Threshold',
        format: two,
      };
    case 'equal-risk-contribution':
      return {
        rule: 'Each asset\u2019s share of the portfolio\u2019s risk is set to its budget unless a limit holds it elsewhere.',
        measure: 'Share of risk',
        threshold: 'Budget',
        format: formatPct,
      };
    case 'max-sharpe':
      return {
        rule: 'At the highest Sharpe ratio an asset held between its limits earns exactly the expected return its beta to the portfolio asks; one left out earns at most that.',
        measure: 'Expected return',
        threshold: 'Asked by its beta',
        format: pct2,
      };
    case 'inverse-volatility':
    case 'equal-weight':
      return null;
  }
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

/** The rows in the order given (the memo passes held assets by weight, then those left out). */
export function reasonsTable(candidate: CandidateResult, objective: ObjectiveSpec | undefined): ReasonsTable | null {
  const ex = candidate.explanations;
  if (!ex || ex.assets.length === 0) return null;
  const figures = objective ? figuresFor(objective.method) : null;
  const held = ex.assets
    .filter((a) => Math.abs(a.weight) >= 0.0005)
    .sort((a, b) => b.weight - a.weight || (a.asset < b.asset ? -1 : 1));
  const out = ex.assets.filter((a) => Math.abs(a.weight) < 0.0005);
  return {
    rule: figures?.rule ?? null,
    measureHeader: figures?.measure ?? null,
    thresholdHeader: figures?.threshold ?? null,
    rows: [...held, ...out].map((a) => ({
      asset: a.asset,
      weight: a.weight,
      position: position(a, a.text.includes('liquidity cap')),
      measure: figures && a.measure !== undefined ? figures.format(a.measure) : '\u2013',
      threshold: figures && a.threshold !== undefined ? figures.format(a.threshold) : '\u2013',
    })),
  };
}
