import type { ScenarioInput } from '../scenario/schema.js';
import { createRandom, type RandomSource } from './random.js';

/**
 * An invented book of households for the book review's tests and bench: a universe of invented
 * funds with month-end prices in euro from a seeded one-factor model, US dollar and sterling
 * rates in euro, and households in mixed base currencies, each with a scenario that recommends a
 * maximum-diversification candidate under caps, a group band and an illiquid limit. The same seed
 * gives the same book. Special households make every row kind appear: one with no holdings, one
 * whose recommendation cannot be computed (floors above 100 %), some in breach of a cap, some
 * drifted, and some re-saved at the last month-end and moved onto their target by the writer.
 */
export interface BookAsset {
  id: string;
  name: string;
  assetClass: 'Equity' | 'Bonds' | 'Real assets' | 'Alternatives';
  liquidity: 'daily' | 'monthly' | 'illiquid';
}

export interface BookHolding {
  asset: string;
  amount: number;
  currency: string;
  asOf: string;
}

export type BookHouseholdKind = 'drifted' | 'breach' | 'on-target' | 'no-holdings' | 'cannot-compute';

export interface BookHousehold {
  name: string;
  baseCurrency: 'EUR' | 'USD' | 'GBP';
  kind: BookHouseholdKind;
  scenario: ScenarioInput;
  /** Holdings as written (on-target households are rewritten onto their target by the writer). */
  holdings: BookHolding[];
  /** When the scenario's revision was saved: mid-history, so the review's "since saved" moves. */
  savedAt: string;
}

export interface Book {
  dates: string[];
  assets: BookAsset[];
  /** Month-end closes in euro, by asset id. */
  closes: Record<string, number[]>;
  /** Units of euro per one unit of the currency, by currency (USD, GBP). */
  rates: Record<string, number[]>;
  households: BookHousehold[];
}

export interface BookSettings {
  seed: number;
  households: number;
  /** Assets in the universe. */
  assets: number;
  /** Each household's scenario picks between these many assets. */
  perHousehold: [number, number];
  /** Month-ends of history. */
  months: number;
}

export const BOOK_DEFAULTS: BookSettings = { seed: 7, households: 12, assets: 30, perHousehold: [8, 14], months: 96 };

const CLASSES: BookAsset['assetClass'][] = ['Equity', 'Equity', 'Bonds', 'Bonds', 'Real assets', 'Alternatives'];
const CURRENCIES: BookHousehold['baseCurrency'][] = ['EUR', 'USD', 'GBP'];
const FAMILIES = [
  'Ardent',
  'Belleby',
  'Corrow',
  'Dunmere',
  'Elsford',
  'Fenwick',
  'Garrow',
  'Hollins',
  'Ivers',
  'Jarrat',
];

function monthEnds(months: number, lastYear: number): string[] {
  const out: string[] = [];
  for (let k = months - 1; k >= 0; k--) {
    const index = lastYear * 12 + 11 - k; // December of lastYear is the last month
    const y = Math.floor(index / 12);
    const m = index % 12;
    const d = new Date(Date.UTC(y, m + 1, 0));
    out.push(d.toISOString().slice(0, 10));
  }
  return out;
}

const round = (v: number, digits: number) => Math.round(v * 10 ** digits) / 10 ** digits;

function pick<T>(random: RandomSource, items: readonly T[], count: number): T[] {
  const pool = [...items];
  for (let i = pool.length - 1; i > 0; i--) {
    const j = Math.floor(random.uniform() * (i + 1));
    [pool[i], pool[j]] = [pool[j], pool[i]];
  }
  return pool.slice(0, count);
}

export function generateBook(settings: Partial<BookSettings> = {}): Book {
  const s = { ...BOOK_DEFAULTS, ...settings };
  const random = createRandom(s.seed);
  const dates = monthEnds(s.months, 2025);
  const assets: BookAsset[] = Array.from({ length: s.assets }, (_, i) => {
    const assetClass = CLASSES[i % CLASSES.length];
    const liquidity: BookAsset['liquidity'] =
      assetClass === 'Alternatives' ? (i % 2 === 0 ? 'illiquid' : 'monthly') : 'daily';
    const id = `BK-${String(i + 1).padStart(3, '0')}`;
    return { id, name: `Invented ${assetClass.toLowerCase()} fund ${i + 1}`, assetClass, liquidity };
  });
  // One market factor and a class factor; monthly log returns, vols 4-25 % a year.
  const closes: Record<string, number[]> = {};
  const market = dates.map(() => 0.045 * random.normal());
  const byClass = new Map(CLASSES.map((c) => [c, dates.map(() => 0.02 * random.normal())]));
  for (const a of assets) {
    const beta = a.assetClass === 'Equity' ? 0.9 + 0.4 * random.uniform() : a.assetClass === 'Bonds' ? 0.1 : 0.4;
    const idio = 0.01 + 0.04 * random.uniform();
    let p = 50 + 100 * random.uniform();
    closes[a.id] = dates.map((_, t) => {
      if (t > 0) p *= Math.exp(0.004 + beta * market[t] + byClass.get(a.assetClass)![t] + idio * random.normal());
      return round(p, 4);
    });
  }
  const rates: Record<string, number[]> = {};
  for (const [ccy, level] of [
    ['USD', 0.9],
    ['GBP', 1.15],
  ] as const) {
    let r = level;
    rates[ccy] = dates.map((_, t) => {
      if (t > 0) r *= Math.exp(0.02 * random.normal());
      return round(r, 6);
    });
  }
  const savedDay = dates[Math.floor(dates.length * 0.75)];
  const asOf = dates[dates.length - 1];
  const households: BookHousehold[] = Array.from({ length: s.households }, (_, h) => {
    const kind: BookHouseholdKind =
      h === 0
        ? 'no-holdings'
        : h === 1
          ? 'cannot-compute'
          : h % 4 === 2
            ? 'breach'
            : h % 4 === 3
              ? 'on-target'
              : 'drifted';
    const baseCurrency = CURRENCIES[h % CURRENCIES.length];
    const [lo, hi] = s.perHousehold;
    const count = lo + Math.floor(random.uniform() * (hi - lo + 1));
    const chosen = pick(random, assets, Math.min(count, assets.length)).sort((a, b) => (a.id < b.id ? -1 : 1));
    const ids = chosen.map((a) => a.id);
    const cap = round(Math.max(2 / ids.length, 0.15 + 0.1 * random.uniform()), 2);
    const equity = chosen.filter((a) => a.assetClass === 'Equity').map((a) => a.id);
    const scenario: ScenarioInput = {
      format: 'holdfast-scenario@1',
      name: `Review ${h + 1} (invented)`,
      baseCurrency,
      assets: ids,
      returns: { frequency: 'monthly', method: 'log', maxFillDays: 5 },
      constraints: {
        weightBounds: { default: kind === 'cannot-compute' ? [0.2, 1] : [0, cap] },
        ...(equity.length > 0 ? { groups: [{ name: 'Equity', members: equity, max: 0.7 }] } : {}),
        illiquidMax: 0.1,
      },
      assetInfo: Object.fromEntries(
        chosen.map((a) => [a.id, { name: a.name, assetClass: a.assetClass, currency: 'EUR', liquidity: a.liquidity }]),
      ),
      candidates: [
        { id: 'sample-maxdiv', estimator: { method: 'sample' }, objective: { method: 'max-diversification' } },
        { id: 'sample-minvar', estimator: { method: 'sample' }, objective: { method: 'min-variance' } },
      ],
      recommended: 'sample-maxdiv',
    };
    let holdings: BookHolding[] = [];
    if (kind !== 'no-holdings') {
      const total = 1e6 * (1 + 9 * random.uniform());
      const weights = ids.map(() => 0.5 + random.uniform());
      if (kind === 'breach') weights[0] = (weights.reduce((x, y) => x + y, 0) * cap * 2) / (1 - cap * 2); // about twice its cap
      const sum = weights.reduce((x, y) => x + y, 0);
      holdings = ids.map((asset, i) => {
        // Held in the household's own currency or in euro: every rate needed is a stored series, either way round.
        const currency = i % 3 === 1 ? baseCurrency : 'EUR';
        const inEur = (total * weights[i]) / sum;
        const rate = currency === 'EUR' ? 1 : rates[currency][dates.length - 1];
        return { asset, amount: round(inEur / rate, 2), currency, asOf };
      });
    }
    return {
      name: `${FAMILIES[h % FAMILIES.length]} household ${h + 1} (invented)`,
      baseCurrency,
      kind,
      scenario,
      holdings,
      // On-target households were re-saved at the last month-end; the others mid-history.
      savedAt: `${kind === 'on-target' ? asOf : savedDay}T17:00:00.000Z`,
    };
  });
  return { dates, assets, closes, rates, households };
}
