import { InputError } from '../../../shared-core/errors.js';
import { isIsoDate } from '../../../shared-core/scenario/iso-date.js';
import { CancelledError } from '../../../shared-core/stability/cancel.js';
import { DEFAULT_DRAWS } from '../../../shared-core/stability/weight-bands.js';
import { DEFAULT_LOT } from '../../../shared-core/trades/trade-list.js';
import { memoFromFiles, memoFromStore, type MemoRequest } from '../../app/memo.js';
import { scenarioFromFiles } from '../../app/scenario-inputs.js';
import { memoHash } from '../../memo/memo-hash.js';
import type { MemoInput } from '../../memo/memo-input.js';
import { parseHoldingsText } from '../../memo/memo-sources.js';
import { sha256Hex } from '../../store/canonical-json.js';
import { readInputFile } from '../../io/read-input-file.js';
import { EXIT, UsageError, type CliIO, type OptionValues } from '../command.js';
import { writeOutputFile } from '../write-output.js';
import { existingStore } from './store-access.js';

/**
 * `holdfast memo`: the PDF allocation memo of a scenario, from files or from the store (the memo
 * use case, src-main/app/memo.ts, computes it). The whole memo is computed and rendered before
 * anything is written; the file is written to a temporary name and renamed, so bad input or a
 * crash leaves no partial PDF. The store form also keeps the memo in the store beside its revision.
 */
export async function runMemo(options: OptionValues, io: CliIO): Promise<number> {
  const date = (options.date as string | undefined) ?? new Date().toISOString().slice(0, 10);
  if (!isIsoDate(date)) throw new UsageError(`--date needs a date YYYY-MM-DD, got '${date}'`);
  const lot = (options.lot as number | undefined) ?? DEFAULT_LOT;
  if (!(lot > 0)) throw new UsageError(`--lot must be a positive amount, got ${lot}`);
  const storeForm = options.store !== undefined;
  if (storeForm) {
    for (const bad of ['prices', 'holdings', 'fx'] as const)
      if (options[bad] !== undefined) throw new UsageError(`--${bad} belongs to the file form, not with --store`);
    if (options.household === undefined || options.scenario === undefined)
      throw new UsageError('the store form needs --store FILE --household NAME --scenario NAME');
  } else {
    if (options.household !== undefined) throw new UsageError('--household names a household in a store: add --store');
    if (options.prices === undefined || options.scenario === undefined)
      throw new UsageError("'memo' needs --prices FILE.csv --scenario FILE.json, or --store with --household");
  }
  if (options.stability && !options.backtest) throw new UsageError('--stability goes with --backtest');
  const request: MemoRequest = {
    date,
    lot,
    preparedBy: ((options['prepared-by'] as string | undefined) ?? '').trim() || 'not given',
    ...(options['household-name'] !== undefined ? { householdName: options['household-name'] as string } : {}),
    ...(options.backtest ? { walkForward: options.stability ? { stabilityDraws: DEFAULT_DRAWS } : {} } : {}),
    signal: io.signal,
  };

  const store = storeForm ? existingStore(io.cwd, options.store as string) : undefined;
  try {
    let input: MemoInput;
    let keep: ((pdf: Uint8Array) => string) | undefined;
    try {
      if (store) {
        const memo = await memoFromStore(
          store,
          options.store as string,
          options.household as string,
          options.scenario as string,
          request,
        );
        input = memo.input;
        keep = (pdf) => {
          const kept = memo.keep(pdf);
          return kept.reused
            ? `identical to memo ${kept.memo.id} already in the store`
            : `saved in the store as memo ${kept.memo.id} beside revision ${input.scenario.revision}`;
        };
      } else input = await fromFiles(io.cwd, options, request, (w) => io.stderr(`holdfast memo: warning: ${w}\n`));
    } catch (error) {
      if (!(error instanceof CancelledError)) throw error;
      io.stderr('holdfast memo: interrupted; nothing written\n');
      return EXIT.interrupted;
    }
    // Loaded here so that every other command starts without pdfkit and ECharts.
    const { renderMemo } = await import('../../memo/render-memo.js');
    const pdf = await renderMemo(input);
    if (io.signal.aborted) {
      io.stderr('holdfast memo: interrupted; nothing written\n');
      return EXIT.interrupted;
    }
    const out = options.out as string;
    writeOutputFile(io.cwd, out, pdf);
    const kept = keep?.(pdf);
    io.stdout(
      `wrote ${out}: ${pdf.length} bytes, memo hash ${memoHash(input)}, pdf sha256 ${sha256Hex(pdf)}` +
        (kept ? `; ${kept}` : '') +
        '\n',
    );
    return EXIT.ok;
  } finally {
    store?.close();
  }
}

/** The file form's inputs: the price, scenario and rate files, and the holdings document if given. */
async function fromFiles(
  cwd: string,
  options: OptionValues,
  request: MemoRequest,
  warn: (line: string) => void,
): Promise<MemoInput> {
  const inputs = scenarioFromFiles(
    cwd,
    {
      prices: options.prices as string,
      scenario: options.scenario as string,
      ...(options.fx !== undefined ? { fx: options.fx as string } : {}),
    },
    undefined,
    warn,
  );
  let holdings;
  if (options.holdings !== undefined) {
    const file = readInputFile(cwd, options.holdings as string);
    try {
      holdings = { ...parseHoldingsText(file.text), file: file.path };
    } catch (error) {
      if (error instanceof InputError) throw error.inFile(file.path);
      throw error;
    }
  }
  try {
    return await memoFromFiles(inputs, holdings, request);
  } catch (error) {
    if (error instanceof InputError && error.location.path === 'householdName')
      throw new UsageError('give --household-name "..." (or --holdings with a household document)');
    throw error;
  }
}
