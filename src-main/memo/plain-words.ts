import type { EstimatorSpec } from '../../shared-core/scenario/estimator-spec.js';
import type { ObjectiveSpec } from '../../shared-core/scenario/objective-spec.js';
import { mergedConstraints } from '../../shared-core/run/run-scenario.js';
import type { Constraints, Scenario } from '../../shared-core/scenario/schema.js';
import { formatPct, listInWords } from '../../shared-core/present/format.js';

/** The scenario's settings in the sentences the memo prints (method and data, candidates). */

export const OBJECTIVE_WORDS: Record<ObjectiveSpec['method'], string> = {
  'max-diversification': 'maximum diversification',
  'min-variance': 'minimum variance',
  'equal-risk-contribution': 'equal risk contribution',
  'max-decorrelation': 'maximum decorrelation',
  'max-sharpe': 'maximum Sharpe ratio',
  'inverse-volatility': 'inverse volatility',
  'equal-weight': 'equal weights',
};

export function objectiveWords(objective: ObjectiveSpec): string {
  if (objective.method === 'equal-risk-contribution' && objective.budgets) return 'risk budgets (set by the advisor)';
  return OBJECTIVE_WORDS[objective.method];
}

const TARGET_WORDS = {
  'scaled-identity': 'a scaled identity',
  'constant-correlation': 'constant correlation',
  'single-index': 'a single-index model',
} as const;

export function estimatorWords(estimator: EstimatorSpec): string {
  switch (estimator.method) {
    case 'sample':
      return 'sample covariance';
    case 'ewma':
      if (estimator.halfLife !== undefined) return `exponentially weighted (half-life ${estimator.halfLife} periods)`;
      return estimator.lambda !== undefined
        ? `exponentially weighted (lambda ${estimator.lambda})`
        : 'exponentially weighted (default lambda)';
    case 'ledoit-wolf':
      return `Ledoit-Wolf shrinkage towards ${TARGET_WORDS[estimator.target ?? 'scaled-identity']}`;
    case 'oas':
      return 'oracle approximating shrinkage (OAS)';
    case 'denoised':
      return 'random-matrix denoised covariance';
    case 'robust':
      return 'robust covariance';
    case 'nonlinear':
      return 'analytical nonlinear shrinkage of the eigenvalues (Ledoit and Wolf 2020)';
  }
}

/** The estimator in a few words, for table cells. */
export function estimatorShort(estimator: EstimatorSpec): string {
  switch (estimator.method) {
    case 'sample':
      return 'sample';
    case 'ewma':
      return estimator.halfLife !== undefined
        ? `EWMA, half-life ${estimator.halfLife}`
        : estimator.lambda !== undefined
          ? `EWMA, lambda ${estimator.lambda}`
          : 'EWMA';
    case 'ledoit-wolf':
      return estimator.target && estimator.target !== 'scaled-identity'
        ? `Ledoit-Wolf, ${estimator.target}`
        : 'Ledoit-Wolf';
    case 'oas':
      return 'OAS';
    case 'denoised':
      return 'denoised';
    case 'robust':
      return 'robust';
    case 'nonlinear':
      return 'nonlinear shrinkage';
  }
}

/** The limits of a candidate, one sentence each. `name` turns asset ids into printed names. */
export function constraintSentences(
  constraints: Constraints,
  current: Scenario['current'],
  name: (asset: string) => string,
): string[] {
  const out: string[] = [];
  const longOnly = constraints.longOnly !== false;
  out.push(longOnly ? 'Long only: no short positions.' : 'Short positions are allowed.');
  const bounds = constraints.weightBounds ?? {};
  if (bounds.default)
    out.push(`Each asset between ${formatPct(bounds.default[0])} and ${formatPct(bounds.default[1])} unless listed.`);
  for (const [asset, [lo, hi]] of Object.entries(bounds).sort(([a], [b]) => (a < b ? -1 : 1))) {
    if (asset === 'default') continue;
    out.push(`${name(asset)} between ${formatPct(lo)} and ${formatPct(hi)}.`);
  }
  for (const g of constraints.groups ?? []) {
    const range =
      g.min !== undefined && g.max !== undefined
        ? `between ${formatPct(g.min)} and ${formatPct(g.max)}`
        : g.min !== undefined
          ? `at least ${formatPct(g.min)}`
          : g.max !== undefined
            ? `at most ${formatPct(g.max)}`
            : 'without a band';
    out.push(`${g.name} (${listInWords(g.members.map(name))}) ${range} in total.`);
  }
  if (constraints.maxTurnover !== undefined)
    out.push(
      current
        ? `Turnover from the current holdings at most ${formatPct(constraints.maxTurnover)} (sum of absolute weight changes).`
        : `Turnover at most ${formatPct(constraints.maxTurnover)}, but the scenario gives no current holdings to measure it from.`,
    );
  if (constraints.maxGrossExposure !== undefined)
    out.push(`Gross exposure (sum of absolute weights) at most ${formatPct(constraints.maxGrossExposure)}.`);
  if (constraints.illiquidMax !== undefined)
    out.push(`Assets tagged illiquid at most ${formatPct(constraints.illiquidMax)} in total.`);
  if (constraints.minPosition !== undefined)
    out.push(
      `Each position either 0 or at least ${formatPct(constraints.minPosition)}, found by a heuristic (the smallest position below it is left out and the candidate solved again), not a proven optimum.`,
    );
  return out;
}

/** The limits a candidate was solved under: the scenario's, with the candidate's own replacing them (runScenario's rule). */
export function effectiveConstraints(scenario: Scenario, candidateId: string): Constraints {
  return mergedConstraints(scenario.constraints, scenario.candidates.find((c) => c.id === candidateId)?.constraints);
}
