import { zeros, type Matrix } from '../linalg/matrix.js';
import { defaultBlockLength, movingBlockIndices, stationaryBootstrapIndices } from './block-bootstrap.js';
import { drain, throwIfCancelled, type CancelCheck, type ProgressCallback } from './cancel.js';
import { mean, quantile } from './quantile.js';
import { seededRng } from './rng.js';

/**
 * How much estimation error moves a candidate's weights: resample the rows of its return window
 * with a block bootstrap (stationary, Politis and Romano 1994, J. American Statistical
 * Association 89; or moving-block, Kunsch 1989, Annals of Statistics 17), re-estimate and
 * re-solve on every draw, and report 5-95% bands of each weight, of the diversification ratio and
 * of the volatility, plus the average turnover between successive draws. Deterministic for a seed.
 */
export interface ResolvedDraw {
  status: 'optimal' | 'infeasible' | 'iteration-limit' | 'error';
  weights: Float64Array;
  /** Annualised volatility and DR of these weights under the draw's own estimate. */
  volatility: number;
  diversificationRatio: number;
  /** Handed back on the next draw (a solver's warm start). */
  state?: unknown;
}

/** Re-estimates and re-solves on one resampled return matrix (T x N). */
export type ResolveFn = (returns: Matrix, previous: ResolvedDraw | null) => ResolvedDraw;

export type BootstrapMethod = 'stationary' | 'moving-block';

export interface WeightStabilityOptions {
  /** The candidate's return window, T x N, columns in `assets` order. */
  returns: Matrix;
  assets: readonly string[];
  resolve: ResolveFn;
  /** Number of resampled histories; 200 by default. */
  draws?: number;
  seed?: number;
  method?: BootstrapMethod;
  /** Mean (stationary) or fixed (moving-block) block length in rows; default round(T^(1/3)). */
  blockLength?: number;
  onProgress?: ProgressCallback;
  shouldCancel?: CancelCheck;
}

export interface Band {
  p5: number;
  median: number;
  p95: number;
  mean: number;
}

export interface WeightStability {
  method: string;
  draws: number;
  /** Draws whose solve did not end `optimal` (left out of the bands). */
  failedDraws: number;
  seed: number;
  blockLength: number;
  weights: Record<string, Band>;
  diversificationRatio: Band;
  volatility: Band;
  /** Mean of sum |w_d - w_(d-1)| over successive successful draws. */
  averageTurnoverBetweenDraws: number;
}

export const DEFAULT_DRAWS = 200;

export function band(values: ArrayLike<number>): Band {
  return { p5: quantile(values, 0.05), median: quantile(values, 0.5), p95: quantile(values, 0.95), mean: mean(values) };
}

/** Copies the rows `index` of `m` into a new matrix. */
export function resampleRows(m: Matrix, index: Int32Array): Matrix {
  const out = zeros(index.length, m.cols);
  for (let t = 0; t < index.length; t++)
    out.data.set(m.data.subarray(index[t] * m.cols, (index[t] + 1) * m.cols), t * m.cols);
  return out;
}

export function weightStability(options: WeightStabilityOptions): WeightStability {
  return drain(weightStabilitySteps(options));
}

/** The same computation as a generator that yields after every draw (see `drainAsync`). */
export function* weightStabilitySteps(options: WeightStabilityOptions): Generator<void, WeightStability, void> {
  const { returns, assets, resolve, onProgress, shouldCancel } = options;
  const T = returns.rows;
  const n = assets.length;
  if (returns.cols !== n) throw new RangeError('one return column per asset is needed');
  const draws = options.draws ?? DEFAULT_DRAWS;
  const seed = options.seed ?? 1;
  const method = options.method ?? 'stationary';
  const blockLength = options.blockLength ?? defaultBlockLength(T);
  const rng = seededRng(seed);
  const kept: Float64Array[] = [];
  const vols: number[] = [];
  const drs: number[] = [];
  let previous: ResolvedDraw | null = null;
  let failed = 0;
  for (let d = 0; d < draws; d++) {
    throwIfCancelled(shouldCancel);
    const index =
      method === 'stationary'
        ? stationaryBootstrapIndices(T, blockLength, rng)
        : movingBlockIndices(T, blockLength, rng);
    const draw = resolve(resampleRows(returns, index), previous);
    if (draw.status === 'optimal') {
      kept.push(Float64Array.from(draw.weights));
      vols.push(draw.volatility);
      drs.push(draw.diversificationRatio);
      previous = draw;
    } else failed++;
    onProgress?.(d + 1, draws);
    yield;
  }
  if (kept.length === 0) throw new RangeError(`no bootstrap draw could be solved (${failed} failed)`);
  const weights: Record<string, Band> = {};
  assets.forEach((a, i) => {
    weights[a] = band(kept.map((w) => w[i]));
  });
  let turnover = 0;
  for (let d = 1; d < kept.length; d++) for (let i = 0; i < n; i++) turnover += Math.abs(kept[d][i] - kept[d - 1][i]);
  return {
    method:
      method === 'stationary'
        ? 'stationary bootstrap of return rows (Politis and Romano 1994)'
        : 'moving-block bootstrap of return rows (Kunsch 1989)',
    draws,
    failedDraws: failed,
    seed,
    blockLength,
    weights,
    diversificationRatio: band(drs),
    volatility: band(vols),
    averageTurnoverBetweenDraws: kept.length > 1 ? turnover / (kept.length - 1) : 0,
  };
}
