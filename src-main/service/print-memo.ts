import { basename } from 'node:path';
import { ServiceFailure } from '../../shared-core/contract/define.js';
import type { MemoSummary } from '../../shared-core/contract/service-api.js';
import { InputError } from '../../shared-core/errors.js';
import { memoFromStore } from '../app/memo.js';
import { renderMemo } from '../memo/render-memo.js';
import type { HouseholdRecord, ScenarioRecord, Store } from '../store/store.js';
import { memoOut } from './records.js';

export interface PrintRequest {
  date: string;
  lot: number;
  preparedBy: string;
  recommended?: string;
  rationale?: string;
}

/**
 * The app's print: the memo use case (src-main/app/memo.ts) on the scenario's newest revision,
 * the same workflow as `holdfast memo --store`, kept in the store beside the revision. Printing
 * the same revision, data and options again gives the same bytes, so the stored memo is returned.
 */
export async function printMemo(
  store: Store,
  household: HouseholdRecord,
  scenario: ScenarioRecord,
  request: PrintRequest,
): Promise<{ memo: MemoSummary; reused: boolean }> {
  let memo;
  try {
    memo = await memoFromStore(store, basename(store.path), household.name, scenario.name, request);
  } catch (error) {
    // A field of the request is answered at that field, for the form to show beside it.
    if (error instanceof InputError && error.location.path === 'recommended')
      throw new ServiceFailure('bad-request', error.message, 'recommended');
    throw error;
  }
  const kept = memo.keep(await renderMemo(memo.input));
  return { memo: memoOut(kept.memo), reused: kept.reused };
}
