import { InputError, type InputLocation } from '../errors.js';
import type { Frequency } from '../scenario/frequency.js';
import { zeros, type Matrix } from '../linalg/matrix.js';
import type { PriceTable } from '../prices/price-table.js';
import { rateOn } from './exchange-rate.js';
import { desmooth } from './desmooth.js';
import { coarser, dayNumber, isCoarser, monthIndex, pricingFrequency, weekIndex } from './calendar.js';

/** Prices and rates are never carried forward over more than this many calendar days unless the user says so. */
export const DEFAULT_MAX_FILL_DAYS = 5;

export type ReturnMethod = 'log' | 'simple';

export interface BuildReturnsOptions {
  /** Asset ids to use, in this order; default every asset of the table. */
  assets?: readonly string[];
  /** Inclusive window bounds, ISO dates; default the whole common history. */
  from?: string;
  to?: string;
  frequency: Frequency;
  method: ReturnMethod;
  /** Never carry a price (or an FX rate) forward over more than this many calendar days. Default 5. */
  maxFillDays?: number;
  /** Currency to measure returns in; assets priced in another currency are converted with `fx`. */
  baseCurrency?: string;
  /** FX series: one column per ISO currency code, the price of one unit of it in the base currency. */
  fx?: PriceTable;
  /**
   * An asset priced less often than `frequency` (a fund with monthly NAVs in a daily estimate):
   * `error` (default) refuses, naming the asset; `coarsen` estimates at its frequency with a warning.
   */
  onCoarserPricing?: 'error' | 'coarsen';
  /** Fewer common returns than this is an error. Default 3. */
  minObservations?: number;
  /**
   * Assets whose returns are appraisal-smoothed (fund NAVs, private assets): their returns are
   * desmoothed by the MA(2) model of Getmansky, Lo and Makarov (2004) before estimation.
   */
  desmooth?: readonly string[];
  /** Maps an asset and date to where it sits in the input (file line and column, JSON path). */
  locate?: (asset: string | undefined, date?: string) => InputLocation;
}

export interface AssetCoverage {
  asset: string;
  /** First and last priced date of the asset inside the requested window (inclusive). */
  firstDate: string;
  lastDate: string;
  /** Returns used (the same for every asset: the aligned matrix has no holes). */
  observations: number;
  /** Priced dates (daily) or priced periods (weekly, monthly) of the asset in the window that no return uses. */
  datesDropped: number;
  /** Period ends at which the asset's price was carried from an earlier day (within maxFillDays). */
  pricesFilled: number;
}

export interface ReturnsResult {
  assets: string[];
  /** End date of each return's period (the last trading day of the day, week or month). */
  dates: string[];
  /** T x N, rows are periods, columns follow `assets`. */
  returns: Matrix;
  coverage: AssetCoverage[];
  warnings: string[];
  /** The frequency used (coarser than asked when `onCoarserPricing` is `coarsen`). */
  frequency: Frequency;
  method: ReturnMethod;
  /** The smoothing profile found for each desmoothed asset (theta_0..theta_2, sum 1). */
  desmoothing: { asset: string; theta: number[]; smoothingIndex: number }[];
}

/** Fewest returns an MA(2) smoothing profile is fitted to. */
export const MIN_DESMOOTH_OBSERVATIONS = 24;

/** One sampled period end: its table row and, per asset, the row whose price stands for it. */
interface SamplePoint {
  row: number;
  /** Per asset; absent where every asset is priced on `row` itself (daily data). */
  priceRows?: Int32Array;
  /** Week or month index for weekly and monthly data; the day number for daily data. */
  period: number;
  /** Index of `row` among the candidate dates (dates where some selected asset has a price). */
  slot: number;
}

/**
 * Aligned returns for a window and a frequency. Returns are taken between consecutive period
 * ends at which every selected asset has a price: dates where some asset has no price are
 * dropped for all (daily), and a period end takes each asset's last price of the period only if
 * it is at most `maxFillDays` calendar days old (weekly, monthly). A return spanning a hole
 * longer than that is dropped rather than faked, with a warning. Prices are converted to the base
 * currency before returns are taken.
 *
 * The N x T prices are read in one pass down each column (`scanColumn`) and the returns written
 * in one more over blocks of columns (`readLevels`, `blockReturns`): small functions called once
 * per column or block, so that V8 optimises them early with complete type feedback.
 */
export function buildReturns(table: PriceTable, options: BuildReturnsOptions): ReturnsResult {
  const maxFill = options.maxFillDays ?? DEFAULT_MAX_FILL_DAYS;
  const minObservations = options.minObservations ?? 3;
  const locate = options.locate ?? (() => ({}));
  const fail = (message: string, asset?: string, date?: string) => new InputError(message, locate(asset, date));
  const warnings: string[] = [];
  const { dates } = table;

  const ids = [...(options.assets ?? table.assets)];
  if (ids.length === 0) throw new InputError('no assets selected', { path: 'assets' });
  const cols = selectedColumns(table.assets, ids);
  const n = ids.length;

  if (options.from !== undefined && options.to !== undefined && options.from > options.to)
    throw new InputError(`the window starts (${options.from}) after it ends (${options.to})`, { path: 'window' });
  let lo = 0;
  let hi = dates.length;
  if (options.from !== undefined) while (lo < hi && dates[lo] < options.from) lo++;
  if (options.to !== undefined) while (hi > lo && dates[hi - 1] > options.to) hi--;
  const days = new Int32Array(dates.length);
  for (let r = lo; r < hi; r++) days[r] = dayNumber(dates[r]);

  // One pass down each selected column inside the window: its first and last priced rows, how
  // many prices it has, how many of its gaps are short for the asked frequency, and per row how
  // many selected assets are priced there.
  const firsts = new Int32Array(n);
  const lasts = new Int32Array(n);
  const counts = new Int32Array(n);
  const shortGaps = new Int32Array(n);
  const pricedOn = new Int32Array(dates.length);
  const shortGap = SHORT_GAP[options.frequency];
  for (let a = 0; a < n; a++) {
    counts[a] = scanColumn(table.closes[cols[a]], lo, hi, days, shortGap, pricedOn, firsts, lasts, shortGaps, a);
    if (counts[a] === 0)
      throw fail(
        `${ids[a]} has no price in the window${windowText(options.from, options.to)}`,
        ids[a],
        options.from !== undefined ? undefined : dates[lo],
      );
  }

  // Assets priced less often than asked force a coarser frequency or stop here. The median gap
  // exceeds the frequency's limit exactly when fewer than half of the gaps (rank + 1 of them) are
  // within it; only such an asset has its median gap worked out (pricingFrequency).
  let frequency = options.frequency;
  const coarsened: string[] = [];
  for (let a = 0; a < n; a++) {
    const m = counts[a];
    if (m < 3 || shortGaps[a] > (m - 1) >> 1) continue;
    const rows = pricedRows(table.closes[cols[a]], lo, hi);
    const pricedDays = new Int32Array(rows.length);
    for (let i = 0; i < rows.length; i++) pricedDays[i] = days[rows[i]];
    const native = pricingFrequency(pricedDays);
    if (!isCoarser(native.frequency, options.frequency)) continue;
    if (options.onCoarserPricing === 'coarsen') {
      frequency = coarser(frequency, native.frequency);
      coarsened.push(ids[a]);
      continue;
    }
    throw fail(
      `${ids[a]} is priced ${native.frequency} (median ${native.medianGap} days between prices), so it cannot enter a ` +
        `${options.frequency} estimate: use frequency ${native.frequency} or leave it out`,
      ids[a],
      dates[rows[1]],
    );
  }
  if (coarsened.length > 0) warnings.push(`estimating ${frequency}: ${coarsened.join(', ')} priced ${frequency}`);

  // The week or month of each row in the window, read once: the sampling and the coverage count
  // ask for it per row and per asset.
  const periods = new Int32Array(frequency === 'daily' ? 0 : dates.length);
  if (frequency !== 'daily')
    for (let r = lo; r < hi; r++) periods[r] = frequency === 'weekly' ? weekIndex(days[r]) : monthIndex(dates[r]);

  // The common window: from the latest first price to the earliest last price.
  let commonLo = firsts[0];
  let commonHi = lasts[0];
  let earliest = firsts[0];
  let latest = lasts[0];
  for (let a = 1; a < n; a++) {
    commonLo = Math.max(commonLo, firsts[a]);
    commonHi = Math.min(commonHi, lasts[a]);
    earliest = Math.min(earliest, firsts[a]);
    latest = Math.max(latest, lasts[a]);
  }
  const startLabel = options.from ?? dates[earliest];
  const endLabel = options.to ?? dates[latest];
  // Name the assets whose late start or early end shortens the common window (a gap of a few
  // days after a requested start date is a holiday, not a late start).
  const startDay = options.from !== undefined ? dayNumber(options.from) : days[earliest];
  const endDay = options.to !== undefined ? dayNumber(options.to) : days[latest];
  for (let a = 0; a < n; a++) {
    const r = firsts[a];
    if (r === commonLo && (r > earliest || days[r] - startDay > maxFill))
      warnings.push(
        `${ids[a]} starts on ${dates[r]}, after the window start ${startLabel}: the common window starts there`,
      );
  }
  for (let a = 0; a < n; a++) {
    const r = lasts[a];
    if (r === commonHi && (r < latest || endDay - days[r] > maxFill))
      warnings.push(`${ids[a]} ends on ${dates[r]}, before the window end ${endLabel}: the common window ends there`);
  }
  if (commonLo > commonHi) {
    const starter = firsts.indexOf(commonLo);
    const ender = lasts.indexOf(commonHi);
    throw fail(
      `no common dates: ${ids[starter]} starts on ${dates[commonLo]}, after ${ids[ender]} ends on ${dates[commonHi]}`,
      ids[starter],
      dates[commonLo],
    );
  }

  const columns = cols.map((c) => table.closes[c]);
  const has = (a: number, r: number) => Number.isFinite(columns[a][r]);
  // Candidate dates: some selected asset has a price there.
  const candidates: number[] = [];
  for (let r = commonLo; r <= commonHi; r++) if (pricedOn[r] > 0) candidates.push(r);

  const points: SamplePoint[] = [];
  const missingAt = new Int32Array(n); // sample points lost because this asset had no (recent) price
  const filled = new Int32Array(n);
  if (frequency === 'daily') {
    // A date is a sample point when every selected asset has a price there.
    let incomplete = false;
    for (let slot = 0; slot < candidates.length; slot++) {
      const r = candidates[slot];
      if (pricedOn[r] === n) points.push({ row: r, period: days[r], slot });
      else incomplete = true;
    }
    if (incomplete)
      for (let a = 0; a < n; a++) {
        const column = columns[a];
        for (let slot = 0; slot < candidates.length; slot++)
          if (!Number.isFinite(column[candidates[slot]])) missingAt[a]++;
      }
  } else {
    const periodOf = (r: number) => periods[r];
    const stale: string[] = [];
    for (let k = 0; k < candidates.length;) {
      const period = periodOf(candidates[k]);
      let e = k;
      while (e + 1 < candidates.length && periodOf(candidates[e + 1]) === period) e++;
      const end = candidates[e];
      const priceRows = new Int32Array(n).fill(-1);
      for (let a = 0; a < n; a++)
        for (let j = e; j >= k; j--) {
          const r = candidates[j];
          if (days[end] - days[r] > maxFill) break;
          if (has(a, r)) {
            priceRows[a] = r;
            break;
          }
        }
      let all = true;
      for (let a = 0; a < n; a++) {
        if (priceRows[a] === -1) {
          all = false;
          missingAt[a]++;
          stale.push(`${ids[a]} ${dates[end]}`);
        }
      }
      if (all) {
        for (let a = 0; a < n; a++) if (priceRows[a] !== end) filled[a]++;
        points.push({ row: end, priceRows, period, slot: e });
      }
      k = e + 1;
    }
    if (stale.length > 0)
      warnings.push(
        `dropped ${stale.length} period end(s) where an asset had no price within ${maxFill} days: ${listed(stale)}`,
      );
    // A last period cut short by the data or the window is not a whole period: drop it. Its last
    // trading day may fall a weekend plus a holiday before the calendar end (4 days).
    const last = points[points.length - 1];
    if (last && points.length > 1) {
      const periodEnd = frequency === 'weekly' ? last.period * 7 + 3 : dayNumber(endOfMonth(dates[last.row]));
      if (periodEnd - days[last.row] > Math.max(4, maxFill)) {
        points.pop();
        warnings.push(
          `dropped the incomplete last ${frequency === 'weekly' ? 'week' : 'month'} ending ${dates[last.row]}`,
        );
      }
    }
  }

  // Returns between consecutive sample points, unless a hole lies between them.
  const pairs: number[] = [];
  const holes: string[] = [];
  for (let k = 1; k < points.length; k++) {
    const a = points[k - 1];
    const b = points[k];
    const adjacent =
      frequency === 'daily' ? days[b.row] - days[a.row] <= maxFill || b.slot - a.slot === 1 : b.period - a.period === 1;
    if (adjacent) pairs.push(k);
    else holes.push(`${dates[a.row]} to ${dates[b.row]}`);
  }
  if (holes.length > 0)
    warnings.push(
      `dropped ${holes.length} return(s) spanning missing prices longer than ${maxFill} days: ${listed(holes)}`,
    );
  if (frequency === 'daily') {
    const culprits = ids.map((id, a) => [id, missingAt[a]] as const).filter(([, m]) => m > 0);
    if (culprits.length > 0) {
      const dropped = candidates.length - points.length;
      warnings.push(
        `dropped ${dropped} date(s) inside the common window on which not every asset had a price ` +
          `(missing: ${culprits.map(([id, m]) => `${id} on ${m}`).join(', ')})`,
      );
    }
  }

  const t = pairs.length;
  const returns = zeros(t, n);
  const out = returns.data;
  const lowest = new Float64Array(n);
  const highest = new Float64Array(n);
  convertedReturns(table, days, cols, ids, points, pairs, options, maxFill, fail, warnings, out, lowest, highest);

  if (t < minObservations) {
    const starter = firsts.indexOf(commonLo);
    throw fail(
      `only ${t} common ${frequency} return(s) from ${dates[commonLo]} to ${dates[commonHi]}; at least ${minObservations} are needed` +
        (commonLo > earliest ? ` (${ids[starter]} starts on ${dates[commonLo]})` : ''),
      ids[starter],
      dates[commonLo],
    );
  }
  for (let a = 0; a < n; a++) {
    const min = lowest[a];
    if (t >= 2 && min === highest[a]) {
      const from = dates[points[pairs[0] - 1].row];
      throw fail(
        min === 0
          ? `prices of ${ids[a]} are constant from ${from} to ${dates[points[pairs[t - 1]].row]}: no risk can be estimated`
          : `every return of ${ids[a]} is the same: zero variance`,
        ids[a],
        from,
      );
    }
  }

  const desmoothing: ReturnsResult['desmoothing'] = [];
  for (const asset of options.desmooth ?? []) {
    const a = ids.indexOf(asset);
    if (a === -1) throw new InputError(`cannot desmooth '${asset}': it is not a selected asset`, { path: 'desmooth' });
    if (t < MIN_DESMOOTH_OBSERVATIONS)
      throw fail(
        `cannot desmooth ${asset}: ${t} returns, at least ${MIN_DESMOOTH_OBSERVATIONS} are needed to fit its smoothing`,
        asset,
      );
    const column = Float64Array.from({ length: t }, (_, s) => out[s * n + a]);
    const d = desmooth(column);
    for (let s = 0; s < t; s++) out[s * n + a] = d.returns[s];
    desmoothing.push({ asset, theta: d.theta, smoothingIndex: d.smoothingIndex });
    warnings.push(
      `desmoothed ${asset} (Getmansky, Lo and Makarov 2004): theta ${d.theta.map((v) => v.toFixed(3)).join(' / ')}`,
    );
  }

  // Dates dropped: priced dates (daily) or priced periods (weekly, monthly) in the window unused.
  const used = new Set<number>();
  for (const k of pairs) {
    used.add(points[k - 1].row);
    used.add(points[k].row);
  }
  // Daily: every used date is a sample point, where every asset is priced, so an asset's unused
  // priced dates are its priced dates less the used ones.
  const periodOf = (r: number) => periods[r];
  const usedPeriods = frequency === 'daily' ? undefined : new Set([...used].map(periodOf));
  const coverage: AssetCoverage[] = ids.map((asset, a) => {
    let dropped = 0;
    if (usedPeriods === undefined) dropped = counts[a] - used.size;
    else {
      const pricedPeriods = new Set(pricedRows(columns[a], lo, hi).map(periodOf));
      for (const p of pricedPeriods) dropped += usedPeriods.has(p) ? 0 : 1;
    }
    return {
      asset,
      firstDate: dates[firsts[a]],
      lastDate: dates[lasts[a]],
      observations: t,
      datesDropped: dropped,
      pricesFilled: filled[a],
    };
  });

  return {
    assets: ids,
    dates: pairs.map((k) => dates[points[k].row]),
    returns,
    coverage,
    warnings,
    frequency,
    method: options.method,
    desmoothing,
  };
}

/** The longest gap (calendar days) of a series priced as often as asked: pricingFrequency's limits. */
const SHORT_GAP: Record<Frequency, number> = { daily: 5, weekly: 10, monthly: 0x7fffffff };

/** The table column of each selected id; an unknown or repeated id is an error naming its place. */
function selectedColumns(tableAssets: readonly string[], ids: readonly string[]): number[] {
  const column = new Map<string, number>();
  for (let c = tableAssets.length - 1; c >= 0; c--) column.set(tableAssets[c], c); // the first of repeats
  const seen = new Set<string>();
  return ids.map((id, k) => {
    const c = column.get(id);
    if (c === undefined) throw new InputError(`no price history for asset '${id}'`, { path: `assets[${k}]` });
    if (seen.has(id)) throw new InputError(`asset '${id}' is selected twice`, { path: `assets[${k}]` });
    seen.add(id);
    return c;
  });
}

/**
 * One price column inside the window [lo, hi): writes its first and last priced rows and the
 * number of gaps between its prices of at most `shortGap` days, counts it in `pricedOn` for each
 * priced row, and returns how many prices it has.
 */
function scanColumn(
  column: Float64Array,
  lo: number,
  hi: number,
  days: Int32Array,
  shortGap: number,
  pricedOn: Int32Array,
  firsts: Int32Array,
  lasts: Int32Array,
  shortGaps: Int32Array,
  a: number,
): number {
  let count = 0;
  let short = 0;
  let first = -1;
  let last = -1;
  for (let r = lo; r < hi; r++) {
    if (!Number.isFinite(column[r])) continue;
    if (last === -1) first = r;
    else if (days[r] - days[last] <= shortGap) short++;
    last = r;
    count++;
    pricedOn[r]++;
  }
  firsts[a] = first;
  lasts[a] = last;
  shortGaps[a] = short;
  return count;
}

/** The priced rows of a column inside the window [lo, hi). */
function pricedRows(column: Float64Array, lo: number, hi: number): number[] {
  const rows: number[] = [];
  for (let r = lo; r < hi; r++) if (Number.isFinite(column[r])) rows.push(r);
  return rows;
}

/**
 * The returns (T x N, row-major, into `out`) between the sample points of each pair, from price
 * levels in the base currency where an asset is priced in another one, with each asset's least
 * and greatest return. An FX rate may be carried forward over at most maxFill days; a rate
 * missing on a needed date is an error naming the asset, the currency and the date (the first
 * such asset, then its first such date). `days` holds the day number of every row in the window,
 * which every sample point's rows are.
 */
function convertedReturns(
  table: PriceTable,
  days: Int32Array,
  cols: readonly number[],
  ids: readonly string[],
  points: readonly SamplePoint[],
  pairs: readonly number[],
  options: BuildReturnsOptions,
  maxFill: number,
  fail: (message: string, asset?: string, date?: string) => InputError,
  warnings: string[],
  out: Float64Array,
  lowest: Float64Array,
  highest: Float64Array,
): void {
  const n = cols.length;
  const p = points.length;
  const needed = new Uint8Array(p);
  for (const k of pairs) needed[k - 1] = needed[k] = 1;
  const pairIndex = Int32Array.from(pairs);
  const base = options.baseCurrency;
  const currencies = cols.map((c) => table.currencies?.[c]);
  if (base === undefined) {
    const distinct = new Set(currencies.filter((c) => c !== undefined));
    if (distinct.size > 1)
      warnings.push(`assets are priced in ${[...distinct].join(', ')} and no base currency is set: no conversion`);
  }
  // The row whose price stands for each sample point: on daily data the point's own row, the
  // same for every asset; weekly and monthly points carry one per asset.
  const pointRows = new Int32Array(p);
  for (let k = 0; k < p; k++) pointRows[k] = points[k].row;
  const perAsset = p > 0 && points[0].priceRows !== undefined;
  const ownRows = new Int32Array(p);
  const levels = new Float64Array(BLOCK * p);
  let fxDays: Int32Array | undefined;
  const log = options.method === 'log';
  lowest.fill(Infinity);
  highest.fill(-Infinity);
  for (let a0 = 0; a0 < n; a0 += BLOCK) {
    const width = Math.min(BLOCK, n - a0);
    for (let j = 0; j < width; j++) {
      const a = a0 + j;
      let rows = pointRows;
      if (perAsset) {
        for (let k = 0; k < p; k++) ownRows[k] = points[k].priceRows![a];
        rows = ownRows;
      }
      const at = j * p;
      readLevels(table.closes[cols[a]], rows, needed, levels, at);
      const currency = currencies[a];
      if (base === undefined || currency === undefined || currency === base) continue;
      const f = options.fx?.assets.indexOf(currency) ?? -1;
      if (f === -1 || !options.fx)
        throw fail(`${ids[a]} is priced in ${currency} but there is no ${currency} rate series in ${base}`, ids[a]);
      fxDays ??= Int32Array.from(options.fx.dates, dayNumber);
      for (let k = 0; k < p; k++) {
        if (!needed[k]) continue;
        const date = table.dates[rows[k]];
        const rate = rateOn(fxDays, options.fx.closes[f], days[rows[k]], maxFill);
        if (rate === undefined)
          throw fail(
            `no ${currency} rate in ${base} for ${ids[a]} on ${date} (none within ${maxFill} days before)`,
            ids[a],
            date,
          );
        levels[at + k] *= rate;
      }
    }
    blockReturns(levels, p, width, pairIndex, log, out, n, a0, lowest, highest);
  }
}

/** Assets whose returns are taken together: a block writes whole cache lines of each output row. */
const BLOCK = 8;

/** The price at each needed sample point, from the row that stands for it, into `levels` from `at`. */
function readLevels(
  closes: Float64Array,
  rows: Int32Array,
  needed: Uint8Array,
  levels: Float64Array,
  at: number,
): void {
  for (let k = 0; k < rows.length; k++) if (needed[k]) levels[at + k] = closes[rows[k]];
}

/**
 * Columns a0 .. a0 + width - 1 of `out`, whose levels are `levels[j * p + k]` (point k of the
 * block's asset j): row s takes the return between sample points pairs[s] - 1 and pairs[s]; each
 * column's least and greatest return update `lowest` and `highest`. Row by row, so that the N x T
 * output is written in adjacent pieces rather than one column (one cache line per row) at a time.
 * Nothing runs before the loop: V8 compiles this during its first call, and code that ran only
 * before the function had its type feedback would be compiled blind and deoptimise.
 */
function blockReturns(
  levels: Float64Array,
  p: number,
  width: number,
  pairs: Int32Array,
  log: boolean,
  out: Float64Array,
  n: number,
  a0: number,
  lowest: Float64Array,
  highest: Float64Array,
): void {
  for (let s = 0; s < pairs.length; s++) {
    const k = pairs[s];
    const row = s * n + a0;
    for (let j = 0; j < width; j++) {
      const at = j * p + k;
      const ratio = levels[at] / levels[at - 1];
      const v = log ? Math.log(ratio) : ratio - 1;
      out[row + j] = v;
      if (v < lowest[a0 + j]) lowest[a0 + j] = v;
      if (v > highest[a0 + j]) highest[a0 + j] = v;
    }
  }
}

function endOfMonth(date: string): string {
  const y = Number(date.slice(0, 4));
  const m = Number(date.slice(5, 7));
  const last = new Date(Date.UTC(y, m, 0)).getUTCDate();
  return `${date.slice(0, 8)}${String(last).padStart(2, '0')}`;
}

function windowText(from?: string, to?: string): string {
  if (from === undefined && to === undefined) return '';
  return ` ${from ?? 'start'} to ${to ?? 'end'}`;
}

function listed(items: readonly string[]): string {
  return items.length <= 5 ? items.join('; ') : `${items.slice(0, 5).join('; ')} and ${items.length - 5} more`;
}
