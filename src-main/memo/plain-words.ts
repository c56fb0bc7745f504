import { mergedConstraints } from '../../shared-core/scenario/merged-constraints.js';
import type { Constraints, Scenario } from '../../shared-core/scenario/schema.js';
import { formatPct, listInWords } from '../../shared-core/present/format.js';

/** The scenario's settings in the sentences the memo prints (method and data, candidates). */

// Each method's words are part of its definition (shared-core/methods/).
export { estimatorShort, estimatorWords, objectiveWords } from '../../shared-core/present/method-words.js';

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
