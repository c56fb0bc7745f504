import { InputError } from '../errors.js';
import { PERIODS_PER_YEAR } from '../scenario/frequency.js';
import type { Matrix } from '../linalg/matrix.js';
import type { PriceTable } from '../prices/price-table.js';
import { buildReturns, DEFAULT_MAX_FILL_DAYS, type ReturnsResult } from '../returns/build-returns.js';
import { inBaseCurrency } from '../returns/exchange-rate.js';
import { dayNumber, pricingFrequency } from '../returns/calendar.js';
import { backtestSpecSchema, defaultEstimationWindow, type BacktestSpec } from '../scenario/backtest-spec.js';
import type { Candidate, Scenario } from '../scenario/schema.js';
import { drain, drainAsync, throwIfCancelled, type CancelCheck } from '../stability/cancel.js';
import { weightStabilitySteps, type WeightStability } from '../stability/weight-bands.js';
import { stressViews, type StressViews } from '../stress/stress-views.js';
import { assetSets, distinctBases, resolveTarget, type AssetSet } from '../stress/targets.js';
import { costRates } from './costs.js';
import { walkForwardSteps } from './engine.js';
import { walkForwardMetrics, type WalkForwardMetrics } from './metrics.js';
import { compareCandidates, type CandidateComparison } from './significance.js';
import type { Allocation, AllocateFn, WalkForwardResult } from './types.js';

/**
 * `holdfast backtest` and the app's walk-forward view in one place: every candidate of a
 * scenario walked forward under its `backtest` settings, the metrics, the significance of each
 * candidate's difference from the reference (the recommended candidate, else the first), the
 * stress table on the weights each candidate would hold today, and optionally the bootstrap
 * stability of those weights. Estimating and solving are injected (`EstimateAndSolveFn`), so
 * this module owns only the orchestration.
 */
export interface SolveRequest {
  candidate: Candidate;
  scenario: Scenario;
  assets: readonly string[];
  /** The estimation window's returns, T x N in `assets` order, ending on the rebalance date. */
  returns: Matrix;
  /** Periods per year of those returns (for annualising the estimate). */
  periodsPerYear: number;
  /** Weights held going into the rebalance (the turnover reference); null from cash. */
  current: Float64Array | null;
  /** What the previous solve of this candidate returned in `state` (a warm start). */
  previous: unknown;
}

export interface SolveOutcome {
  status: Allocation['status'];
  message?: string;
  weights: Float64Array;
  /** Annualised covariance of the estimate, in `assets` order. */
  covariance: Matrix;
  forecastVolatility: number;
  forecastDiversificationRatio: number;
  state?: unknown;
}

export type EstimateAndSolveFn = (request: SolveRequest) => SolveOutcome;

export type BacktestPhase = 'walk-forward' | 'stability' | 'comparison';

export interface BacktestOptions {
  estimateAndSolve: EstimateAndSolveFn;
  /** Progress per candidate and phase: `done` of `total` steps of that phase. */
  onProgress?: (phase: BacktestPhase, candidateId: string, done: number, total: number) => void;
  shouldCancel?: CancelCheck;
  /** Awaited between steps so an async caller can deliver a cancel (setImmediate in Node). */
  pause?: () => Promise<void>;
  /** Bootstrap draws for the significance of differences (1000 by default). */
  comparisonDraws?: number;
  seed?: number;
  /** Bootstrap draws for the weight stability of today's weights; 0 or absent skips it. */
  stabilityDraws?: number;
  /**
   * Exchange rates for assets priced in another currency than the scenario's base (the price
   * table's `currencies`): one column per currency, the price of one unit in the base currency.
   */
  fx?: PriceTable;
}

export interface CandidateBacktest {
  id: string;
  label?: string;
  walkForward: WalkForwardResult;
  metrics: WalkForwardMetrics;
  /** What the candidate would hold on the last date (estimated on the last window). */
  today: SolveOutcome;
  stability?: WeightStability;
}

export interface BacktestRun {
  assets: string[];
  settings: Omit<BacktestSpec, 'estimationWindow'> & {
    /** In return periods: the scenario's, or `defaultEstimationWindow` of the history. */
    estimationWindow: number;
    /** The scenario gave no window, so it was chosen from the history's `historyReturns`. */
    windowFromHistory: boolean;
    historyReturns: number;
    startDate: string;
    endDate: string;
    rowsPerYear: number;
    periodsPerYear: number;
  };
  candidates: CandidateBacktest[];
  reference: string;
  comparisons: CandidateComparison[];
  stress: StressViews;
  warnings: string[];
}

/** Calendar days a trailing window of `periods` needs, with room for holidays and gaps. */
function lookbackDays(periods: number, frequency: 'daily' | 'weekly' | 'monthly'): number {
  const perPeriod = frequency === 'daily' ? 1.5 : frequency === 'weekly' ? 7.5 : 32;
  return Math.ceil(periods * perPeriod) + 31;
}

function restrict(table: PriceTable, assets: readonly string[], from?: string, to?: string): PriceTable {
  const cols = assets.map((a) => table.closes[table.assets.indexOf(a)]);
  const keep: number[] = [];
  table.dates.forEach((d, t) => {
    if ((from === undefined || d >= from) && (to === undefined || d <= to) && cols.some((c) => Number.isFinite(c[t])))
      keep.push(t);
  });
  return {
    dates: keep.map((t) => table.dates[t]),
    assets,
    closes: cols.map((c) => Float64Array.from(keep, (t) => c[t])),
    ...(table.currencies ? { currencies: assets.map((a) => table.currencies?.[table.assets.indexOf(a)]) } : {}),
  };
}

export async function runBacktest(
  scenario: Scenario,
  prices: PriceTable,
  options: BacktestOptions,
): Promise<BacktestRun> {
  const spec = scenario.backtest ?? backtestSpecSchema.parse({});
  const assets = [...(scenario.assets ?? prices.assets)];
  assets.forEach((a, k) => {
    if (!prices.assets.includes(a)) throw new InputError(`no price history for asset '${a}'`, { path: `assets[${k}]` });
  });
  const maxFillDays = scenario.returns.maxFillDays;
  const table = inBaseCurrency(
    restrict(prices, assets, scenario.window?.from, scenario.window?.to),
    scenario.baseCurrency,
    options.fx,
    maxFillDays ?? DEFAULT_MAX_FILL_DAYS,
  );
  const warnings: string[] = [];
  if (scenario.window?.years !== undefined)
    warnings.push(
      `the comparison's last ${scenario.window.years} year${scenario.window.years === 1 ? '' : 's'} of data do not apply to the walk-forward: each rebalance is estimated on the walk-forward's own window`,
    );
  const frequency = scenario.returns.frequency;
  const method = scenario.returns.method;
  const periodsPerYear = scenario.periodsPerYear ?? PERIODS_PER_YEAR[frequency];
  const rowsPerYear = PERIODS_PER_YEAR[pricingFrequency(table.dates.map(dayNumber)).frequency];
  const returnsOf = (history: PriceTable, minObservations?: number): ReturnsResult =>
    buildReturns(history, {
      assets,
      frequency,
      method,
      maxFillDays,
      ...(minObservations ? { minObservations } : {}),
    });

  // First possible rebalance: the date of the estimationWindow-th return (only dates and the
  // pattern of missing prices are read here, never a price level), or `from` if later.
  const all = returnsOf(table);
  const W = spec.estimationWindow ?? defaultEstimationWindow(frequency, all.dates.length);
  if (all.dates.length < W)
    throw new InputError(
      `the first rebalance needs ${W} returns of history, the prices give ${all.dates.length} in all`,
      { path: 'backtest.estimationWindow' },
    );
  let startIndex = table.dates.indexOf(all.dates[W - 1]);
  if (spec.from !== undefined) {
    const k = table.dates.findIndex((d) => d >= spec.from!);
    if (k === -1) throw new InputError(`no price date on or after ${spec.from}`, { path: 'backtest.from' });
    startIndex = Math.max(startIndex, k);
  }
  if (startIndex >= table.dates.length - 1)
    throw new InputError(
      `no price date after the first rebalance (${table.dates[startIndex]}): nothing to walk forward`,
      { path: spec.from !== undefined ? 'backtest.from' : 'backtest.estimationWindow' },
    );
  const rates = costRates(assets, spec.costBps, scenario.assetInfo);
  const sets = assetSets(assets, scenario.constraints.groups, scenario.assetInfo);
  // Check the user's shock targets before the long part starts.
  (scenario.stress?.shocks ?? []).forEach((s, k) => resolveTarget(s.target, sets, `stress.shocks[${k}].target`));
  const initial = scenario.current ? Float64Array.from(assets, (a) => scenario.current?.[a] ?? 0) : null;

  const windowReturns = (history: PriceTable): Matrix => {
    let slice = history;
    if (!spec.expanding) {
      const end = dayNumber(history.dates[history.dates.length - 1]);
      const first = history.dates.findIndex((d) => dayNumber(d) >= end - lookbackDays(W, frequency));
      if (first > 0)
        slice = { ...history, dates: history.dates.slice(first), closes: history.closes.map((c) => c.subarray(first)) };
    }
    let r = returnsOf(slice).returns;
    if (!spec.expanding && r.rows < W) r = returnsOf(history).returns;
    if (spec.expanding || r.rows <= W) return r;
    return { rows: W, cols: r.cols, data: r.data.subarray((r.rows - W) * r.cols) };
  };

  // Every candidate shares the assets and the window, so the returns of a rebalance row are
  // built once and reused (keyed by the row the history ends on).
  const windows = new Map<number, Matrix>();
  const cachedWindow = (history: PriceTable): Matrix => {
    const row = history.dates.length - 1;
    let r = windows.get(row);
    if (!r) windows.set(row, (r = windowReturns(history)));
    return r;
  };

  const solveOn = (
    candidate: Candidate,
    history: PriceTable,
    current: Float64Array | null,
    previous: unknown,
  ): SolveOutcome =>
    options.estimateAndSolve({
      candidate,
      scenario,
      assets,
      returns: cachedWindow(history),
      periodsPerYear,
      current,
      previous,
    });

  const allocatorFor =
    (candidate: Candidate): AllocateFn =>
    ({ history, drifted, previous }) => {
      let out: SolveOutcome;
      try {
        out = solveOn(candidate, history, drifted, (previous?.state as SolveOutcome | undefined)?.state ?? null);
      } catch (error) {
        if (!(error instanceof InputError)) throw error;
        return {
          status: 'error',
          message: error.message,
          weights: new Float64Array(assets.length),
          forecastVolatility: null,
          forecastDiversificationRatio: null,
        };
      }
      return {
        status: out.status,
        ...(out.message !== undefined ? { message: out.message } : {}),
        weights: out.weights,
        forecastVolatility: out.forecastVolatility,
        forecastDiversificationRatio: out.forecastDiversificationRatio,
        state: out,
      };
    };

  const run = <R>(steps: Generator<void, R, void>): Promise<R> =>
    options.pause ? drainAsync(steps, options.pause) : Promise.resolve(drain(steps));

  const results: CandidateBacktest[] = [];
  for (const candidate of scenario.candidates) {
    throwIfCancelled(options.shouldCancel);
    const walkForward = await run(
      walkForwardSteps({
        prices: table,
        assets,
        settings: {
          rebalance: spec.rebalance,
          driftBand: spec.driftBand,
          costRates: rates,
          startIndex,
          periodsPerYear: rowsPerYear,
          cashRate: spec.cashRate,
        },
        allocate: allocatorFor(candidate),
        initialWeights: initial,
        onProgress: (d, t) => options.onProgress?.('walk-forward', candidate.id, d, t),
        shouldCancel: options.shouldCancel,
      }),
    );
    const today = solveOn(candidate, table, walkForward.rebalances.at(-1)?.weights ?? null, null);
    const entry: CandidateBacktest = {
      id: candidate.id,
      ...(candidate.label !== undefined ? { label: candidate.label } : {}),
      walkForward,
      metrics: walkForwardMetrics(walkForward, spec.cashRate),
      today,
    };
    if (options.stabilityDraws && today.status === 'optimal') {
      const window = cachedWindow(table);
      entry.stability = await run(
        weightStabilitySteps({
          returns: window,
          assets,
          draws: options.stabilityDraws,
          seed: options.seed ?? 1,
          resolve: (returns, previous) => {
            const out = options.estimateAndSolve({
              candidate,
              scenario,
              assets,
              returns,
              periodsPerYear,
              current: null,
              previous: previous?.state ?? null,
            });
            return {
              status: out.status,
              weights: out.weights,
              volatility: out.forecastVolatility,
              diversificationRatio: out.forecastDiversificationRatio,
              state: out.state,
            };
          },
          onProgress: (d, t) => options.onProgress?.('stability', candidate.id, d, t),
          shouldCancel: options.shouldCancel,
        }),
      );
    }
    results.push(entry);
  }

  const reference = scenario.recommended ?? scenario.candidates[0].id;
  const ref = results.find((r) => r.id === reference)!;
  const comparisons: CandidateComparison[] = [];
  for (const other of results) {
    if (other === ref) continue;
    throwIfCancelled(options.shouldCancel);
    comparisons.push(
      compareCandidates(
        { id: other.id, returns: other.walkForward.returns },
        { id: ref.id, returns: ref.walkForward.returns },
        {
          periodsPerYear: rowsPerYear,
          cashRate: spec.cashRate,
          draws: options.comparisonDraws ?? 1000,
          seed: options.seed ?? 1,
          shouldCancel: options.shouldCancel,
        },
      ),
    );
    options.onProgress?.('comparison', other.id, comparisons.length, results.length - 1);
    if (options.pause) await options.pause();
  }

  const universe: AssetSet = {
    name: 'the equal-weight universe',
    kind: 'group',
    members: assets,
    label: 'the equal-weight universe',
  };
  // Historical windows come from the common history (every asset priced), so each window can
  // be replayed on every weight.
  const common = table.dates.findIndex((_, t) => table.closes.every((c) => Number.isFinite(c[t])));
  const stressTable: PriceTable =
    common <= 0
      ? table
      : { ...table, dates: table.dates.slice(common), closes: table.closes.map((c) => c.subarray(common)) };
  const stress = stressViews({
    prices: stressTable,
    assets,
    candidates: results
      .filter((r) => r.today.status === 'optimal')
      .map((r) => ({ id: r.id, weights: r.today.weights, covariance: r.today.covariance })),
    bases: distinctBases([universe, ...sets.filter((s) => s.kind !== 'asset')]),
    sets,
    ...(scenario.stress ? { spec: scenario.stress } : {}),
    returnsMethod: method,
  });

  return {
    assets,
    settings: {
      ...spec,
      estimationWindow: W,
      windowFromHistory: spec.estimationWindow === undefined,
      historyReturns: all.dates.length,
      startDate: table.dates[startIndex],
      endDate: table.dates[table.dates.length - 1],
      rowsPerYear,
      periodsPerYear,
    },
    candidates: results,
    reference,
    comparisons,
    stress,
    warnings,
  };
}
