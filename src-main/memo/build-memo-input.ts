import { metricsFor } from '../../shared-core/analytics/weights-metrics.js';
import { InputError } from '../../shared-core/errors.js';
import type { CovarianceEstimate } from '../../shared-core/estimators/types.js';
import type { Matrix } from '../../shared-core/linalg/matrix.js';
import type { CandidateResult, OptimalCandidate } from '../../shared-core/optimise/result.js';
import type { ReturnsResult } from '../../shared-core/returns/build-returns.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';
import type { MemoData, MemoInput, MemoPosition, MemoStability, MemoStress, MemoWalkForward } from './memo-input.js';
import { estimatorWords } from './plain-words.js';

/**
 * What the memo needs from a scenario run: the candidates, the estimate each used (annualised
 * covariance in its asset order) and the returns. This is the shape of `runScenario`'s result
 * (shared-core/run/run-scenario.ts), written structurally so the memo depends on the fields
 * it reads and nothing more.
 */
export interface MemoRunSource {
  candidates: readonly CandidateResult[];
  estimates: Readonly<
    Record<string, { assets: readonly string[]; covariance: Matrix; estimate: CovarianceEstimate } | undefined>
  >;
  returns: Pick<ReturnsResult, 'dates' | 'warnings'>;
}

export interface BuildMemoOptions {
  scenario: Scenario;
  revision: { number: number; hash: string };
  run: MemoRunSource;
  household: { name: string; baseCurrency: string; holdings?: { asOf: string | null; positions: MemoPosition[] } };
  preparedBy: string;
  createdOn: string;
  lot: number;
  data: MemoData;
  /** Defaults to the scenario's `recommended`, else the solved candidate with the highest DR. */
  recommended?: string;
  rationale?: string;
  walkForward?: MemoWalkForward;
  stability?: MemoStability;
  stress?: MemoStress;
}

/** The figures of given weights: one function for the memo and the screens (shared-core). */
export { metricsFor };

export function chooseRecommended(scenario: Scenario, candidates: readonly CandidateResult[]): string {
  if (scenario.recommended) return scenario.recommended;
  const solved = candidates.filter((c): c is OptimalCandidate => c.status === 'optimal');
  if (solved.length === 0)
    throw new InputError('no candidate of the scenario could be solved, so there is nothing to recommend', {
      path: 'candidates',
    });
  return [...solved].sort((a, b) => b.metrics.diversificationRatio - a.metrics.diversificationRatio)[0].id;
}

export function buildMemoInput(o: BuildMemoOptions): MemoInput {
  const recommended = o.recommended ?? chooseRecommended(o.scenario, o.run.candidates);
  const est = o.run.estimates[recommended];
  if (!est) throw new InputError(`the run has no estimate for candidate '${recommended}'`, { path: 'recommended' });
  const spec = o.scenario.candidates.find((c) => c.id === recommended);

  // Current weights: the holdings when there are amounts, else the scenario's `current`.
  let current: Record<string, number> | null = null;
  const positions = o.household.holdings?.positions;
  if (positions && positions.length > 0) {
    const total = positions.reduce((s, p) => s + p.amount, 0);
    if (total > 0) {
      current = {};
      for (const p of positions) current[p.asset] = (current[p.asset] ?? 0) + p.amount / total;
    }
  } else if (o.scenario.current) current = { ...o.scenario.current };
  const known = new Set(est.assets);
  const currentMetrics =
    current && Object.keys(current).every((a) => known.has(a)) && Object.values(current).some((x) => x !== 0)
      ? metricsFor(current, est.assets, est.covariance)
      : null;

  const dates = o.run.returns.dates;
  return {
    household: o.household,
    preparedBy: o.preparedBy,
    createdOn: o.createdOn,
    scenario: { name: o.scenario.name, revision: o.revision.number, hash: o.revision.hash, document: o.scenario },
    run: {
      candidates: o.run.candidates,
      estimate: {
        assets: est.assets,
        covariance: est.covariance,
        method: spec ? estimatorWords(spec.estimator) : est.estimate.method,
        shrinkage: est.estimate.diagnostics.shrinkage,
        observations: est.estimate.diagnostics.observations,
        conditionNumber: est.estimate.diagnostics.conditionNumber,
      },
      returns: {
        from: dates[0] ?? '',
        to: dates[dates.length - 1] ?? '',
        observations: dates.length,
        warnings: o.run.returns.warnings,
      },
    },
    recommended,
    ...(o.rationale ? { rationale: o.rationale } : {}),
    currentMetrics,
    ...(o.walkForward ? { walkForward: o.walkForward } : {}),
    ...(o.stability ? { stability: o.stability } : {}),
    ...(o.stress ? { stress: o.stress } : {}),
    data: o.data,
    lot: o.lot,
  };
}
