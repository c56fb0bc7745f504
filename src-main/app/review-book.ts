import { diversificationRatio, portfolioVolatility } from '../../shared-core/analytics/risk.js';
import { InputError } from '../../shared-core/errors.js';
import type { Matrix } from '../../shared-core/linalg/matrix.js';
import {
  attentionReasons,
  DEFAULT_DRIFT_TOLERANCE,
  type MemoFreshness,
  type RiskPair,
} from '../../shared-core/review/attention.js';
import { mandateBreaches } from '../../shared-core/review/breaches.js';
import { driftFrom } from '../../shared-core/review/drift.js';
import { mergedConstraints } from '../../shared-core/scenario/merged-constraints.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';
import type { ReviewRow } from '../../shared-core/review/review-row.js';
import type { HouseholdRecord, Revision, ScenarioRecord, Store } from '../store/store.js';
import { runScenarioInputs } from './run-scenario.js';
import { holdingWeights, storedScenarioInputs } from './stored-scenario.js';

/**
 * The book review: for every household, the recommendation it follows, how far its holdings
 * have drifted from it, the risk of the holdings and of the recommendation on the latest prices
 * beside their figures at the revision's date, the mandate limits the holdings break and whether
 * the last memo is out of date. One use case behind `holdfast review`, the service and the book
 * screen, so they agree; it reads the store and writes nothing.
 *
 * "At the revision's date" is the same run on the prices the store holds up to the day the
 * revision was saved: the recommendation as the advisor saw it, recomputed exactly, so nothing
 * needs to be stored beside the revision.
 */
export type { ReviewRow };

export interface ReviewOptions {
  /** Re-solve each recommended candidate on the latest prices and report how far the optimum moved. */
  resolve?: boolean;
  /** Called after each household. */
  onProgress?: (done: number, total: number, household: string) => void;
}

export interface BookReview {
  rows: ReviewRow[];
  dataVersion: number;
}

export function reviewBook(store: Store, options: ReviewOptions = {}): BookReview {
  const households = store.listHouseholds();
  const rows = households.map((h, i) => {
    const row = reviewHousehold(store, h, options);
    options.onProgress?.(i + 1, households.length, h.name);
    return row;
  });
  return { rows, dataVersion: store.dataVersion() };
}

/** The scenario a household follows: among those whose newest revision recommends a candidate, the one last printed, else the one last saved. */
function followedScenario(store: Store, householdId: number): { record: ScenarioRecord; revision: Revision } | null {
  let best: { record: ScenarioRecord; revision: Revision; key: string } | null = null;
  for (const record of store.listScenarios(householdId)) {
    const revision = store.getRevision(record.id);
    if (!revision || revision.document.recommended === undefined) continue;
    const printed = store.listMemos(record.id).reduce((t, m) => (m.printedAt > t ? m.printedAt : t), '');
    const key = `${printed ? 1 : 0}|${printed}|${revision.savedAt}`;
    if (!best || key > best.key) best = { record, revision, key };
  }
  return best && { record: best.record, revision: best.revision };
}

function memoFreshness(
  store: Store,
  householdId: number,
  scenarioId: number,
  revision: Revision,
): MemoFreshness | null {
  const memos = store.listMemos(scenarioId);
  if (memos.length === 0) return null;
  const last = memos.reduce((a, b) => (b.printedAt > a.printedAt ? b : a));
  const holdingsChanged = store
    .auditLog({ entity: 'holdings', entityId: householdId })
    .some((e) => e.at > last.printedAt);
  const draft = store.getDraft(scenarioId);
  return {
    printedAt: last.printedAt,
    changedSince: {
      prices: store.dataVersion() > last.dataVersion,
      holdings: holdingsChanged,
      scenario: last.revisionHash !== revision.hash || (draft !== undefined && draft.savedAt > last.printedAt),
    },
  };
}

/** Volatility and diversification ratio of weights given by asset, on an annualised covariance. */
function riskOf(weights: Readonly<Record<string, number>>, assets: readonly string[], covariance: Matrix): RiskPair {
  const w = assets.map((a) => weights[a] ?? 0);
  return { volatility: portfolioVolatility(w, covariance), diversificationRatio: diversificationRatio(w, covariance) };
}

/** The scenario reduced to its recommended candidate, computed on prices up to `to` (inclusive) when given. */
function recommendedOnly(scenario: Scenario, candidate: string, to?: string): Scenario {
  const own = scenario.window?.to;
  const window =
    to === undefined ? scenario.window : { ...scenario.window, to: own !== undefined && own < to ? own : to };
  return {
    ...scenario,
    ...(window ? { window } : {}),
    candidates: scenario.candidates.filter((c) => c.id === candidate),
  };
}

function problemText(error: unknown): string {
  if (error instanceof InputError) return `cannot be computed: ${error.message}`;
  throw error;
}

export function reviewHousehold(store: Store, household: HouseholdRecord, options: ReviewOptions = {}): ReviewRow {
  const held = store.holdings(household.id);
  const review = store.householdReview(household.id);
  const base: Omit<ReviewRow, 'status' | 'reasons' | 'figures' | 'memo' | 'followed'> = {
    householdId: String(household.id),
    household: household.name,
    baseCurrency: household.baseCurrency,
    tolerance: review.driftTolerance ?? DEFAULT_DRIFT_TOLERANCE,
    note: review.note,
    reviewedAt: review.reviewedAt,
    holdings: held.length,
  };
  const followed = followedScenario(store, household.id);
  if (!followed)
    return {
      ...base,
      followed: null,
      figures: null,
      memo: null,
      status: 'attention',
      reasons: ['no saved scenario recommends a candidate'],
    };
  const { record, revision } = followed;
  const candidate = revision.document.recommended as string;
  const follows: NonNullable<ReviewRow['followed']> = {
    scenarioId: String(record.id),
    scenario: record.name,
    revision: revision.number,
    revisionHash: revision.hash,
    savedAt: revision.savedAt,
    candidate,
    baseCurrency: revision.document.baseCurrency,
  };
  const memo = memoFreshness(store, household.id, record.id, revision);
  let figures: ReviewRow['figures'] = null;
  let problem: string | null = null;
  if (held.length > 0) {
    try {
      figures = computeFigures(store, household, record, candidate, revision.savedAt.slice(0, 10), options);
    } catch (error) {
      problem = problemText(error);
    }
  }
  const reasons = attentionReasons({
    tolerance: base.tolerance,
    drift: figures?.drift ?? null,
    breaches: figures?.breaches ?? [],
    currentRisk: figures?.currentRisk ?? null,
    memo,
    problem,
    hasHoldings: held.length > 0,
  });
  return {
    ...base,
    followed: follows,
    figures,
    memo,
    status: problem !== null ? 'cannot-compute' : reasons.length > 0 ? 'attention' : 'ok',
    reasons,
  };
}

function computeFigures(
  store: Store,
  household: HouseholdRecord,
  record: ScenarioRecord,
  candidate: string,
  savedDay: string,
  options: ReviewOptions,
): NonNullable<ReviewRow['figures']> {
  const stored = storedScenarioInputs(store, household.name, record.name);
  const scenario = stored.scenario;
  const assets = stored.prices.assets;
  const weights = holdingWeights(store, household, scenario.baseCurrency, new Set(assets));
  if (!weights) throw new InputError('no holdings on file');
  const inputs = {
    prices: stored.prices,
    ...(stored.fx ? { fx: stored.fx } : {}),
    names: { scenario: stored.label, prices: store.path },
    fromStore: true,
  };
  const run = (s: Scenario) => {
    const result = runScenarioInputs({ ...inputs, scenario: s });
    const solved = result.candidates[0];
    return { result, solved, estimate: result.estimates[candidate] };
  };
  const then = run(recommendedOnly(scenario, candidate, savedDay));
  const thenSolved = then.solved;
  if (thenSolved.status !== 'optimal')
    throw new InputError(`the recommended candidate '${candidate}' ends ${thenSolved.status}: ${thenSolved.message}`);
  const target = thenSolved.weights;
  // No price after the revision's day: the latest run is the same run.
  const latest = stored.prices.dates[stored.prices.dates.length - 1];
  const now = latest !== undefined && latest <= savedDay ? then : run(recommendedOnly(scenario, candidate));
  const mandate = mergedConstraints(
    scenario.constraints,
    scenario.candidates.find((c) => c.id === candidate)?.constraints,
  );
  const figures: NonNullable<ReviewRow['figures']> = {
    target,
    current: weights,
    drift: driftFrom(weights, target),
    currentRisk: {
      then: riskOf(weights, then.estimate.assets, then.estimate.covariance),
      now: riskOf(weights, now.estimate.assets, now.estimate.covariance),
    },
    recommendedRisk: {
      then: riskOf(target, then.estimate.assets, then.estimate.covariance),
      now: riskOf(target, now.estimate.assets, now.estimate.covariance),
    },
    breaches: mandateBreaches(assets, mandate, scenario.assetInfo, weights),
  };
  if (options.resolve) {
    const s = now.solved;
    if (s.status === 'optimal') {
      const moved = driftFrom(s.weights, target).total;
      figures.resolved = {
        status: 'optimal',
        moved,
        diversificationRatioChange: s.metrics.diversificationRatio - figures.recommendedRisk.now.diversificationRatio,
      };
    } else figures.resolved = { status: 'not-solved', message: `${s.status}: ${s.message}` };
  }
  return figures;
}
