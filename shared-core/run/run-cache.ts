import type { CovarianceEstimate } from '../estimators/types.js';
import type { Matrix } from '../linalg/matrix.js';
import type { TridiagonalForm } from '../linalg/tridiagonal-form.js';
import type { QpWarmStart } from '../optimise/qp/index.js';
import type { PriceTable } from '../prices/price-table.js';
import type { ReturnsResult } from '../returns/build-returns.js';

/**
 * What one run of a scenario leaves for the next (the editor's live recompute): the returns, the
 * estimates with their tridiagonal forms, and the solver's active sets. Most edits (a cap, a band,
 * an objective) change none of the returns' inputs, so the next run only solves. Everything here
 * is a pure function of inputs that are compared before reuse, so a run with the cache gives the
 * same weights and figures as one without (only the solver's iteration counts and times differ,
 * the active sets being warm); the cache only saves the time. A run keeps the estimates its own
 * candidates used and drops the rest. Price tables are taken as immutable: the same object is
 * the same prices (a table edited in place needs a new cache).
 */
export interface RunCache {
  prices?: PriceTable;
  fx?: PriceTable;
  /** The returns' own inputs (assets, window, frequency, method, fill, base currency), as JSON. */
  returnsKey?: string;
  returns?: ReturnsResult;
  /** By estimator spec and periods per year, on `returns`. */
  estimates: Map<string, { estimate: CovarianceEstimate; covariance: Matrix }>;
  forms: Map<Matrix, TridiagonalForm>;
  warmStarts: Record<string, QpWarmStart>;
}

export function createRunCache(): RunCache {
  return { estimates: new Map(), forms: new Map(), warmStarts: {} };
}

/**
 * Same dates, assets, currencies and prices (NaN equal to NaN). A table posted to a worker arrives
 * as a new object every time, so identity alone would never match; comparing is O(cells), far
 * less than building the returns.
 */
export function samePrices(a: PriceTable | undefined, b: PriceTable | undefined): boolean {
  if (a === b) return true;
  if (!a || !b) return false;
  if (a.dates.length !== b.dates.length || a.assets.length !== b.assets.length) return false;
  for (let i = 0; i < a.dates.length; i++) if (a.dates[i] !== b.dates[i]) return false;
  for (let k = 0; k < a.assets.length; k++) {
    if (a.assets[k] !== b.assets[k] || a.currencies?.[k] !== b.currencies?.[k]) return false;
    const x = a.closes[k];
    const y = b.closes[k];
    if (x.length !== y.length) return false;
    for (let i = 0; i < x.length; i++) if (x[i] !== y[i] && !(x[i] !== x[i] && y[i] !== y[i])) return false;
  }
  return true;
}
