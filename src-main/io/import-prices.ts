import type { Store } from '../store/store.js';
import { commitOf, planImport, type ImportPlan } from './plan-import.js';
import { readPriceFile, type ParsedPriceFile, type ReadPriceFileOptions } from './read-price-file.js';
import { validatePrices, type ValidationReport } from './validate-prices.js';
import type { ImportBatch } from '../store/store.js';

export interface ImportProgress {
  phase: 'reading' | 'writing';
  rows: number;
  /** 0 to 100 over the whole import (reading is the first 90). */
  percent: number;
}

export interface PriceImportOptions extends Omit<ReadPriceFileOptions, 'onProgress'> {
  universe: string;
  /** Confirms the changed values shown by a first run. */
  apply?: boolean;
  /** Currency given to assets the store does not know yet. */
  currency?: string;
  note?: string;
  suspiciousMove?: number;
  onProgress?: (p: ImportProgress) => void;
}

export type PriceImportOutcome =
  | { status: 'invalid'; report: ValidationReport }
  | { status: 'needs-confirmation'; report: ValidationReport; plan: ImportPlan }
  | { status: 'applied'; report: ValidationReport; plan: ImportPlan; batch: ImportBatch }
  /** Every price is stored already and every asset is in the universe: nothing was written. */
  | { status: 'unchanged'; report: ValidationReport; plan: ImportPlan };

/** Reads and validates a price file; nothing touches the store. */
export async function analysePriceFile(
  path: string,
  options: Omit<PriceImportOptions, 'universe' | 'apply' | 'currency' | 'note'> = {},
): Promise<{ parsed: ParsedPriceFile; report: ValidationReport }> {
  const parsed = await readPriceFile(path, {
    ...options,
    onProgress: (p) =>
      options.onProgress?.({
        phase: 'reading',
        rows: p.rows,
        percent: p.totalBytes ? (90 * p.bytesRead) / p.totalBytes : 90,
      }),
  });
  return { parsed, report: validatePrices(parsed, options.suspiciousMove) };
}

/**
 * The whole import: read and validate (an invalid file writes nothing and never opens the
 * store), compare with the stored series, and write everything as one transaction, unless
 * stored values would change without `apply`. `store('read')` returns the store if it exists;
 * `store('write')` opens or creates it. Cancelling through `signal` leaves the store as it was.
 */
export async function importPriceFile(
  store: (mode: 'read' | 'write') => Store | undefined,
  path: string,
  options: PriceImportOptions,
): Promise<PriceImportOutcome> {
  const { parsed, report } = await analysePriceFile(path, options);
  if (!report.ok) return { status: 'invalid', report };
  const existing = store('read');
  const ids = parsed.assets.map((a) => a.id);
  const plan = planImport(
    parsed,
    existing ? existing.priceSeriesMany(ids) : new Map(),
    new Set(existing ? ids.filter((id) => existing.getAsset(id)) : []),
    options.universe,
  );
  if (plan.needsConfirmation && !options.apply) return { status: 'needs-confirmation', report, plan };
  const members = new Set(existing?.getUniverse(options.universe)?.members.map((m) => m.assetId));
  if (plan.newPoints + plan.changedPoints === 0 && ids.every((id) => members.has(id)))
    return { status: 'unchanged', report, plan };
  const target = store('write')!;
  const batch = target.commitPrices({
    ...commitOf(parsed, plan, options),
    signal: options.signal,
    onProgress: (done, total) =>
      options.onProgress?.({ phase: 'writing', rows: parsed.dataRows, percent: 90 + (10 * done) / total }),
  });
  return { status: 'applied', report, plan, batch };
}
