import { ServiceFailure, type ImplementationOf } from '../../shared-core/contract/define.js';
import type { ServiceApiTable } from '../../shared-core/contract/service-api.js';
import type { HouseholdRecord, Store } from '../store/store.js';
import { notFound, rowId } from './failures.js';
import { householdSummaryOut } from './records.js';
import { valueHoldings } from '../app/value-holdings.js';

type Part = Pick<
  ImplementationOf<ServiceApiTable>,
  'households.list' | 'households.get' | 'households.create' | 'households.update' | 'holdings.get' | 'holdings.set'
>;

/** Households (the clients) and their current holdings. */
export function householdMethods(store: Store): Part {
  function household(wireId: string): HouseholdRecord {
    const record = store.getHousehold(rowId('household', wireId));
    if (!record) throw notFound('household', wireId);
    return record;
  }

  function refuseDuplicateName(name: string, except?: number): void {
    const same = store.listHouseholds().find((h) => h.name.toLowerCase() === name.toLowerCase() && h.id !== except);
    if (same) throw new ServiceFailure('conflict', `a household named '${same.name}' exists already`, 'name');
  }

  return {
    async 'households.list'() {
      return store
        .listHouseholds()
        .sort((a, b) => a.name.localeCompare(b.name))
        .map((h) => householdSummaryOut(store, h));
    },
    async 'households.get'({ householdId }) {
      return householdSummaryOut(store, household(householdId));
    },
    async 'households.create'(fields) {
      refuseDuplicateName(fields.name);
      return householdSummaryOut(store, store.createHousehold(fields));
    },
    async 'households.update'({ householdId, fields }) {
      const record = household(householdId);
      refuseDuplicateName(fields.name, record.id);
      return householdSummaryOut(store, store.updateHousehold(record.id, fields));
    },
    async 'holdings.get'({ householdId, baseCurrency }) {
      const record = household(householdId);
      return valueHoldings(store, record, baseCurrency ?? record.baseCurrency, store.holdings(record.id));
    },
    async 'holdings.set'({ householdId, asOf, positions }) {
      const record = household(householdId);
      positions.forEach((p, i) => {
        if (!store.getAsset(p.asset))
          throw new ServiceFailure('bad-request', `no asset '${p.asset}' in the store`, `positions[${i}].asset`);
      });
      store.setHoldings(
        record.id,
        positions.map((p) => ({ assetId: p.asset, amount: p.amount, currency: p.currency, asOf })),
      );
      return valueHoldings(store, record, record.baseCurrency, store.holdings(record.id));
    },
  };
}
