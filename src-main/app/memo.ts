import { basename } from 'node:path';
import { InputError } from '../../shared-core/errors.js';
import { buildMemoInput, chooseRecommended } from '../memo/build-memo-input.js';
import { countOf } from '../../shared-core/present/format.js';
import { memoSectionsFromBacktest } from '../memo/from-backtest.js';
import { memoHash } from '../memo/memo-hash.js';
import type { MemoData, MemoInput, MemoPosition } from '../memo/memo-input.js';
import type { HoldingsFile } from '../memo/memo-sources.js';
import { canonicalJson, sha256Hex } from '../store/canonical-json.js';
import type { MemoInfo, Store } from '../store/store.js';
import { runScenarioInputs } from './run-scenario.js';
import { convertsCurrency, scenarioFromStore, type ScenarioInputs } from './scenario-inputs.js';
import { valueHoldings } from './value-holdings.js';
import { walkForward } from './walk-forward.js';
import { notWalkedWords } from '../../shared-core/run/walk-forward.js';

/** What the adviser chooses about a memo; the figures come from the scenario's inputs. */
export interface MemoRequest {
  /** The memo's date, YYYY-MM-DD: it fixes the PDF's dates, so the same request gives the same bytes. */
  date: string;
  /** Trades are rounded to multiples of this amount in the base currency. */
  lot: number;
  preparedBy: string;
  /** The household's name as printed (the store form defaults to the stored name). */
  householdName?: string;
  /** A candidate id; the default is the scenario's `recommended`, else the most diversified solved one. */
  recommended?: string;
  rationale?: string;
  /**
   * Add the walk-forward and stress sections (added anyway when the scenario has walk-forward
   * settings); with stabilityDraws, the weight bands.
   */
  walkForward?: { stabilityDraws?: number };
  signal?: AbortSignal;
}

type Holdings = { asOf: string | null; positions: MemoPosition[] };

/**
 * The memo input of a scenario: the run, the recommended candidate, the optional walk-forward
 * sections and the data notes, with amounts in the scenario's base currency (the currency the
 * scenario computes in, whatever the household's usual one).
 */
async function memoInput(
  inputs: ScenarioInputs,
  household: { name: string; holdings?: Holdings },
  revision: { number: number; hash: string },
  data: MemoData,
  request: MemoRequest,
): Promise<MemoInput> {
  const { scenario } = inputs;
  if (request.recommended !== undefined && !scenario.candidates.some((c) => c.id === request.recommended))
    throw new InputError(`no candidate '${request.recommended}' in revision ${revision.number}`, {
      path: 'recommended',
    });
  const run = runScenarioInputs(inputs, { signal: request.signal });
  const recommended = request.recommended ?? chooseRecommended(scenario, run.candidates);
  // The walk-forward and stress sections whenever the revision has walk-forward settings, printed
  // from the page as from the command line; a request may also ask for them (--backtest), and for
  // the weight bands.
  const asked = request.walkForward ?? (scenario.backtest ? {} : undefined);
  const walked = asked
    ? await walkForward(inputs, { stabilityDraws: asked.stabilityDraws, signal: request.signal })
    : undefined;
  // Asked for, a walk-forward that cannot run is refused; by default the memo goes without it.
  if (walked?.status === 'not-solved' && request.walkForward)
    throw new InputError(`no walk-forward: ${notWalkedWords(walked.candidates)}`, {
      file: inputs.names.scenario,
      path: 'candidates',
    });
  const backtest = walked?.status === 'done' ? walked.run : undefined;
  return buildMemoInput({
    scenario,
    revision,
    run,
    household: { ...household, baseCurrency: scenario.baseCurrency },
    preparedBy: request.preparedBy,
    createdOn: request.date,
    lot: request.lot,
    recommended,
    ...(request.rationale ? { rationale: request.rationale } : {}),
    ...(backtest ? memoSectionsFromBacktest(backtest, recommended) : {}),
    data: {
      ...data,
      flags: [...data.flags, ...(backtest ? backtest.warnings.map((w) => `Walk-forward: ${w}.`) : [])],
      ...(convertsCurrency(inputs) ? { fxConverted: true } : {}),
    },
  });
}

/**
 * The memo from files: the holdings (already in the base currency) from a holdings document,
 * whose household name is printed unless the request names one. A file has no revision history:
 * revision 1, hashed as the store hashes a saved document.
 */
export async function memoFromFiles(
  inputs: ScenarioInputs,
  holdings: (HoldingsFile & { file: string }) | undefined,
  request: MemoRequest,
): Promise<MemoInput> {
  const { scenario, prices, fx } = inputs;
  if (holdings?.baseCurrency && holdings.baseCurrency !== scenario.baseCurrency)
    throw new InputError(
      `the holdings are in ${holdings.baseCurrency} but the scenario's base currency is ${scenario.baseCurrency}`,
      { file: holdings.file, path: 'household.baseCurrency' },
    );
  const known = new Set(scenario.assets ?? prices.assets);
  holdings?.positions.forEach((p, i) => {
    if (!known.has(p.asset))
      throw new InputError(`asset '${p.asset}' is held but not in the scenario's assets`, {
        file: holdings.file,
        path: `positions[${i}].asset`,
      });
  });
  const name = (request.householdName ?? holdings?.householdName ?? '').trim();
  if (!name)
    throw new InputError('the memo needs the household name: none was given and no holdings document has one', {
      path: 'householdName',
    });
  // The current weights are the holdings' when the scenario states none, as the store form fills
  // them (stored-scenario.ts): the turnover and the trades then start from the same holdings.
  let run = inputs;
  if (holdings && holdings.positions.length > 0 && !scenario.current) {
    const total = holdings.positions.reduce((sum, p) => sum + p.amount, 0);
    if (!(total > 0))
      throw new InputError('the holdings add up to no positive value', { file: holdings.file, path: 'positions' });
    const current = Object.fromEntries(holdings.positions.map((p) => [p.asset, p.amount / total]));
    run = { ...inputs, scenario: { ...scenario, current } };
  }
  const span = (table: typeof prices) => ({ from: table.dates[0], to: table.dates[table.dates.length - 1] });
  const data: MemoData = {
    sources: [
      { name: basename(inputs.names.prices), assets: (scenario.assets ?? prices.assets).length, ...span(prices) },
      ...(fx && inputs.names.fx !== undefined
        ? [{ name: basename(inputs.names.fx), assets: fx.assets.length, ...span(fx) }]
        : []),
    ],
    flags: [],
  };
  return memoInput(
    run,
    { name, ...(holdings ? { holdings: { asOf: holdings.asOf, positions: holdings.positions } } : {}) },
    { number: 1, hash: sha256Hex(canonicalJson(scenario)) },
    data,
    request,
  );
}

/** A memo computed from the store, and how to keep its PDF beside the revision it came from. */
export interface StoredMemo {
  input: MemoInput;
  /** Saves the PDF unless the same revision already has these bytes (then that memo is returned). */
  keep(pdf: Uint8Array): { memo: MemoInfo; reused: boolean };
}

/**
 * The memo of a household's scenario from the store: its newest revision, the stored prices and
 * rates, and the household's holdings valued in the scenario's base currency. The command line's
 * `memo --store` and the app's print both come here, so the same request gives the same bytes.
 */
export async function memoFromStore(
  store: Store,
  storeName: string,
  householdName: string,
  scenarioName: string,
  request: MemoRequest,
): Promise<StoredMemo> {
  const inputs = scenarioFromStore(store, storeName, householdName, scenarioName);
  const { stored } = inputs;
  const household = store.getHousehold(householdName)!;
  const record = store.getScenario(household.id, scenarioName)!;
  const base = inputs.scenario.baseCurrency;
  const valued = valueHoldings(store, household, base, store.holdings(household.id));
  let holdings: Holdings | undefined;
  if (valued.positions.length > 0) {
    const missing = valued.positions.find((p) => p.valueInBase === null);
    if (missing)
      throw new InputError(
        `holding '${missing.asset}' is in ${missing.currency} and the store has no exchange rate to ${base} on or before ${valued.asOf}`,
        { file: storeName },
      );
    holdings = {
      asOf: valued.asOf,
      positions: valued.positions.map((p) => ({ asset: p.asset, amount: p.valueInBase as number })),
    };
  }
  const assets = inputs.scenario.assets ?? inputs.prices.assets;
  const dates = inputs.prices.dates;
  const input = await memoInput(
    inputs,
    { name: request.householdName?.trim() || household.name, ...(holdings ? { holdings } : {}) },
    stored.revision,
    {
      sources: [
        {
          name: `${basename(store.path)}, data version ${stored.dataVersion}`,
          assets: assets.length,
          from: dates[0],
          to: dates[dates.length - 1],
        },
      ],
      flags: [
        ...store
          .listBatches()
          .map(
            (b) => `Prices imported from ${b.source} on ${b.importedAt.slice(0, 10)} (${countOf(b.assets, 'asset')}).`,
          ),
        ...valued.rates.map((r) => `Holdings valued with ${r}.`),
      ],
    },
    request,
  );
  return {
    input,
    keep(pdf) {
      const sha = sha256Hex(pdf);
      const same = store.listMemos(record.id).find((m) => m.revisionHash === stored.revision.hash && m.sha256 === sha);
      if (same) return { memo: same, reused: true };
      const memo = store.saveMemo({
        scenarioId: record.id,
        revisionHash: stored.revision.hash,
        dataVersion: stored.dataVersion,
        pdf,
        title: `Allocation memo ${request.date}, revision ${stored.revision.number}`,
        memoHash: memoHash(input),
        preparedBy: input.preparedBy,
      });
      return { memo, reused: false };
    },
  };
}
