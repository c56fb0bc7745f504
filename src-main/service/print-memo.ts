import { basename } from 'node:path';
import { ServiceFailure } from '../../shared-core/contract/define.js';
import type { MemoSummary } from '../../shared-core/contract/service-api.js';
import { runScenario } from '../../shared-core/run/run-scenario.js';
import { storedScenarioInputs } from '../io/stored-scenario.js';
import { buildMemoInput } from '../memo/build-memo-input.js';
import type { MemoPosition } from '../memo/memo-input.js';
import { memoHash } from '../memo/memo-hash.js';
import { renderMemo } from '../memo/render-memo.js';
import { sha256Hex } from '../store/canonical-json.js';
import type { HouseholdRecord, ScenarioRecord, Store } from '../store/store.js';
import { storedExchangeRates } from '../io/exchange-rates.js';
import { memoOut } from './records.js';
import { valueHoldings } from './valuation.js';

export interface PrintRequest {
  date: string;
  lot: number;
  preparedBy: string;
  recommended?: string;
  rationale?: string;
}

/**
 * Prints the allocation memo of a scenario's newest revision from the stored prices and the
 * household's holdings, the same way `holdfast memo --store` does, and keeps its bytes in the
 * store beside the revision. Printing the same revision, data and options again gives the same
 * bytes, so the stored memo is returned instead of a copy.
 */
export async function printMemo(
  store: Store,
  household: HouseholdRecord,
  scenario: ScenarioRecord,
  request: PrintRequest,
): Promise<{ memo: MemoSummary; reused: boolean }> {
  const inputs = storedScenarioInputs(store, household.name, scenario.name);
  if (request.recommended !== undefined && !inputs.scenario.candidates.some((c) => c.id === request.recommended))
    throw new ServiceFailure(
      'bad-request',
      `no candidate '${request.recommended}' in revision ${inputs.revision.number}`,
      'recommended',
    );
  const valued = valueHoldings(store, household, store.holdings(household.id));
  let holdings: { asOf: string | null; positions: MemoPosition[] } | undefined;
  if (valued.positions.length > 0) {
    const missing = valued.positions.find((p) => p.valueInBase === null);
    if (missing)
      throw new ServiceFailure(
        'bad-request',
        `holding '${missing.asset}' is in ${missing.currency} and the store has no exchange rate to ${household.baseCurrency} on or before ${valued.asOf}`,
      );
    holdings = {
      asOf: valued.asOf,
      positions: valued.positions.map((p) => ({ asset: p.asset, amount: p.valueInBase as number })),
    };
  }
  const fx = storedExchangeRates(store, household.baseCurrency, inputs.prices.currencies ?? []);
  const run = runScenario(inputs.scenario, inputs.prices, fx ? { fx } : {});
  const assets = inputs.scenario.assets ?? inputs.prices.assets;
  const input = buildMemoInput({
    scenario: inputs.scenario,
    revision: inputs.revision,
    run,
    household: { name: household.name, baseCurrency: household.baseCurrency, ...(holdings ? { holdings } : {}) },
    preparedBy: request.preparedBy,
    createdOn: request.date,
    lot: request.lot,
    ...(request.recommended !== undefined ? { recommended: request.recommended } : {}),
    ...(request.rationale ? { rationale: request.rationale } : {}),
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
      ],
      ...(fx ? { fxConverted: true } : {}),
    },
  });
  const pdf = await renderMemo(input);
  const hash = sha256Hex(pdf);
  const same = store.listMemos(scenario.id).find((m) => m.revisionHash === inputs.revision.hash && m.sha256 === hash);
  if (same) return { memo: memoOut(same), reused: true };
  const info = store.saveMemo({
    scenarioId: scenario.id,
    revisionHash: inputs.revision.hash,
    dataVersion: inputs.dataVersion,
    pdf,
    title: `Allocation memo ${request.date}, revision ${inputs.revision.number}`,
    memoHash: memoHash(input),
    preparedBy: request.preparedBy,
  });
  return { memo: memoOut(info), reused: false };
}
