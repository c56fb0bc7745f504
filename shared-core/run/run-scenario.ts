/**
 * A whole scenario: returns once, each distinct estimator once, then every candidate through
 * solveCandidate. The command line, the app's worker, the memo and walk-forward share it.
 */
import { InputError } from '../errors.js';
import { annualised, estimateCovariance } from '../estimators/registry.js';
import { centredMoments } from '../estimators/moments.js';
import type { CentredMoments, CovarianceEstimate, EstimateContext } from '../estimators/types.js';
import type { Matrix } from '../linalg/matrix.js';
import { tridiagonalForm, type TridiagonalForm } from '../linalg/tridiagonal-form.js';
import type { QpWarmStart } from '../optimise/qp/index.js';
import type { CandidateResult } from '../optimise/result.js';
import { objectiveComputation } from '../optimise/objectives/index.js';
import { solveCandidateDetailed } from '../optimise/solve-candidate.js';
import type { PriceTable } from '../prices/price-table.js';
import { buildReturns, type BuildReturnsOptions, type ReturnsResult } from '../returns/build-returns.js';
import { CancelledError, type CancelCheck } from '../stability/cancel.js';
import { mergedConstraints } from '../scenario/merged-constraints.js';
import { createRunCache, samePrices, type RunCache } from './run-cache.js';
import type { Constraints, Scenario } from '../scenario/schema.js';

export interface RunScenarioOptions {
  /** Active sets of an earlier run, by candidate id (walk-forward, live recompute). */
  warmStarts?: Record<string, QpWarmStart>;
  /** Polled between steps; a true answer stops the run with CancelledError (nothing partial). */
  shouldCancel?: CancelCheck;
  /** Maps an asset and date to a place in the price file, for error messages. */
  locate?: BuildReturnsOptions['locate'];
  fx?: PriceTable;
  /**
   * The previous run's returns, estimates and active sets, reused where their inputs are
   * unchanged (run-cache.ts); updated by this run. Explicit `warmStarts` take precedence.
   */
  cache?: RunCache;
}

export interface CandidateEstimate {
  assets: string[];
  /** Annualised covariance in the order of `assets`. */
  covariance: Matrix;
  estimate: CovarianceEstimate;
}

export interface ScenarioRun {
  candidates: CandidateResult[];
  estimates: Record<string, CandidateEstimate>;
  returns: ReturnsResult;
  warmStarts: Record<string, QpWarmStart>;
}

function checkAssets(c: Constraints | undefined, known: Set<string>, path: string): void {
  if (!c) return;
  for (const key of Object.keys(c.weightBounds ?? {}))
    if (key !== 'default' && !known.has(key))
      throw new InputError(`unknown asset '${key}' (not among the scenario's assets)`, {
        path: `${path}.weightBounds.${key}`,
      });
  c.groups?.forEach((g, i) =>
    g.members.forEach((m, k) => {
      if (!known.has(m))
        throw new InputError(`unknown asset '${m}' in group '${g.name}'`, {
          path: `${path}.groups[${i}].members[${k}]`,
        });
    }),
  );
}

function yearsBefore(date: string, years: number): string {
  const [y, m, d] = date.split('-').map(Number);
  const whole = Math.floor(years);
  const months = Math.round((years - whole) * 12);
  const t = new Date(Date.UTC(y - whole, m - 1 - months, d));
  return t.toISOString().slice(0, 10);
}

export function runScenario(scenario: Scenario, prices: PriceTable, options: RunScenarioOptions = {}): ScenarioRun {
  const cancel = () => {
    if (options.shouldCancel?.()) throw new CancelledError();
  };
  const span = scenario.window;
  const to = span?.to;
  const from =
    span?.from ??
    (span?.years !== undefined ? yearsBefore(to ?? prices.dates[prices.dates.length - 1], span.years) : undefined);
  const returnsOptions = {
    assets: scenario.assets,
    from,
    to,
    frequency: scenario.returns.frequency,
    method: scenario.returns.method,
    maxFillDays: scenario.returns.maxFillDays,
    baseCurrency: scenario.baseCurrency,
  };
  const memo = options.cache ?? createRunCache();
  const returnsKey = JSON.stringify(returnsOptions);
  const reuse =
    memo.returns !== undefined &&
    memo.returnsKey === returnsKey &&
    samePrices(memo.prices, prices) &&
    samePrices(memo.fx, options.fx);
  if (!reuse) {
    const built = buildReturns(prices, { ...returnsOptions, fx: options.fx, locate: options.locate });
    Object.assign(memo, { prices, fx: options.fx, returnsKey, returns: built });
    memo.estimates.clear();
    memo.forms.clear();
  }
  const returns = memo.returns!;
  const assets = returns.assets;
  const known = new Set(assets);
  checkAssets(scenario.constraints, known, 'constraints');
  scenario.candidates.forEach((c, i) => {
    checkAssets(c.constraints, known, `candidates[${i}].constraints`);
    objectiveComputation(c.objective).checkInputs?.(c.objective, {
      assets,
      expectedReturns: scenario.expectedReturns,
      path: `candidates[${i}].objective`,
    });
  });

  // One reduction per estimate serves its exact condition number and the effective bets of every
  // candidate that shares it (the bets do not change when the covariance is annualised).
  const forms = memo.forms;
  const reduceOnce = (m: Matrix): TridiagonalForm => {
    let form = forms.get(m);
    if (!form) forms.set(m, (form = tridiagonalForm(m)));
    return form;
  };
  // One cross product of the de-meaned returns serves every estimator built on the sample covariance.
  let moments: { of: Matrix; value: CentredMoments } | undefined;
  const momentsOnce = (x: Matrix): CentredMoments => {
    if (moments?.of !== x) moments = { of: x, value: centredMoments(x) };
    return moments.value;
  };
  const context: EstimateContext = {
    frequency: returns.frequency,
    periodsPerYear: scenario.periodsPerYear,
    tridiagonalise: reduceOnce,
    centredMoments: momentsOnce,
  };
  const estimateKey = (c: Scenario['candidates'][number]) =>
    `${JSON.stringify(c.estimator)}|${scenario.periodsPerYear ?? ''}`;
  const cache = memo.estimates;
  const candidates: CandidateResult[] = [];
  const estimates: Record<string, CandidateEstimate> = {};
  const warmStarts: Record<string, QpWarmStart> = {};
  for (const c of scenario.candidates) {
    cancel();
    const key = estimateKey(c);
    let entry = cache.get(key);
    if (!entry) {
      const estimate = estimateCovariance(returns.returns, c.estimator, context);
      entry = { estimate, covariance: annualised(estimate) };
      cache.set(key, entry);
    }
    estimates[c.id] = { assets, covariance: entry.covariance, estimate: entry.estimate };
    cancel();
    const perPeriod = entry.estimate.covariance;
    const diagnostics = entry.estimate.diagnostics;
    const solved = solveCandidateDetailed({
      id: c.id,
      label: c.label,
      assets,
      covariance: entry.covariance,
      objective: c.objective,
      constraints: mergedConstraints(scenario.constraints, c.constraints),
      current: scenario.current,
      expectedReturns: scenario.expectedReturns,
      assetInfo: scenario.assetInfo,
      conditionNumber: diagnostics.conditionNumber,
      spectrum: () => reduceOnce(perPeriod),
      observations: entry.estimate.diagnostics.observations,
      estimator: c.estimator.method,
      warmStart: options.warmStarts ? options.warmStarts[c.id] : memo.warmStarts[c.id],
      shouldCancel: options.shouldCancel,
    });
    cancel();
    candidates.push(solved.result);
    if (solved.warmStart) warmStarts[c.id] = solved.warmStart;
  }
  // Keep only what this scenario used: an editor field typed digit by digit (a half-life, a
  // lambda) would otherwise leave one N x N estimate and its reduction behind per value.
  const used = new Set(scenario.candidates.map(estimateKey));
  for (const [key, entry] of memo.estimates)
    if (!used.has(key)) {
      memo.estimates.delete(key);
      memo.forms.delete(entry.estimate.covariance);
    }
  memo.warmStarts = warmStarts;
  return { candidates, estimates, returns, warmStarts };
}
