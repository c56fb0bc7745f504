import { InputError, type InputLocation } from '../errors.js';
import type { Frequency } from '../estimators/types.js';
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
  const cols = ids.map((id, k) => {
    const c = table.assets.indexOf(id);
    if (c === -1) throw new InputError(`no price history for asset '${id}'`, { path: `assets[${k}]` });
    if (ids.indexOf(id) !== k) throw new InputError(`asset '${id}' is selected twice`, { path: `assets[${k}]` });
    return c;
  });
  const n = ids.length;

  if (options.from !== undefined && options.to !== undefined && options.from > options.to)
    throw new InputError(`the window starts (${options.from}) after it ends (${options.to})`, { path: 'window' });
  let lo = 0;
  let hi = dates.length;
  if (options.from !== undefined) while (lo < hi && dates[lo] < options.from) lo++;
  if (options.to !== undefined) while (hi > lo && dates[hi - 1] > options.to) hi--;
  const days = new Int32Array(dates.length);
  for (let r = lo; r < hi; r++) days[r] = dayNumber(dates[r]);

  // Priced rows of each asset inside the window:
  const priced = cols.map((c, a) => {
    const rows: number[] = [];
    for (let r = lo; r < hi; r++) if (Number.isFinite(table.closes[c][r])) rows.push(r);
    if (rows.length === 0)
      throw fail(
        `${ids[a]} has no price in the window${windowText(options.from, options.to)}`,
        ids[a],
        options.from !== undefined ? undefined : dates[lo],
      );
    return rows;
  });

  // Assets priced less often than asked force a coarser frequency or stop here.
  let frequency = options.frequency;
  const coarsened: string[] = [];
  priced.forEach((rows, a) => {
    const pricedDays = new Int32Array(rows.length); // a plain loop: a mapping callback costs 10x here
    for (let i = 0; i < rows.length; i++) pricedDays[i] = days[rows[i]];
    const native = pricingFrequency(pricedDays);
    if (!isCoarser(native.frequency, options.frequency)) return;
    if (options.onCoarserPricing === 'coarsen') {
      frequency = coarser(frequency, native.frequency);
      coarsened.push(ids[a]);
      return;
    }
    throw fail(
      `${ids[a]} is priced ${native.frequency} (median ${native.medianGap} days between prices), so it cannot enter a ` +
        `${options.frequency} estimate: use frequency ${native.frequency} or leave it out`,
      ids[a],
      dates[rows[1]],
    );
  });
  if (coarsened.length > 0) warnings.push(`estimating ${frequency}: ${coarsened.join(', ')} priced ${frequency}`);

  // The common window: from the latest first price to the earliest last price.
  const firsts = priced.map((rows) => rows[0]);
  const lasts = priced.map((rows) => rows[rows.length - 1]);
  const commonLo = Math.max(...firsts);
  const commonHi = Math.min(...lasts);
  const earliest = Math.min(...firsts);
  const latest = Math.max(...lasts);
  const startLabel = options.from ?? dates[earliest];
  const endLabel = options.to ?? dates[latest];
  // Name the assets whose late start or early end shortens the common window (a gap of a few
  // days after a requested start date is a holiday, not a late start).
  const startDay = options.from !== undefined ? dayNumber(options.from) : days[earliest];
  const endDay = options.to !== undefined ? dayNumber(options.to) : days[latest];
  firsts.forEach((r, a) => {
    if (r === commonLo && (r > earliest || days[r] - startDay > maxFill))
      warnings.push(
        `${ids[a]} starts on ${dates[r]}, after the window start ${startLabel}: the common window starts there`,
      );
  });
  lasts.forEach((r, a) => {
    if (r === commonHi && (r < latest || endDay - days[r] > maxFill))
      warnings.push(`${ids[a]} ends on ${dates[r]}, before the window end ${endLabel}: the common window ends there`);
  });
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
  const candidates: number[] = [];
  for (let r = commonLo; r <= commonHi; r++) {
    let any = false;
    for (let a = 0; a < n && !any; a++) any = has(a, r);
    if (any) candidates.push(r);
  }

  const points: SamplePoint[] = [];
  const missingAt = new Int32Array(n); // sample points lost because this asset had no (recent) price
  const filled = new Int32Array(n);
  if (frequency === 'daily') {
    // Asset by asset, down each price column (contiguous), rather than across the columns per date.
    const complete = new Uint8Array(candidates.length).fill(1);
    for (let a = 0; a < n; a++) {
      const column = columns[a];
      for (let slot = 0; slot < candidates.length; slot++)
        if (!Number.isFinite(column[candidates[slot]])) {
          complete[slot] = 0;
          missingAt[a]++;
        }
    }
    candidates.forEach((r, slot) => {
      if (complete[slot]) points.push({ row: r, period: days[r], slot });
    });
  } else {
    const periodOf = (r: number) => (frequency === 'weekly' ? weekIndex(days[r]) : monthIndex(dates[r]));
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

  const levels = convertedLevels(table, cols, ids, points, pairs, options, maxFill, fail, warnings);

  const t = pairs.length;
  if (t < minObservations) {
    const starter = firsts.indexOf(commonLo);
    throw fail(
      `only ${t} common ${frequency} return(s) from ${dates[commonLo]} to ${dates[commonHi]}; at least ${minObservations} are needed` +
        (commonLo > earliest ? ` (${ids[starter]} starts on ${dates[commonLo]})` : ''),
      ids[starter],
      dates[commonLo],
    );
  }
  const returns = zeros(t, n);
  const out = returns.data;
  for (let s = 0; s < t; s++) {
    const k = pairs[s];
    for (let a = 0; a < n; a++) {
      const p0 = levels[(k - 1) * n + a];
      const p1 = levels[k * n + a];
      out[s * n + a] = options.method === 'log' ? Math.log(p1 / p0) : p1 / p0 - 1;
    }
  }
  for (let a = 0; a < n; a++) {
    let min = Infinity;
    let max = -Infinity;
    for (let s = 0; s < t; s++) {
      const v = out[s * n + a];
      if (v < min) min = v;
      if (v > max) max = v;
    }
    if (t >= 2 && min === max) {
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
  const usedRow = new Uint8Array(dates.length);
  for (const k of pairs) {
    used.add(points[k - 1].row);
    used.add(points[k].row);
    usedRow[points[k - 1].row] = usedRow[points[k].row] = 1;
  }
  const coverage: AssetCoverage[] = ids.map((asset, a) => {
    const rows = priced[a];
    let dropped = 0;
    if (frequency === 'daily') for (let i = 0; i < rows.length; i++) dropped += 1 - usedRow[rows[i]];
    else {
      const periodOf = (r: number) => (frequency === 'weekly' ? weekIndex(days[r]) : monthIndex(dates[r]));
      const usedPeriods = new Set([...used].map(periodOf));
      const pricedPeriods = new Set(rows.map(periodOf));
      for (const p of pricedPeriods) dropped += usedPeriods.has(p) ? 0 : 1;
    }
    return {
      asset,
      firstDate: dates[rows[0]],
      lastDate: dates[rows[rows.length - 1]],
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

/**
 * Price levels at the sample points (row-major points x assets), in the base currency where an
 * asset is priced in another one. An FX rate may be carried forward over at most maxFill days;
 * a rate missing on a needed date is an error naming the asset, the currency and the date.
 */
function convertedLevels(
  table: PriceTable,
  cols: readonly number[],
  ids: readonly string[],
  points: readonly SamplePoint[],
  pairs: readonly number[],
  options: BuildReturnsOptions,
  maxFill: number,
  fail: (message: string, asset?: string, date?: string) => InputError,
  warnings: string[],
): Float64Array {
  const n = cols.length;
  const levels = new Float64Array(points.length * n);
  const needed = new Uint8Array(points.length);
  for (const k of pairs) needed[k - 1] = needed[k] = 1;
  const base = options.baseCurrency;
  const currencies = cols.map((c) => table.currencies?.[c]);
  if (base === undefined) {
    const distinct = new Set(currencies.filter((c) => c !== undefined));
    if (distinct.size > 1)
      warnings.push(`assets are priced in ${[...distinct].join(', ')} and no base currency is set: no conversion`);
  }
  for (let a = 0; a < n; a++) {
    const closes = table.closes[cols[a]];
    const currency = currencies[a];
    const convert = base !== undefined && currency !== undefined && currency !== base;
    let rates: Float64Array | undefined;
    let fxDays: Int32Array | undefined;
    if (convert) {
      const f = options.fx?.assets.indexOf(currency) ?? -1;
      if (f === -1 || !options.fx)
        throw fail(`${ids[a]} is priced in ${currency} but there is no ${currency} rate series in ${base}`, ids[a]);
      rates = options.fx.closes[f];
      fxDays = Int32Array.from(options.fx.dates, dayNumber);
    }
    for (let k = 0; k < points.length; k++) {
      if (!needed[k]) continue;
      const point = points[k];
      const r = point.priceRows ? point.priceRows[a] : point.row;
      let value = closes[r];
      if (rates && fxDays) {
        const date = table.dates[r];
        const rate = rateOn(fxDays, rates, dayNumber(date), maxFill);
        if (rate === undefined)
          throw fail(
            `no ${currency} rate in ${base} for ${ids[a]} on ${date} (none within ${maxFill} days before)`,
            ids[a],
            date,
          );
        value *= rate;
      }
      levels[k * n + a] = value;
    }
  }
  return levels;
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
