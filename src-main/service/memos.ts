import { ServiceFailure, type ImplementationOf } from '../../shared-core/contract/define.js';
import type { ServiceApiTable } from '../../shared-core/contract/service-api.js';
import type { Store } from '../store/store.js';
import { notFound, rowId } from './failures.js';
import { printMemo } from './print-memo.js';
import { memoOut } from './records.js';
import type { SettingsKeeper } from './settings.js';

type Part = Pick<ImplementationOf<ServiceApiTable>, 'memos.print' | 'memos.list' | 'memos.get'>;

/** Printed memos, kept byte for byte so the memo a client received can be reprinted unchanged. */
export function memoMethods(store: Store, settings: SettingsKeeper): Part {
  return {
    async 'memos.print'({ scenarioId, date, lot, recommended, rationale }) {
      const scenario = store.getScenarioById(rowId('scenario', scenarioId));
      if (!scenario) throw notFound('scenario', scenarioId);
      const household = store.getHousehold(scenario.householdId);
      if (!household) throw new Error(`scenario ${scenarioId} has no household record`);
      const preparedBy = settings.get().preparedBy;
      if (!preparedBy)
        throw new ServiceFailure(
          'bad-request',
          'set your initials in the settings before printing a memo',
          'preparedBy',
        );
      return printMemo(store, household, scenario, {
        date: date ?? new Date().toISOString().slice(0, 10),
        lot,
        preparedBy,
        ...(recommended !== undefined ? { recommended } : {}),
        ...(rationale !== undefined ? { rationale } : {}),
      });
    },
    async 'memos.list'({ scenarioId }) {
      const id = rowId('scenario', scenarioId);
      if (!store.getScenarioById(id)) throw notFound('scenario', scenarioId);
      return store
        .listMemos(id)
        .sort((a, b) => b.printedAt.localeCompare(a.printedAt) || b.id - a.id)
        .map(memoOut);
    },
    async 'memos.get'({ memoId }) {
      const id = rowId('memo', memoId);
      const pdf = store.getMemoPdf(id);
      if (!pdf) throw notFound('memo', memoId);
      // The store lists memos per scenario; a household's file holds few, so a walk is cheap.
      const info = store
        .listHouseholds()
        .flatMap((h) => store.listScenarios(h.id))
        .flatMap((s) => store.listMemos(s.id))
        .find((m) => m.id === id);
      if (!info) throw new ServiceFailure('internal', `memo ${memoId} has bytes but no record`);
      return { memo: memoOut(info), pdfBase64: Buffer.from(pdf).toString('base64') };
    },
  };
}
