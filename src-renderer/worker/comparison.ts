import { estimateCovariance, annualised } from '../../shared-core/estimators/registry.js';
import type { CovarianceEstimate } from '../../shared-core/estimators/types.js';
import type { Matrix } from '../../shared-core/linalg/matrix.js';
import type { CandidateResult } from '../../shared-core/optimise/result.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import type { EstimatorSpec } from '../../shared-core/scenario/estimator-spec.js';
import { createRunCache, type RunCache } from '../../shared-core/run/run-cache.js';
import { runScenario } from '../../shared-core/run/run-scenario.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';
import { clusterOrder } from '../../shared-core/analytics/cluster-order.js';
import { describeEstimator, specKey } from '../scenario/candidate-grid.js';
import {
  correlationFromCovariance,
  estimateDistance,
  volatilities,
  type EstimateDistance,
} from '../scenario/estimate-distance.js';

/**
 * Everything the comparison shows, computed off the page's thread: the shared core's run of every
 * candidate, and per distinct estimator its volatilities, correlations (with the heat map's
 * cluster order) and its distance from the sample estimate on the same returns.
 */
export interface EstimateView {
  key: string;
  label: string;
  spec: EstimatorSpec;
  /** Annualised volatility per asset, in `Comparison.assets` order. */
  volatilities: number[];
  /** N x N correlation, row-major. */
  correlation: number[];
  /** Heat-map order of the assets (indices into `Comparison.assets`). */
  order: number[];
  /** Against the sample covariance on the same returns. */
  distance: EstimateDistance;
  shrinkage: number | null;
  conditionNumber: number;
  effectiveObservations: number;
  /** The candidates that use this estimate. */
  candidateIds: string[];
}

export interface Comparison {
  assets: string[];
  candidates: CandidateResult[];
  estimates: EstimateView[];
  /** Candidate id -> the key of its estimate in `estimates`. */
  estimateOf: Record<string, string>;
  window: { first: string | null; last: string | null; observations: number; warnings: string[] };
  /** Time spent in the worker, in ms. */
  computeMs: number;
}

function text(warning: unknown): string {
  if (typeof warning === 'string') return warning;
  if (warning && typeof warning === 'object' && 'message' in warning)
    return String((warning as { message: unknown }).message);
  return JSON.stringify(warning);
}

/** Reorders an annualised covariance from its own asset order into `assets` order. */
function aligned(covariance: Matrix, from: readonly string[], assets: readonly string[]): Matrix {
  if (from.length === assets.length && from.every((a, i) => a === assets[i])) return covariance;
  const n = assets.length;
  const index = assets.map((a) => from.indexOf(a));
  const data = new Float64Array(n * n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j < n; j++) data[i * n + j] = covariance.data[index[i] * covariance.cols + index[j]];
  return { rows: n, cols: n, data };
}

/**
 * What a comparison leaves for the next one in the same worker: the core's run cache (returns,
 * estimates, active sets) and, per reused estimate, the views built from it. An edit that leaves
 * the returns' inputs alone then costs only the solves.
 */
export interface ComparisonCache {
  run: RunCache;
  views: WeakMap<
    CovarianceEstimate,
    { assets: string; sample: Matrix; view: Omit<EstimateView, 'candidateIds' | 'key' | 'label' | 'spec'> }
  >;
  sample?: { returns: object; periodsPerYear?: number; covariance: Matrix };
}

export function createComparisonCache(): ComparisonCache {
  return { run: createRunCache(), views: new WeakMap() };
}

export function buildComparison(
  scenario: Scenario,
  prices: PriceTable,
  fx?: PriceTable,
  now: () => number = () => performance.now(),
  cache: ComparisonCache = createComparisonCache(),
): Comparison {
  const t0 = now();
  const run = runScenario(scenario, prices, { ...(fx ? { fx } : {}), cache: cache.run });
  const assets = [...run.returns.assets];
  const n = assets.length;
  const context = { frequency: scenario.returns.frequency, periodsPerYear: scenario.periodsPerYear };

  // The sample estimate is the yardstick of "how far each estimate moves"; reuse it when a
  // candidate already has it, or when the returns are the ones it was computed on.
  const sampleCandidate = scenario.candidates.find((c) => c.estimator.method === 'sample');
  let sample: Matrix;
  if (sampleCandidate && run.estimates[sampleCandidate.id]) {
    const e = run.estimates[sampleCandidate.id];
    sample = aligned(e.covariance, e.assets, assets);
  } else if (cache.sample?.returns === run.returns && cache.sample.periodsPerYear === scenario.periodsPerYear) {
    sample = cache.sample.covariance;
  } else {
    sample = annualised(estimateCovariance(run.returns.returns, { method: 'sample' }, context));
    cache.sample = { returns: run.returns, periodsPerYear: scenario.periodsPerYear, covariance: sample };
  }

  const byKey = new Map<string, EstimateView>();
  const estimateOf: Record<string, string> = {};
  for (const candidate of scenario.candidates) {
    const key = specKey(candidate.estimator);
    estimateOf[candidate.id] = key;
    const existing = byKey.get(key);
    if (existing) {
      existing.candidateIds.push(candidate.id);
      continue;
    }
    const entry = run.estimates[candidate.id];
    if (!entry) continue;
    const estimate: CovarianceEstimate = entry.estimate;
    const assetKey = assets.join('\u0000');
    let built = cache.views.get(estimate);
    if (!built || built.assets !== assetKey || built.sample !== sample) {
      const covariance = aligned(entry.covariance, entry.assets, assets);
      const correlation = correlationFromCovariance(covariance);
      built = {
        assets: assetKey,
        sample,
        view: {
          volatilities: volatilities(covariance),
          correlation: Array.from(correlation),
          order: clusterOrder(correlation, n),
          distance: estimateDistance(sample, covariance),
          shrinkage: estimate.diagnostics.shrinkage,
          conditionNumber: estimate.diagnostics.conditionNumber,
          effectiveObservations: estimate.diagnostics.effectiveObservations,
        },
      };
      cache.views.set(estimate, built);
    }
    byKey.set(key, {
      key,
      label: describeEstimator(candidate.estimator),
      spec: candidate.estimator,
      ...built.view,
      candidateIds: [candidate.id],
    });
  }
  const dates = run.returns.dates;
  return {
    assets,
    candidates: run.candidates,
    estimates: [...byKey.values()],
    estimateOf,
    window: {
      first: dates[0] ?? null,
      last: dates[dates.length - 1] ?? null,
      observations: dates.length,
      warnings: (run.returns.warnings as readonly unknown[]).map(text),
    },
    computeMs: now() - t0,
  };
}
