import { generateBook, type Book, type BookSettings } from '../../shared-core/demo/book.js';
import { reviewHousehold } from '../app/review-book.js';
import { openStore, type Store } from '../store/store.js';

/** Initials on the invented book's revisions. */
export const BOOK_AUTHOR = 'BOOK';
export const BOOK_UNIVERSE = 'Invented review universe';

/**
 * Writes an invented book (shared-core/demo/book.ts) into a new store through the store's own
 * calls: prices and rates as one batch, households with holdings, one scenario each saved as
 * revision 1 at the book's mid-history date. The on-target households are then moved onto their
 * recommendation (computed by the review itself on the prices up to that date), so the book has
 * households in order as well as drifted ones.
 */
export function createBookStore(path: string, settings: Partial<BookSettings> = {}): { store: Store; book: Book } {
  const book = generateBook(settings);
  const store = openStore(path, { create: true });
  store.commitPrices({
    source: 'invented-book.csv',
    note: 'Invented prices for the book review',
    assets: [
      ...book.assets.map((a) => ({
        id: a.id,
        displayName: a.name,
        assetClass: a.assetClass,
        currency: 'EUR',
        liquidity: { tag: a.liquidity },
      })),
      ...Object.keys(book.rates).map((ccy) => ({
        id: `${ccy}EUR`,
        displayName: `${ccy} in euro (invented series)`,
        currency: 'EUR',
        liquidity: { tag: 'daily' as const },
        fx: { base: ccy, quote: 'EUR' },
      })),
    ],
    prices: [
      ...book.assets.map((a) => ({ assetId: a.id, dates: book.dates, closes: book.closes[a.id] })),
      ...Object.entries(book.rates).map(([ccy, closes]) => ({ assetId: `${ccy}EUR`, dates: book.dates, closes })),
    ],
    universe: { name: BOOK_UNIVERSE },
  });
  for (const h of book.households) {
    const household = store.createHousehold({ name: h.name, baseCurrency: h.baseCurrency });
    if (h.holdings.length > 0)
      store.setHoldings(
        household.id,
        h.holdings.map((x) => ({ assetId: x.asset, amount: x.amount, currency: x.currency, asOf: x.asOf })),
      );
    const scenario = store.createScenario({ householdId: household.id, name: h.scenario.name });
    store.saveRevision(scenario.id, h.scenario, { author: BOOK_AUTHOR, savedAt: h.savedAt });
    if (h.kind !== 'on-target') continue;
    const row = reviewHousehold(store, household);
    const target = row.figures?.target;
    if (!target) throw new Error(`invented book: ${h.name} has no computed recommendation`);
    const asOf = h.holdings[0].asOf;
    const total = 5e6;
    h.holdings = Object.entries(target)
      .filter(([, w]) => w > 0)
      .map(([asset, w]) => ({ asset, amount: Math.round(total * w * 100) / 100, currency: h.baseCurrency, asOf }));
    store.setHoldings(
      household.id,
      h.holdings.map((x) => ({ assetId: x.asset, amount: x.amount, currency: x.currency, asOf: x.asOf })),
    );
  }
  return { store, book };
}
