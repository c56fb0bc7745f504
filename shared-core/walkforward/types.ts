import type { PriceTable } from '../prices/price-table.js';
import type { CancelCheck, ProgressCallback } from '../stability/cancel.js';

/**
 * The walk-forward engine's contract. The engine owns the calendar, drift, turnover, costs and
 * the return series; choosing weights is delegated to an `AllocateFn`, which on each rebalance
 * date sees only the prices up to and including that date (the engine hands it a truncated
 * table, so look-ahead is impossible by construction, and a test checks it).
 */
export type RebalanceSchedule = 'monthly' | 'quarterly' | 'yearly' | 'drift';

export interface AllocationRequest {
  /** The rebalance date (ISO) and its row in the full price table. */
  date: string;
  index: number;
  /** Prices of the walk-forward's assets from the first row up to and including `date`. */
  history: PriceTable;
  /** Weights held going into this rebalance after drifting with prices; null when in cash. */
  drifted: Float64Array | null;
  /** The previous allocation of this candidate (for warm starts), null at the first rebalance. */
  previous: Allocation | null;
}

export type AllocationStatus = 'optimal' | 'infeasible' | 'iteration-limit' | 'error';

export interface Allocation {
  status: AllocationStatus;
  message?: string;
  /** Target weights in the walk-forward's asset order (used only when status is `optimal`). */
  weights: Float64Array;
  /** Annualised volatility the estimate forecasts for these weights, if the allocator has one. */
  forecastVolatility: number | null;
  /** Diversification ratio under the estimate, if known. */
  forecastDiversificationRatio: number | null;
  /** Opaque state the allocator wants back next time (a solver's warm start). */
  state?: unknown;
}

export type AllocateFn = (request: AllocationRequest) => Allocation;

export interface WalkForwardSettings {
  rebalance: RebalanceSchedule;
  /** For `drift`: rebalance when any weight leaves target +/- this band (absolute weight). */
  driftBand: number;
  /** Cost per asset as a fraction of traded value (10 bps = 0.001), in asset order. */
  costRates: Float64Array;
  /** First row on which a rebalance may happen (enough history for the estimator). */
  startIndex: number;
  /** Return periods per year of the price rows (252 for daily closes). */
  periodsPerYear: number;
  /** Annual cash rate earned while no weights are held (before the first successful allocation). */
  cashRate: number;
}

export interface WalkForwardInput {
  prices: PriceTable;
  /** The assets traded, in the order of every weight vector; each must be a column of `prices`. */
  assets: readonly string[];
  settings: WalkForwardSettings;
  allocate: AllocateFn;
  /** Holdings before the first rebalance (the scenario's `current`); cash when absent. */
  initialWeights?: Float64Array | null;
  /** Called after each rebalance with (rows done, rows total). */
  onProgress?: ProgressCallback;
  shouldCancel?: CancelCheck;
}

/** What happened over one holding period (from a rebalance to the next, or the end). */
export interface HoldingPeriodStats {
  /** Number of daily returns in the period. */
  periods: number;
  /** Annualised realised volatility of the portfolio's (drifting) returns; null below 2 returns. */
  realisedVolatility: number | null;
  /**
   * Realised diversification ratio of the target weights over the period: sum of w_i times each
   * asset's realised volatility, over the realised volatility of the fixed-weight portfolio
   * (the definition of Choueifaty and Coignard 2008 applied to realised moments).
   */
  realisedDiversificationRatio: number | null;
}

export interface RebalanceRecord {
  date: string;
  index: number;
  status: AllocationStatus;
  message?: string;
  /** Weights held after the rebalance (the drifted weights when the allocation failed). */
  weights: Float64Array;
  /** Weights before trading; null when coming from cash. */
  drifted: Float64Array | null;
  /** Sum of |w_new - w_drifted| (from cash: sum of |w_new|). */
  turnover: number;
  /** Costs as a fraction of portfolio value: sum of |w_new - w_drifted| x rate_i. */
  costFraction: number;
  /** The same cost in growth-of-1 units (fraction x portfolio value at the trade). */
  costPaid: number;
  forecastVolatility: number | null;
  forecastDiversificationRatio: number | null;
  /** The holding period that follows this rebalance. */
  holding: HoldingPeriodStats;
}

export interface WalkForwardResult {
  assets: readonly string[];
  /** Date of the first rebalance: the growth curve is 1 at its close. */
  startDate: string;
  /** Dates of the return series (every row after the start). */
  dates: string[];
  /** Net simple returns per row, after costs (a trade's cost lands in the next row's return). */
  returns: Float64Array;
  /** Growth of 1 after each row's return. */
  growth: Float64Array;
  rebalances: RebalanceRecord[];
  periodsPerYear: number;
}
