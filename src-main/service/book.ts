import type { ImplementationOf } from '../../shared-core/contract/define.js';
import type { ServiceApiTable } from '../../shared-core/contract/service-api.js';
import { reviewBook } from '../app/review-book.js';
import type { Store } from '../store/store.js';
import { notFound, rowId } from './failures.js';

type Part = Pick<ImplementationOf<ServiceApiTable>, 'book.review' | 'book.setReview'>;

/** The book review (app/review-book.ts) and the advisor's review state per household. */
export function bookMethods(store: Store): Part {
  return {
    async 'book.review'({ resolve }) {
      return reviewBook(store, { resolve });
    },
    async 'book.setReview'({ householdId, driftTolerance, note, reviewed }) {
      const id = rowId('household', householdId);
      if (!store.getHousehold(id)) throw notFound('household', householdId);
      return store.setHouseholdReview(id, {
        ...(driftTolerance !== undefined ? { driftTolerance } : {}),
        ...(note !== undefined ? { note } : {}),
        ...(reviewed ? { reviewed: true } : {}),
      });
    },
  };
}
