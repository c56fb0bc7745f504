import { defaultBlockLength, stationaryBootstrapIndices } from '../stability/block-bootstrap.js';
import { throwIfCancelled, type CancelCheck } from '../stability/cancel.js';
import { quantile } from '../stability/quantile.js';
import { seededRng } from '../stability/rng.js';
import { perPeriodRate } from './metrics.js';
import { normalCdf } from './normal.js';
import { SHARPE_HAC_METHOD, sharpeHacTest } from './sharpe-hac.js';

/**
 * Is the difference between two candidates more than noise? Both return series must cover the
 * same dates. The main measure resamples the pairs (r_a,t, r_b,t) together with the stationary
 * bootstrap (Politis and Romano 1994, J. American Statistical Association 89), which keeps the
 * cross-correlation of the two strategies and the serial dependence of volatility, and reports a
 * percentile interval for the difference in annualised Sharpe ratio and in volatility. (Ledoit
 * and Wolf 2008, J. Empirical Finance 15, studentise the statistic inside a block bootstrap; the
 * plain percentile interval here is the simpler, unstudentised variant and is named as such.)
 * Two delta-method tests of the Sharpe difference sit beside it: the HAC test of Ledoit and Wolf
 * (2008), valid under heavy tails and volatility clustering (sharpe-hac.ts), and the i.i.d.-normal
 * test of Jobson and Korkie (1981, J. Finance 36) with the correction of Memmel (2003, Finance
 * Letters 1).
 */
export interface DifferenceInterval {
  /** Estimate on the observed series: a minus b. */
  difference: number;
  lower: number;
  upper: number;
  /** Two-sided bootstrap p-value of "no difference": twice the smaller tail share beyond 0. */
  pValue: number;
}

export interface CandidateComparison {
  a: string;
  b: string;
  method: string;
  level: number;
  draws: number;
  meanBlockLength: number;
  seed: number;
  sharpeRatio: DifferenceInterval;
  volatility: DifferenceInterval;
  /** Jobson-Korkie-Memmel z statistic for the Sharpe difference and its two-sided p-value. */
  iidTest: { z: number; pValue: number };
  /**
   * The HAC test of Ledoit and Wolf (2008) for the Sharpe difference, robust to heavy tails and
   * volatility clustering; null where its moment conditions are collinear.
   */
  hacTest: { method: string; z: number; pValue: number; bandwidth: number } | null;
}

export interface CompareOptions {
  periodsPerYear: number;
  cashRate: number;
  draws?: number;
  seed?: number;
  meanBlockLength?: number;
  /** Coverage of the interval, 0.95 by default. */
  level?: number;
  shouldCancel?: CancelCheck;
}

export const STATIONARY_BOOTSTRAP_METHOD = 'paired stationary bootstrap percentile interval (Politis and Romano 1994)';

interface Moments {
  sharpe: number;
  vol: number;
}

function moments(a: ArrayLike<number>, index: Int32Array | null, rf: number, P: number): Moments {
  const n = index ? index.length : a.length;
  let s = 0;
  let s2 = 0;
  for (let k = 0; k < n; k++) {
    const x = a[index ? index[k] : k] - rf;
    s += x;
    s2 += x * x;
  }
  const m = s / n;
  const sd = Math.sqrt(Math.max(0, (s2 - n * m * m) / (n - 1)));
  return { sharpe: (m / sd) * Math.sqrt(P), vol: sd * Math.sqrt(P) };
}

function interval(observed: number, draws: Float64Array, level: number): DifferenceInterval {
  const alpha = (1 - level) / 2;
  let below = 0;
  let above = 0;
  for (const d of draws) {
    if (d <= 0) below++;
    if (d >= 0) above++;
  }
  const pValue = Math.min(1, (2 * Math.min(below, above)) / draws.length);
  return { difference: observed, lower: quantile(draws, alpha), upper: quantile(draws, 1 - alpha), pValue };
}

/**
 * Jobson-Korkie test with Memmel's correction, per-period Sharpe ratios s_a, s_b and correlation
 * rho: Var(s_a - s_b) = (2 - 2 rho + (s_a^2 + s_b^2 - 2 s_a s_b rho^2) / 2) / T.
 */
export function jobsonKorkieMemmel(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  rf: number,
): { z: number; pValue: number } {
  const T = a.length;
  let ma = 0;
  let mb = 0;
  for (let t = 0; t < T; t++) {
    ma += a[t] - rf;
    mb += b[t] - rf;
  }
  ma /= T;
  mb /= T;
  let vaa = 0;
  let vbb = 0;
  let vab = 0;
  for (let t = 0; t < T; t++) {
    const x = a[t] - rf - ma;
    const y = b[t] - rf - mb;
    vaa += x * x;
    vbb += y * y;
    vab += x * y;
  }
  const sa = ma / Math.sqrt(vaa / (T - 1));
  const sb = mb / Math.sqrt(vbb / (T - 1));
  const rho = vab / Math.sqrt(vaa * vbb);
  const variance = (2 - 2 * rho + 0.5 * (sa * sa + sb * sb - 2 * sa * sb * rho * rho)) / T;
  if (!(variance > 0)) return { z: 0, pValue: 1 };
  const z = (sa - sb) / Math.sqrt(variance);
  return { z, pValue: 2 * (1 - normalCdf(Math.abs(z))) };
}

export function compareCandidates(
  a: { id: string; returns: ArrayLike<number> },
  b: { id: string; returns: ArrayLike<number> },
  options: CompareOptions,
): CandidateComparison {
  const T = a.returns.length;
  if (b.returns.length !== T) throw new RangeError('the two return series must cover the same dates');
  if (T < 3) throw new RangeError('at least 3 returns are needed to compare candidates');
  const P = options.periodsPerYear;
  const rf = perPeriodRate(options.cashRate, P);
  const draws = options.draws ?? 2000;
  const seed = options.seed ?? 1;
  const level = options.level ?? 0.95;
  const block = options.meanBlockLength ?? defaultBlockLength(T);
  const rng = seededRng(seed);
  const ma = moments(a.returns, null, rf, P);
  const mb = moments(b.returns, null, rf, P);
  const dSharpe = new Float64Array(draws);
  const dVol = new Float64Array(draws);
  for (let d = 0; d < draws; d++) {
    if (d % 64 === 0) throwIfCancelled(options.shouldCancel);
    const index = stationaryBootstrapIndices(T, block, rng);
    const xa = moments(a.returns, index, rf, P);
    const xb = moments(b.returns, index, rf, P);
    dSharpe[d] = xa.sharpe - xb.sharpe;
    dVol[d] = xa.vol - xb.vol;
  }
  return {
    a: a.id,
    b: b.id,
    method: STATIONARY_BOOTSTRAP_METHOD,
    level,
    draws,
    meanBlockLength: block,
    seed,
    sharpeRatio: interval(ma.sharpe - mb.sharpe, dSharpe, level),
    volatility: interval(ma.vol - mb.vol, dVol, level),
    iidTest: jobsonKorkieMemmel(a.returns, b.returns, rf),
    hacTest: hacOrNull(a.returns, b.returns, rf),
  };
}

function hacOrNull(a: ArrayLike<number>, b: ArrayLike<number>, rf: number): CandidateComparison['hacTest'] {
  if (a.length < 10) return null;
  try {
    const t = sharpeHacTest(a, b, rf);
    return { method: SHARPE_HAC_METHOD, z: t.z, pValue: t.pValue, bandwidth: t.bandwidth };
  } catch (error) {
    if (error instanceof RangeError) return null;
    throw error;
  }
}

export { normalCdf };
