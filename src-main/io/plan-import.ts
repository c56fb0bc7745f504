import { isoFromDay } from '../store/days.js';
import type { AssetInput, PriceCommit, PriceSeries, PriceWrite } from '../store/store.js';
import type { ParsedPriceFile } from './read-price-file.js';

const LISTED_CHANGES = 50;

export interface PriceChange {
  date: string;
  stored: number;
  incoming: number;
}

export interface AssetPlan {
  asset: string;
  newAsset: boolean;
  /** Dates the store does not have yet for this asset. */
  newDates: number;
  /** Dates whose stored close differs from the file's (the first few listed). */
  changedCount: number;
  changed: PriceChange[];
  unchanged: number;
}

export interface ImportPlan {
  universe: string;
  newAssets: number;
  newPoints: number;
  changedPoints: number;
  unchangedPoints: number;
  assets: AssetPlan[];
  /** Changed values are written only when the user confirms (`--apply`). */
  needsConfirmation: boolean;
}

/**
 * What importing a validated file would do against the stored series: new dates are added;
 * a close that differs from the stored one (any difference in the stored number) is a change
 * shown to the user before it is applied.
 */
export function planImport(
  parsed: ParsedPriceFile,
  stored: ReadonlyMap<string, PriceSeries>,
  knownAssets: ReadonlySet<string>,
  universe: string,
): ImportPlan {
  const assets = parsed.assets.map((a): AssetPlan => {
    const s = stored.get(a.id);
    const days = s ? s.days : new Int32Array(0);
    const changed: PriceChange[] = [];
    let newDates = 0;
    let changedCount = 0;
    let unchanged = 0;
    let j = 0;
    for (let i = 0; i < parsed.days.length; i++) {
      const close = a.closes[i];
      if (close !== close) continue; // no price that day
      const day = parsed.days[i];
      while (j < days.length && days[j] < day) j++;
      if (j < days.length && days[j] === day) {
        if (s!.closes[j] === close) unchanged++;
        else {
          changedCount++;
          if (changed.length < LISTED_CHANGES)
            changed.push({ date: isoFromDay(day), stored: s!.closes[j], incoming: close });
        }
      } else newDates++;
    }
    return { asset: a.id, newAsset: !knownAssets.has(a.id), newDates, changedCount, changed, unchanged };
  });
  const sum = (f: (p: AssetPlan) => number) => assets.reduce((t, p) => t + f(p), 0);
  const changedPoints = sum((p) => p.changedCount);
  return {
    universe,
    newAssets: assets.filter((p) => p.newAsset).length,
    newPoints: sum((p) => p.newDates),
    changedPoints,
    unchangedPoints: sum((p) => p.unchanged),
    assets,
    needsConfirmation: changedPoints > 0,
  };
}

/** The store commit of a validated file: every point (equal ones are no-ops in the store). */
export function commitOf(
  parsed: ParsedPriceFile,
  plan: ImportPlan,
  options: { currency?: string; note?: string },
): Omit<PriceCommit, 'onProgress' | 'signal'> {
  const assets: AssetInput[] = plan.assets
    .filter((p) => p.newAsset)
    .map((p) => (options.currency ? { id: p.asset, currency: options.currency } : { id: p.asset }));
  const touched = new Set(plan.assets.filter((p) => p.newDates > 0 || p.changedCount > 0).map((p) => p.asset));
  const prices: PriceWrite[] = parsed.assets
    .filter((a) => touched.has(a.id))
    .map((a) => {
      const days: number[] = [];
      const closes: number[] = [];
      parsed.days.forEach((day, i) => {
        if (a.closes[i] === a.closes[i]) {
          days.push(day);
          closes.push(a.closes[i]);
        }
      });
      return { assetId: a.id, days: Int32Array.from(days), closes: Float64Array.from(closes) };
    });
  return {
    source: parsed.file,
    ...(options.note !== undefined ? { note: options.note } : {}),
    assets,
    prices,
    universe: { name: plan.universe, assets: parsed.assets.map((a) => a.id) },
  };
}
