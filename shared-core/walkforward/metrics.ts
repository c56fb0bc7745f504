import { maxDrawdown, type Drawdown } from '../analytics/drawdown.js';
import { mean, quantile, standardDeviation } from '../stability/quantile.js';
import type { WalkForwardResult } from './types.js';

/**
 * Performance figures of a return series. Definitions:
 * - annualised return: geometric, (prod(1 + r_t))^(P / n) - 1 (Bacon 2008, "Practical Portfolio
 *   Performance Measurement and Attribution", 2nd ed., Wiley, ch. 2);
 * - volatility: sample standard deviation (n - 1) of the period returns times sqrt(P) (same book;
 *   the square-root-of-time scaling is common practice);
 * - Sharpe ratio: mean over standard deviation of excess returns r_t - r_f, times sqrt(P)
 *   (Sharpe 1994, "The Sharpe ratio", J. Portfolio Management 21(1)), with the per-period cash
 *   return r_f = (1 + cashRate)^(1/P) - 1;
 * - maximum drawdown: analytics/drawdown.ts.
 */
export interface ReturnMetrics {
  annualisedReturn: number;
  volatility: number;
  sharpeRatio: number;
  maxDrawdown: Drawdown;
  periods: number;
  years: number;
}

export function perPeriodRate(annualRate: number, periodsPerYear: number): number {
  return Math.pow(1 + annualRate, 1 / periodsPerYear) - 1;
}

export function annualisedReturn(returns: ArrayLike<number>, periodsPerYear: number): number {
  let logGrowth = 0;
  for (let t = 0; t < returns.length; t++) logGrowth += Math.log1p(returns[t]);
  return Math.expm1((logGrowth * periodsPerYear) / returns.length);
}

export function annualisedVolatility(returns: ArrayLike<number>, periodsPerYear: number): number {
  return standardDeviation(returns) * Math.sqrt(periodsPerYear);
}

export function sharpeRatio(returns: ArrayLike<number>, periodsPerYear: number, cashRate: number): number {
  const rf = perPeriodRate(cashRate, periodsPerYear);
  const excess = Float64Array.from(returns, (r) => r - rf);
  return (mean(excess) / standardDeviation(excess)) * Math.sqrt(periodsPerYear);
}

export function returnMetrics(
  returns: ArrayLike<number>,
  dates: readonly string[],
  startDate: string,
  periodsPerYear: number,
  cashRate: number,
): ReturnMetrics {
  return {
    annualisedReturn: annualisedReturn(returns, periodsPerYear),
    volatility: annualisedVolatility(returns, periodsPerYear),
    sharpeRatio: sharpeRatio(returns, periodsPerYear, cashRate),
    maxDrawdown: maxDrawdown(returns, dates, startDate),
    periods: returns.length,
    years: returns.length / periodsPerYear,
  };
}

/** Summary of a ratio across holding periods (realised over forecast volatility). */
export interface Spread {
  mean: number;
  median: number;
  standardDeviation: number;
  p10: number;
  p90: number;
  count: number;
}

export function spread(values: readonly number[]): Spread | null {
  if (values.length === 0) return null;
  return {
    mean: mean(values),
    median: quantile(values, 0.5),
    standardDeviation: values.length > 1 ? standardDeviation(values) : 0,
    p10: quantile(values, 0.1),
    p90: quantile(values, 0.9),
    count: values.length,
  };
}

export interface WalkForwardMetrics extends ReturnMetrics {
  /** Mean realised diversification ratio over holding periods; null when none had 2+ returns. */
  averageRealisedDiversificationRatio: number | null;
  /** Turnover of every rebalance after the first (the initial purchase is not trading), per year. */
  turnoverPerYear: number;
  /** Turnover of the first rebalance (from `current`, or from cash). */
  initialTurnover: number;
  /** Sum of costs paid, in growth-of-1 units (0.01 = 1% of the starting value). */
  costsPaid: number;
  /** Costs as a fraction of value summed over rebalances, per year (the annual cost drag). */
  costDragPerYear: number;
  rebalanceCount: number;
  failedRebalances: number;
  /**
   * Realised over forecast annualised volatility, one value per holding period with at least
   * `minPeriods` returns and a forecast (near 1 when the estimator forecasts well).
   */
  volatilityRatio: Spread | null;
}

export function walkForwardMetrics(result: WalkForwardResult, cashRate: number, minPeriods = 10): WalkForwardMetrics {
  const base = returnMetrics(result.returns, result.dates, result.startDate, result.periodsPerYear, cashRate);
  const ratios: number[] = [];
  const drs: number[] = [];
  let laterTurnover = 0;
  let costFractions = 0;
  let costsPaid = 0;
  let failed = 0;
  result.rebalances.forEach((r, k) => {
    if (k > 0) laterTurnover += r.turnover;
    costFractions += r.costFraction;
    costsPaid += r.costPaid;
    if (r.status !== 'optimal') failed++;
    const h = r.holding;
    if (h.realisedDiversificationRatio !== null) drs.push(h.realisedDiversificationRatio);
    if (h.periods >= minPeriods && h.realisedVolatility !== null && r.forecastVolatility)
      ratios.push(h.realisedVolatility / r.forecastVolatility);
  });
  return {
    ...base,
    averageRealisedDiversificationRatio: drs.length ? mean(drs) : null,
    turnoverPerYear: laterTurnover / base.years,
    initialTurnover: result.rebalances[0]?.turnover ?? 0,
    costsPaid,
    costDragPerYear: costFractions / base.years,
    rebalanceCount: result.rebalances.length,
    failedRebalances: failed,
    volatilityRatio: spread(ratios),
  };
}
