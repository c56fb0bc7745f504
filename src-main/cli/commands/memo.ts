import { renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, resolve } from 'node:path';
import { InputError } from '../../../shared-core/errors.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { runScenario } from '../../../shared-core/run/run-scenario.js';
import { isIsoDate } from '../../../shared-core/scenario/iso-date.js';
import { CancelledError } from '../../../shared-core/stability/cancel.js';
import { DEFAULT_DRAWS } from '../../../shared-core/stability/weight-bands.js';
import { estimateAndSolve } from '../../../shared-core/walkforward/estimate-and-solve.js';
import { runBacktest } from '../../../shared-core/walkforward/run-backtest.js';
import { parseScenarioText, type Scenario } from '../../../shared-core/scenario/schema.js';
import { storedExchangeRates } from '../../io/exchange-rates.js';
import { storedScenarioInputs } from '../../io/stored-scenario.js';
import { buildMemoInput, chooseRecommended } from '../../memo/build-memo-input.js';
import { memoSectionsFromBacktest } from '../../memo/from-backtest.js';
import { memoHash } from '../../memo/memo-hash.js';
import type { MemoData, MemoPosition } from '../../memo/memo-input.js';
import { parseHoldingsText } from '../../memo/memo-sources.js';
import { valueHoldings } from '../../service/valuation.js';
import { canonicalJson, sha256Hex } from '../../store/canonical-json.js';
import type { Store } from '../../store/store.js';
import { EXIT, UsageError, type CliIO, type OptionValues } from '../command.js';
import { readInputFile, readPriceFile, withExchangeRates } from '../files.js';
import type { PriceTableFile } from '../../io/read-price-table.js';
import { existingStore } from './store-access.js';

/**
 * `holdfast memo`: the PDF allocation memo of a scenario, from files or from the store. The
 * whole memo is computed and rendered before anything is written; the file is written to a
 * temporary name and renamed, so bad input or a crash leaves no partial PDF. The store form also
 * saves the memo in the store beside the revision it came from.
 */
export async function runMemo(options: OptionValues, io: CliIO): Promise<number> {
  const date = (options.date as string | undefined) ?? new Date().toISOString().slice(0, 10);
  if (!isIsoDate(date)) throw new UsageError(`--date needs a date YYYY-MM-DD, got '${date}'`);
  const lot = (options.lot as number | undefined) ?? 1000;
  if (!(lot > 0)) throw new UsageError(`--lot must be a positive amount, got ${lot}`);
  const out = options.out as string;
  const preparedBy = ((options['prepared-by'] as string | undefined) ?? '').trim() || 'not given';

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
  let built: Built;
  try {
    built = storeForm
      ? await fromStore(existingStore(io.cwd, options.store as string), options, date, lot, preparedBy, io.signal)
      : await fromFiles(io.cwd, options, date, lot, preparedBy, io.signal, (w) =>
          io.stderr(`holdfast memo: warning: ${w}\n`),
        );
  } catch (error) {
    if (!(error instanceof CancelledError)) throw error;
    io.stderr('holdfast memo: interrupted; nothing written\n');
    return EXIT.interrupted;
  }
  // Loaded here so that every other command starts without pdfkit and ECharts.
  const { renderMemo } = await import('../../memo/render-memo.js');
  const pdf = await renderMemo(built.input);
  if (io.signal.aborted) {
    built.close?.();
    io.stderr('holdfast memo: interrupted; nothing written\n');
    return EXIT.interrupted;
  }
  const full = resolve(io.cwd, out);
  const temporary = `${full}.partial`;
  try {
    writeFileSync(temporary, pdf);
    renameSync(temporary, full);
  } catch (error) {
    rmSync(temporary, { force: true });
    built.close?.();
    throw new InputError(`cannot write: ${(error as Error).message}`, { file: out });
  }
  const saved = built.save?.(pdf);
  built.close?.();
  io.stdout(
    `wrote ${out}: ${pdf.length} bytes, memo hash ${memoHash(built.input)}, pdf sha256 ${sha256Hex(pdf)}` +
      (saved ? `; ${saved}` : '') +
      '\n',
  );
  return EXIT.ok;
}

interface Built {
  input: ReturnType<typeof buildMemoInput>;
  save?: (pdf: Buffer) => string;
  close?: () => void;
}

/** A run whose input errors name the file they come from: price cells by line, the scenario by JSON path. */
function runOrLocate(
  scenario: Scenario,
  prices: PriceTable,
  files: { prices: string; scenario: string; fx?: string },
  locate: PriceTableFile['locate'],
  fx?: PriceTable,
) {
  try {
    return runScenario(scenario, prices, { locate, ...(fx ? { fx } : {}) });
  } catch (error) {
    if (error instanceof InputError && error.location.file === undefined)
      throw error.inFile(error.location.line !== undefined ? files.prices : files.scenario);
    throw error;
  }
}

/** Walk-forward, stress and (optionally) stability sections, when asked for with --backtest. */
async function backtestSections(
  scenario: Scenario,
  prices: PriceTable,
  options: OptionValues,
  recommended: string,
  signal: AbortSignal,
  fx: PriceTable | undefined,
): Promise<{ sections: ReturnType<typeof memoSectionsFromBacktest>; warnings: string[] } | undefined> {
  if (!options.backtest) return undefined;
  const run = await runBacktest(scenario, prices, {
    estimateAndSolve,
    ...(fx ? { fx } : {}),
    shouldCancel: () => signal.aborted,
    pause: () => new Promise((done) => setImmediate(done)),
    ...(options.stability ? { stabilityDraws: DEFAULT_DRAWS } : {}),
  });
  return { sections: memoSectionsFromBacktest(run, recommended), warnings: run.warnings };
}

async function fromFiles(
  cwd: string,
  options: OptionValues,
  date: string,
  lot: number,
  preparedBy: string,
  signal: AbortSignal,
  warn: (line: string) => void,
): Promise<Built> {
  const pricesFile = readPriceFile(cwd, options.prices as string, warn);
  let prices = pricesFile.table;
  const scenarioFile = readInputFile(cwd, options.scenario as string);
  const parsed = parseScenarioText(scenarioFile.text);
  if (!parsed.ok) throw parsed.errors[0].inFile(scenarioFile.path);
  const scenario = parsed.scenario;

  let holdings: { asOf: string | null; positions: MemoPosition[] } | undefined;
  let name = options['household-name'] as string | undefined;
  if (options.holdings !== undefined) {
    const file = readInputFile(cwd, options.holdings as string);
    let h;
    try {
      h = parseHoldingsText(file.text);
    } catch (error) {
      if (error instanceof InputError) throw error.inFile(file.path);
      throw error;
    }
    if (h.baseCurrency && h.baseCurrency !== scenario.baseCurrency)
      throw new InputError(
        `the holdings are in ${h.baseCurrency} but the scenario's base currency is ${scenario.baseCurrency}`,
        { file: file.path, path: 'household.baseCurrency' },
      );
    const known = new Set(scenario.assets ?? prices.assets);
    h.positions.forEach((p, i) => {
      if (!known.has(p.asset))
        throw new InputError(`asset '${p.asset}' is held but not in the scenario's assets`, {
          file: file.path,
          path: `positions[${i}].asset`,
        });
    });
    holdings = { asOf: h.asOf, positions: h.positions };
    name ??= h.householdName;
  }
  if (!name?.trim()) throw new UsageError('give --household-name "..." (or --holdings with a household document)');

  // With exchange rates, each asset's price currency comes from the scenario's asset information.
  let fx: PriceTable | undefined;
  let fxConverted = false;
  if (options.fx !== undefined) {
    const rated = withExchangeRates(cwd, prices, scenario, options.fx as string, warn);
    ({ prices, fx, converted: fxConverted } = rated);
  }
  const run = runOrLocate(
    scenario,
    prices,
    { prices: pricesFile.path, scenario: scenarioFile.path, fx: options.fx as string | undefined },
    pricesFile.locate,
    fx,
  );
  const recommended = chooseRecommended(scenario, run.candidates);
  let bt;
  try {
    bt = await backtestSections(scenario, prices, options, recommended, signal, fx);
  } catch (error) {
    if (error instanceof InputError && error.location.file === undefined)
      throw error.inFile(error.location.line !== undefined ? pricesFile.path : scenarioFile.path);
    throw error;
  }
  const data: MemoData = {
    sources: [
      {
        name: basename(pricesFile.path),
        assets: (scenario.assets ?? prices.assets).length,
        from: prices.dates[0],
        to: prices.dates[prices.dates.length - 1],
      },
      ...(fx && options.fx !== undefined
        ? [
            {
              name: basename(options.fx as string),
              assets: fx.assets.length,
              from: fx.dates[0],
              to: fx.dates[fx.dates.length - 1],
            },
          ]
        : []),
    ],
    flags: bt ? bt.warnings.map((w) => `Walk-forward: ${w}.`) : [],
    fxConverted,
  };
  const input = buildMemoInput({
    scenario,
    // A file has no revision history: revision 1, hashed as the store hashes a saved document.
    revision: { number: 1, hash: sha256Hex(canonicalJson(scenario)) },
    run,
    household: { name: name.trim(), baseCurrency: scenario.baseCurrency, ...(holdings ? { holdings } : {}) },
    preparedBy,
    createdOn: date,
    lot,
    data,
    recommended,
    ...(bt?.sections ?? {}),
  });
  return { input };
}

async function fromStore(
  store: Store,
  options: OptionValues,
  date: string,
  lot: number,
  preparedBy: string,
  signal: AbortSignal,
): Promise<Built> {
  try {
    const householdName = options.household as string;
    const inputs = storedScenarioInputs(store, householdName, options.scenario as string);
    const household = store.getHousehold(householdName)!;
    const record = store.getScenario(household.id, options.scenario as string)!;
    const valued = valueHoldings(store, household, store.holdings(household.id));
    let holdings: { asOf: string | null; positions: MemoPosition[] } | undefined;
    if (valued.positions.length > 0) {
      const missing = valued.positions.find((p) => p.valueInBase === null);
      if (missing)
        throw new InputError(
          `holding '${missing.asset}' is in ${missing.currency} and the store has no rate to ${household.baseCurrency} on or before ${valued.asOf}`,
          { file: options.store as string },
        );
      holdings = {
        asOf: valued.asOf,
        positions: valued.positions.map((p) => ({ asset: p.asset, amount: p.valueInBase as number })),
      };
    }
    const fx = storedExchangeRates(store, household.baseCurrency, inputs.prices.currencies ?? []);
    const run = runScenario(inputs.scenario, inputs.prices, fx ? { fx } : {});
    const recommended = chooseRecommended(inputs.scenario, run.candidates);
    const bt = await backtestSections(inputs.scenario, inputs.prices, options, recommended, signal, fx);
    const assets = inputs.scenario.assets ?? inputs.prices.assets;
    const input = buildMemoInput({
      scenario: inputs.scenario,
      revision: inputs.revision,
      run,
      household: {
        name: (options['household-name'] as string | undefined)?.trim() || household.name,
        baseCurrency: household.baseCurrency,
        ...(holdings ? { holdings } : {}),
      },
      preparedBy,
      createdOn: date,
      lot,
      recommended,
      ...(bt?.sections ?? {}),
      data: {
        sources: [
          {
            name: `${basename(store.path)}, data version ${inputs.dataVersion}`,
            assets: assets.length,
            from: inputs.prices.dates[0],
            to: inputs.prices.dates[inputs.prices.dates.length - 1],
          },
        ],
        flags: [
          ...store
            .listBatches()
            .map((b) => `Prices imported from ${b.source} on ${b.importedAt.slice(0, 10)} (${b.assets} assets).`),
          ...valued.rates.map((r) => `Holdings valued with ${r}.`),
          ...(bt ? bt.warnings.map((w) => `Walk-forward: ${w}.`) : []),
        ],
      },
    });
    return {
      input,
      save: (pdf) => {
        const same = store
          .listMemos(record.id)
          .find((m) => m.revisionHash === inputs.revision.hash && m.sha256 === sha256Hex(pdf));
        if (same) return `identical to memo ${same.id} already in the store`;
        const info = store.saveMemo({
          scenarioId: record.id,
          revisionHash: inputs.revision.hash,
          dataVersion: inputs.dataVersion,
          pdf,
          title: `Allocation memo ${date}, revision ${inputs.revision.number}`,
          memoHash: memoHash(input),
          preparedBy: input.preparedBy,
        });
        return `saved in the store as memo ${info.id} beside revision ${inputs.revision.number}`;
      },
      close: () => store.close(),
    };
  } catch (error) {
    store.close();
    if (error instanceof InputError && error.location.file === undefined) throw error.inFile(options.store as string);
    throw error;
  }
}
