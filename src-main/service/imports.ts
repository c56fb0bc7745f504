import { mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ServiceFailure, type ImplementationOf } from '../../shared-core/contract/define.js';
import type { ImportJob, ImportReport, ServiceApiTable } from '../../shared-core/contract/service-api.js';
import { InputError, formatInputError } from '../../shared-core/errors.js';
import { analysePriceFile } from '../io/import-prices.js';
import { commitOf, planImport, type ImportPlan } from '../io/plan-import.js';
import type { ParsedPriceFile } from '../io/read-price-file.js';
import type { ValidationReport } from '../io/validate-prices.js';
import { dayFromIso } from '../store/days.js';
import type { PriceCommit, PriceSeries, Store } from '../store/store.js';

type Part = Pick<
  ImplementationOf<ServiceApiTable>,
  'imports.start' | 'imports.status' | 'imports.confirm' | 'imports.cancel' | 'imports.history'
>;

/**
 * Price imports as jobs, so that progress and cancel work the same over IPC and HTTP: `start`
 * returns at once and the caller polls `status`. A job checks the file (streamed from disk;
 * uploaded text is first written to an owner-only temporary file), compares it with the store
 * and waits; only `confirm` writes, in one transaction. Cancel during the check stops reading;
 * the store is untouched until the write, and the write is all or nothing.
 */
interface Job {
  id: string;
  fileName: string;
  universe: string;
  currency?: string;
  threshold?: number;
  path: string;
  temporaryDir?: string;
  state: ImportJob['state'];
  progress: ImportJob['progress'];
  report: ImportReport | null;
  message: string | null;
  applied: ImportJob['applied'];
  parsed?: ParsedPriceFile;
  plan?: ImportPlan;
  controller: AbortController;
  /** The running check or write, so tests and callers can wait for it. */
  work: Promise<void>;
}

/** Share of the percent that src-main/io gives to the reading pass (the rest is writing). */
const READING_SHARE = 90;
const KEPT_JOBS = 50;
const TERMINAL: readonly ImportJob['state'][] = ['invalid', 'applied', 'cancelled', 'failed'];

function snapshot(job: Job): ImportJob {
  return {
    jobId: job.id,
    fileName: job.fileName,
    universe: job.universe,
    state: job.state,
    progress: { ...job.progress },
    report: job.report,
    message: job.message,
    applied: job.applied,
  };
}

/** The io module's report and plan in the service's words. */
export function reportOut(report: ValidationReport, plan: ImportPlan | undefined): ImportReport {
  const planned = new Map((plan?.assets ?? []).map((a) => [a.asset, a]));
  return {
    fileName: report.file,
    layout: report.form,
    delimiter: report.delimiter,
    decimal: report.decimal,
    dateOrder: report.dateOrder === 'ambiguous' ? null : report.dateOrder,
    dateOrderAmbiguous: report.dateOrder === 'ambiguous',
    rows: report.dataRows,
    errors: report.problems.map((p) => ({ line: p.line ?? null, column: p.column ?? null, message: p.message })),
    suspiciousMoveThreshold: report.suspiciousMove,
    assets: report.assets.map((a) => {
      const p = planned.get(a.asset);
      return {
        asset: a.asset,
        rows: a.rowsRead,
        firstDate: a.firstDate ?? null,
        lastDate: a.lastDate ?? null,
        missingDays: a.missingDays,
        emptyCells: a.emptyCells,
        nonPositive: a.nonPositive.map((c) => ({ line: c.line, column: c.column, message: c.message })),
        unparseable: a.unparseable.map((c) => ({ line: c.line, column: c.column, message: c.message })),
        unparseableCount: a.unparseableCount,
        repeatedDates: a.repeatedDates.map((r) => r.date),
        suspiciousMoves: a.suspiciousMoves.map((m) => ({ date: m.date, move: m.change })),
        newDates: p?.newDates ?? 0,
        changedValues: p?.changedCount ?? 0,
        changes: p?.changed ?? [],
        isNewAsset: p?.newAsset ?? false,
      };
    }),
  };
}

/** The commit without the points whose stored close differs: only new dates are added. */
export function withoutChangedPoints(
  commit: Omit<PriceCommit, 'onProgress' | 'signal'>,
  stored: ReadonlyMap<string, PriceSeries>,
): Omit<PriceCommit, 'onProgress' | 'signal'> {
  return {
    ...commit,
    prices: commit.prices.map((write) => {
      const s = stored.get(write.assetId);
      if (!s) return write;
      const storedClose = new Map(s.dates.map((d, i) => [dayFromIso(d), s.closes[i]]));
      const days = 'days' in write ? Array.from(write.days) : write.dates.map(dayFromIso);
      const keptDays: number[] = [];
      const closes: number[] = [];
      days.forEach((d, i) => {
        const before = storedClose.get(d);
        if (before !== undefined && before !== write.closes[i]) return;
        keptDays.push(d);
        closes.push(write.closes[i]);
      });
      return { assetId: write.assetId, days: Int32Array.from(keptDays), closes };
    }),
  };
}

function isFile(path: string): boolean {
  try {
    return statSync(path).isFile();
  } catch {
    return false;
  }
}

function onlyAmbiguousDates(report: ValidationReport): boolean {
  return report.dateOrder === 'ambiguous' && report.problemCount === 1;
}

export interface ImportJobs extends Part {
  /** Resolves when the job's current check or write has finished (for tests and shutdown). */
  settled(jobId: string): Promise<ImportJob>;
  /** Cancels running jobs and removes their temporary files. */
  dispose(): void;
}

export function importMethods(store: Store): ImportJobs {
  const jobs = new Map<string, Job>();
  let counter = 0;

  function job(jobId: string): Job {
    const found = jobs.get(jobId);
    if (!found)
      throw new ServiceFailure('not-found', `no import with id '${jobId}' (imports are kept while the app runs)`);
    return found;
  }

  function cleanUp(j: Job): void {
    if (j.temporaryDir) rmSync(j.temporaryDir, { recursive: true, force: true });
    j.temporaryDir = undefined;
    j.parsed = undefined;
  }

  function finish(j: Job, state: ImportJob['state'], message: string | null): void {
    j.state = state;
    j.message = message;
    if (TERMINAL.includes(state)) cleanUp(j);
  }

  function failed(j: Job, error: unknown): void {
    if (j.controller.signal.aborted) return finish(j, 'cancelled', 'Cancelled; nothing was written.');
    if (error instanceof InputError) return finish(j, 'invalid', `${formatInputError(error)}. Nothing was written.`);
    finish(j, 'failed', `The import stopped: ${(error as Error).message ?? String(error)}. Nothing was written.`);
  }

  function plan(j: Job, parsed: ParsedPriceFile): ImportPlan {
    const ids = parsed.assets.map((a) => a.id);
    const known = new Set(ids.filter((id) => store.getAsset(id)));
    return planImport(parsed, store.priceSeriesMany(ids), known, j.universe);
  }

  async function check(j: Job, dateOrder?: 'day-first' | 'month-first'): Promise<void> {
    j.state = 'checking';
    j.progress = { rows: 0, percent: 0 };
    j.message = null;
    try {
      const { parsed, report } = await analysePriceFile(j.path, {
        file: j.fileName,
        ...(dateOrder ? { dateOrder } : {}),
        ...(j.threshold !== undefined ? { suspiciousMove: j.threshold } : {}),
        signal: j.controller.signal,
        onProgress: (p) => {
          j.progress = { rows: p.rows, percent: Math.min(100, (100 * p.percent) / READING_SHARE) };
        },
      });
      if (j.controller.signal.aborted) return finish(j, 'cancelled', 'Cancelled; nothing was written.');
      j.progress = { rows: parsed.dataRows, percent: 100 };
      if (onlyAmbiguousDates(report)) {
        j.parsed = parsed;
        j.report = reportOut(report, undefined);
        return finish(j, 'needs-date-order', null);
      }
      if (!report.ok) {
        j.report = reportOut(report, undefined);
        const count = report.problemCount;
        const listed = report.listed.length < count ? `the first ${report.listed.length} listed below` : 'listed below';
        return finish(
          j,
          'invalid',
          `The file cannot be imported as it is (${count} problem${count === 1 ? '' : 's'}, ${listed}). Nothing was written.`,
        );
      }
      j.parsed = parsed;
      j.plan = plan(j, parsed);
      j.report = reportOut(report, j.plan);
      finish(j, 'ready', null);
    } catch (error) {
      failed(j, error);
    }
  }

  function write(j: Job, applyChanges: boolean): void {
    // Cancelled between the confirmation and this turn of the event loop: nothing to do.
    if (j.controller.signal.aborted) return;
    const parsed = j.parsed;
    try {
      if (!parsed) throw new Error(`import ${j.id} has no checked file to write`);
      j.state = 'applying';
      j.progress = { rows: parsed.dataRows, percent: 0 };
      // Planned again against the store as it is now: another import may have run meanwhile.
      const current = plan(j, parsed);
      const ids = parsed.assets.map((a) => a.id);
      let commit = commitOf(parsed, current, { currency: j.currency, note: `imported in the app into ${j.universe}` });
      if (!applyChanges && current.changedPoints > 0) commit = withoutChangedPoints(commit, store.priceSeriesMany(ids));
      const batch = store.commitPrices({
        ...commit,
        signal: j.controller.signal,
        onProgress: (done, total) => {
          j.progress = { rows: parsed.dataRows, percent: (100 * done) / total };
        },
      });
      j.progress = { rows: parsed.dataRows, percent: 100 };
      j.applied = { assetsAdded: current.newAssets, pricesAdded: batch.added, pricesChanged: batch.replaced };
      finish(j, 'applied', null);
    } catch (error) {
      failed(j, error);
    }
  }

  function remember(j: Job): void {
    jobs.set(j.id, j);
    if (jobs.size <= KEPT_JOBS) return;
    for (const [id, old] of jobs)
      if (TERMINAL.includes(old.state)) {
        jobs.delete(id);
        if (jobs.size <= KEPT_JOBS) break;
      }
  }

  return {
    async 'imports.start'({ source, universe, currency, suspiciousMoveThreshold }) {
      let path: string;
      let fileName: string;
      let temporaryDir: string | undefined;
      if (source.kind === 'path') {
        if (!isFile(source.path)) throw new ServiceFailure('bad-request', `no file at '${source.path}'`, 'source.path');
        path = source.path;
        fileName = source.path;
      } else {
        temporaryDir = mkdtempSync(join(tmpdir(), 'holdfast-import-'));
        path = join(temporaryDir, 'upload.csv');
        writeFileSync(path, source.text, { mode: 0o600 });
        fileName = source.fileName;
      }
      const j: Job = {
        id: `import-${++counter}`,
        fileName,
        universe,
        currency,
        threshold: suspiciousMoveThreshold,
        path,
        temporaryDir,
        state: 'checking',
        progress: { rows: 0, percent: 0 },
        report: null,
        message: null,
        applied: null,
        controller: new AbortController(),
        work: Promise.resolve(),
      };
      remember(j);
      j.work = check(j);
      return snapshot(j);
    },
    async 'imports.status'({ jobId }) {
      return snapshot(job(jobId));
    },
    async 'imports.confirm'({ jobId, dateOrder, applyChanges }) {
      const j = job(jobId);
      if (j.state !== 'ready' && j.state !== 'needs-date-order')
        throw new ServiceFailure(
          'conflict',
          `import '${j.fileName}' is ${j.state}; only a checked import can be written`,
        );
      if (j.state === 'needs-date-order') {
        if (dateOrder !== 'day-first' && dateOrder !== 'month-first')
          throw new ServiceFailure(
            'bad-request',
            "the dates of this file read both day-first and month-first; answer 'day-first' or 'month-first'",
            'dateOrder',
          );
        j.work = check(j, dateOrder).then(() => {
          if (j.state === 'ready')
            return new Promise<void>((resolve) => setImmediate(() => resolve(write(j, applyChanges))));
        });
        return snapshot(j);
      }
      j.state = 'applying';
      j.work = new Promise<void>((resolve) => setImmediate(() => resolve(write(j, applyChanges))));
      return snapshot(j);
    },
    async 'imports.cancel'({ jobId }) {
      const j = job(jobId);
      if (j.state === 'applied')
        throw new ServiceFailure(
          'conflict',
          `import '${j.fileName}' is written already; it can no longer be cancelled`,
        );
      if (TERMINAL.includes(j.state)) return snapshot(j);
      j.controller.abort();
      if (j.state !== 'checking') finish(j, 'cancelled', 'Cancelled; nothing was written.');
      else await j.work;
      return snapshot(j);
    },
    async 'imports.history'() {
      return store
        .listBatches()
        .sort((a, b) => b.id - a.id)
        .map((b) => ({
          id: String(b.id),
          source: b.source,
          importedAt: b.importedAt,
          added: b.added,
          replaced: b.replaced,
          assets: b.assets,
          note: b.note ?? '',
        }));
    },
    async settled(jobId) {
      const j = job(jobId);
      let seen: Promise<void> | undefined;
      while (seen !== j.work) {
        seen = j.work;
        await seen;
      }
      return snapshot(j);
    },
    dispose() {
      for (const j of jobs.values()) {
        if (!TERMINAL.includes(j.state)) j.controller.abort();
        cleanUp(j);
      }
    },
  };
}
