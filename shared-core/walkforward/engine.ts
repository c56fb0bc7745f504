import type { PriceTable } from '../prices/price-table.js';
import { drain, throwIfCancelled } from '../stability/cancel.js';
import { tradeCost, turnover } from './costs.js';
import { outsideBand, scheduledRows } from './schedule.js';
import type { Allocation, HoldingPeriodStats, RebalanceRecord, WalkForwardInput, WalkForwardResult } from './types.js';

/** Rows between cancellation checks when no rebalance happens (keeps the check cheap). */
const CANCEL_CHECK_ROWS = 256;

/**
 * Walk-forward of one candidate. At the close of each rebalance row the allocator chooses target
 * weights from prices up to that row; from the next row on, holdings drift with prices
 * (w_i <- w_i g_i / sum_j w_j g_j, with g the gross price relatives). A trade at the close of row
 * t costs sum_i |w_i - d_i| c_i of portfolio value (d the drifted weights, c the rate per asset);
 * the charge lands in row t+1's return, so the series carries every cost. A missing price
 * (NaN) values the asset at its last price (a valuation carry, not an estimation input).
 */
export function runWalkForward(input: WalkForwardInput): WalkForwardResult {
  return drain(walkForwardSteps(input));
}

/**
 * The same walk-forward as a generator that yields after every rebalance, so an async caller
 * (the command line, a worker) can let its event loop run between steps and see a Ctrl-C or a
 * cancel message; see `drainAsync`.
 */
export function* walkForwardSteps(input: WalkForwardInput): Generator<void, WalkForwardResult, void> {
  const { prices, assets, settings, allocate, onProgress, shouldCancel } = input;
  const n = assets.length;
  const T = prices.dates.length;
  const columns = assets.map((a) => {
    const i = prices.assets.indexOf(a);
    if (i === -1) throw new RangeError(`asset '${a}' is not a column of the price table`);
    return prices.closes[i];
  });
  if (settings.costRates.length !== n) throw new RangeError('one cost rate per asset is needed');
  const start = settings.startIndex;
  const last = T - 1;
  if (start < 0 || start >= last) throw new RangeError('the walk-forward needs at least one row after its start');
  const scheduled = scheduledRows(prices.dates, start, settings.rebalance);
  const cashReturn = Math.pow(1 + settings.cashRate, 1 / settings.periodsPerYear) - 1;

  // Last known price per asset, for valuation across a missing close.
  const lastPrice = new Float64Array(n).fill(NaN);
  for (let t = 0; t <= start; t++)
    for (let i = 0; i < n; i++) if (Number.isFinite(columns[i][t])) lastPrice[i] = columns[i][t];

  let held: Float64Array | null = input.initialWeights ? Float64Array.from(input.initialWeights) : null;
  let target: Float64Array | null = null;
  let previous: Allocation | null = null;
  let pendingCost = 0;
  const rebalances: RebalanceRecord[] = [];
  const returns = new Float64Array(last - start);
  const growth = new Float64Array(last - start);
  let value = 1;

  const period = new HoldingAccumulator(n);

  const rebalance = (t: number): void => {
    throwIfCancelled(shouldCancel);
    const history = truncate(prices, columns, assets, t);
    const allocation = allocate({ date: prices.dates[t], index: t, history, drifted: held, previous });
    let weights: Float64Array;
    let status = allocation.status;
    let message = allocation.message;
    if (status === 'optimal') {
      const unpriced = assets.filter((_, i) => allocation.weights[i] !== 0 && !Number.isFinite(lastPrice[i]));
      if (unpriced.length) {
        status = 'error';
        message = `no price on or before ${prices.dates[t]} for ${unpriced.join(', ')}`;
      }
    }
    if (status === 'optimal') {
      weights = Float64Array.from(allocation.weights);
      previous = allocation;
    } else weights = held ? Float64Array.from(held) : new Float64Array(n);
    const traded = status === 'optimal' ? turnover(held, weights) : 0;
    const costFraction = status === 'optimal' ? tradeCost(held, weights, settings.costRates) : 0;
    if (rebalances.length) rebalances[rebalances.length - 1].holding = period.close(settings.periodsPerYear);
    rebalances.push({
      date: prices.dates[t],
      index: t,
      status,
      ...(message !== undefined ? { message } : {}),
      weights,
      drifted: held ? Float64Array.from(held) : null,
      turnover: traded,
      costFraction,
      costPaid: costFraction * value,
      forecastVolatility: status === 'optimal' ? allocation.forecastVolatility : null,
      forecastDiversificationRatio: status === 'optimal' ? allocation.forecastDiversificationRatio : null,
      holding: { periods: 0, realisedVolatility: null, realisedDiversificationRatio: null },
    });
    pendingCost = costFraction;
    if (status === 'optimal' || held) held = Float64Array.from(weights);
    target = held ? Float64Array.from(held) : null;
    period.open(held);
    onProgress?.(t - start, last - start);
  };

  rebalance(start);
  yield;
  const gross = new Float64Array(n);
  for (let t = start + 1; t <= last; t++) {
    if ((t - start) % CANCEL_CHECK_ROWS === 0) throwIfCancelled(shouldCancel);
    for (let i = 0; i < n; i++) {
      const p = columns[i][t];
      if (Number.isFinite(p) && Number.isFinite(lastPrice[i])) {
        gross[i] = p / lastPrice[i];
        lastPrice[i] = p;
      } else {
        gross[i] = 1;
        if (Number.isFinite(p)) lastPrice[i] = p;
      }
    }
    let r: number;
    if (held) {
      // Whatever the weights leave uninvested (a `current` below 100%) is cash at the cash rate.
      let R = 0;
      let invested = 0;
      for (let i = 0; i < n; i++) {
        R += held[i] * gross[i];
        invested += held[i];
      }
      R += (1 - invested) * (1 + cashReturn);
      period.add(gross, R - 1);
      for (let i = 0; i < n; i++) held[i] = (held[i] * gross[i]) / R;
      r = (1 - pendingCost) * R - 1;
    } else r = (1 - pendingCost) * (1 + cashReturn) - 1;
    pendingCost = 0;
    value *= 1 + r;
    returns[t - start - 1] = r;
    growth[t - start - 1] = value;
    if (t < last) {
      const drifted = settings.rebalance === 'drift' && held && target && outsideBand(held, target, settings.driftBand);
      if (scheduled.has(t) || drifted) {
        rebalance(t);
        yield;
      }
    }
  }
  rebalances[rebalances.length - 1].holding = period.close(settings.periodsPerYear);
  onProgress?.(last - start, last - start);
  return {
    assets,
    startDate: prices.dates[start],
    dates: prices.dates.slice(start + 1),
    returns,
    growth,
    rebalances,
    periodsPerYear: settings.periodsPerYear,
  };
}

/** The price table cut after row t: views, so the allocator cannot read a later close. */
function truncate(prices: PriceTable, columns: Float64Array[], assets: readonly string[], t: number): PriceTable {
  return {
    dates: prices.dates.slice(0, t + 1),
    assets,
    closes: columns.map((c) => c.subarray(0, t + 1)),
  };
}

/** Running sums over one holding period for its realised volatility and diversification ratio. */
class HoldingAccumulator {
  private weights: Float64Array | null = null;
  private count = 0;
  private readonly sum: Float64Array;
  private readonly sumSq: Float64Array;
  private fixed = 0;
  private fixedSq = 0;
  private actual = 0;
  private actualSq = 0;

  constructor(n: number) {
    this.sum = new Float64Array(n);
    this.sumSq = new Float64Array(n);
  }

  open(weights: Float64Array | null): void {
    this.weights = weights ? Float64Array.from(weights) : null;
    this.count = 0;
    this.sum.fill(0);
    this.sumSq.fill(0);
    this.fixed = this.fixedSq = this.actual = this.actualSq = 0;
  }

  add(gross: Float64Array, portfolioReturn: number): void {
    const w = this.weights;
    if (!w) return;
    let p = 0;
    for (let i = 0; i < w.length; i++) {
      const a = gross[i] - 1;
      this.sum[i] += a;
      this.sumSq[i] += a * a;
      p += w[i] * a;
    }
    this.fixed += p;
    this.fixedSq += p * p;
    this.actual += portfolioReturn;
    this.actualSq += portfolioReturn * portfolioReturn;
    this.count++;
  }

  close(periodsPerYear: number): HoldingPeriodStats {
    const k = this.count;
    const w = this.weights;
    if (!w || k < 2) return { periods: k, realisedVolatility: null, realisedDiversificationRatio: null };
    const sd = (s: number, s2: number): number => Math.sqrt(Math.max(0, (s2 - (s * s) / k) / (k - 1)));
    let weightedVol = 0;
    for (let i = 0; i < w.length; i++) weightedVol += w[i] * sd(this.sum[i], this.sumSq[i]);
    const fixedVol = sd(this.fixed, this.fixedSq);
    return {
      periods: k,
      realisedVolatility: sd(this.actual, this.actualSq) * Math.sqrt(periodsPerYear),
      realisedDiversificationRatio: fixedVol > 0 ? weightedVol / fixedVol : null,
    };
  }
}
