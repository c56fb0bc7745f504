import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { optimal } from '../../support/candidate-status.js';
import { easterSunday, isoOfDay } from '../../../shared-core/demo/calendar.js';
import {
  DEFAULT_DEMO_SEED,
  DEMO_NOTICE,
  demoFiles,
  generateDemo,
  type DemoData,
} from '../../../shared-core/demo/index.js';
import { regimeSwitching } from '../../../shared-core/demo/factors.js';
import { priceTableFromText } from '../../../src-main/io/read-price-table.js';
import { buildReturns } from '../../../shared-core/returns/build-returns.js';
import { runScenario } from '../../../shared-core/run/run-scenario.js';
import { parseScenario } from '../../../shared-core/scenario/schema.js';

const demo = generateDemo();
const col = (d: DemoData, id: string) => d.prices.closes[d.prices.assets.indexOf(id)];
const row = (d: DemoData, date: string) => d.prices.dates.indexOf(date);

function digest(d: DemoData): string {
  const h = createHash('sha256');
  for (const f of demoFiles(d)) h.update(`${f.name}\n${f.text}`);
  return h.digest('hex');
}

/** Month-end log returns (last price of each month, looking back at most five rows for a gap). */
function monthlyReturns(d: DemoData, id: string): number[] {
  const c = col(d, id);
  const ends: number[] = [];
  d.prices.dates.forEach((date, t) => {
    if (t === d.prices.dates.length - 1 || d.prices.dates[t + 1].slice(0, 7) !== date.slice(0, 7)) ends.push(t);
  });
  const at = (t: number) => {
    for (let s = t; s >= Math.max(0, t - 5); s--) if (!Number.isNaN(c[s])) return c[s];
    return NaN;
  };
  const out: number[] = [];
  for (let k = 1; k < ends.length; k++) {
    const r = Math.log(at(ends[k]) / at(ends[k - 1]));
    if (Number.isFinite(r)) out.push(r);
  }
  return out;
}

const mean = (x: number[]) => x.reduce((a, b) => a + b, 0) / x.length;
const sd = (x: number[]) => Math.sqrt(x.reduce((a, b) => a + (b - mean(x)) ** 2, 0) / (x.length - 1));
function corr(x: number[], y: number[]): number {
  const n = Math.min(x.length, y.length);
  const a = x.slice(-n);
  const b = y.slice(-n);
  const ma = mean(a);
  const mb = mean(b);
  let sab = 0;
  let saa = 0;
  let sbb = 0;
  for (let i = 0; i < n; i++) {
    sab += (a[i] - ma) * (b[i] - mb);
    saa += (a[i] - ma) ** 2;
    sbb += (b[i] - mb) ** 2;
  }
  return sab / Math.sqrt(saa * sbb);
}

describe('demo data: deterministic', () => {
  it('the same seed gives the same bytes (SHA-256 of every file)', () => {
    expect(digest(generateDemo())).toBe(digest(generateDemo({ seed: DEFAULT_DEMO_SEED })));
  });

  it('the default seed gives the recorded bytes, so a change to the generator is seen', () => {
    // Recorded from this generator; update it deliberately when the demo data is meant to change.
    expect(digest(demo)).toBe('9ec38607ab7dde82d008c62c4fb18dbd89a5276182bb65c73abf80f76878c789');
  });

  it('another seed gives other prices, but the same household, universe and dates', () => {
    const other = generateDemo({ seed: 7 });
    expect(digest(other)).not.toBe(digest(demo));
    expect(other.prices.dates).toEqual(demo.prices.dates);
    expect(other.universe).toEqual(demo.universe);
    expect(other.household.holdings).toEqual(demo.household.holdings);
  });

  it('refuses a seed that is not an integer', () => {
    expect(() => generateDemo({ seed: 1.5 })).toThrow(/whole number/);
  });
});

describe('demo data: marked as invented', () => {
  it('every asset is a "Demo" fund or carries "(invented)", and so do the household and the scenario', () => {
    for (const a of demo.assets) expect(a.name.startsWith('Demo ') || a.name.includes('(invented)')).toBe(true);
    expect(demo.household.name).toContain('(invented)');
    expect(demo.scenario.name).toContain('invented');
    expect(demo.universe.name).toContain('invented');
  });

  it('every file says it is invented demonstration data', () => {
    for (const f of demoFiles(demo).filter((f) => !f.name.endsWith('.csv')))
      expect(f.text.toLowerCase(), f.name).toContain('invented');
    const household = JSON.parse(demoFiles(demo).find((f) => f.name === 'demo-household.json')!.text);
    expect(household.notice).toBe(DEMO_NOTICE);
  });
});

describe('demo data: the household and its universe', () => {
  it('holds about 25 assets across the classes a family office holds, one of them a USD single stock', () => {
    expect(demo.assets.length).toBeGreaterThanOrEqual(22);
    expect(demo.assets.length).toBeLessThanOrEqual(28);
    const classes = new Set(demo.assets.map((a) => a.assetClass));
    for (const c of [
      'equity',
      'government-bond',
      'corporate-bond',
      'inflation-linked',
      'gold',
      'real-estate',
      'hedge-fund',
      'single-stock',
    ])
      expect(classes.has(c as never), c).toBe(true);
    const stocks = demo.assets.filter((a) => a.assetClass === 'single-stock');
    expect(stocks).toHaveLength(1);
    expect(stocks[0].currency).toBe('USD');
    expect(demo.assets.filter((a) => a.pricing === 'monthly').length).toBeGreaterThanOrEqual(3);
    expect(new Set(demo.assets.map((a) => a.id)).size).toBe(demo.assets.length);
  });

  it('current holdings are currency amounts that convert to euro at the as-of rate and weigh to 1', () => {
    const usd = demo.holdings.find((h) => h.currency === 'USD')!;
    const rate = demo.fx.closes[0][demo.fx.dates.indexOf(demo.household.asOf)];
    expect(usd.baseAmount).toBeCloseTo(usd.amount * rate, 2);
    const weights = Object.values(demo.scenario.current ?? {});
    expect(weights.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 5);
    // The legacy stake is the largest single position: the reason this household needs advice.
    expect(Math.max(...weights)).toBe(demo.scenario.current!['LMI-US']);
  });

  it('the scenario is a valid holdfast-scenario@1 document with 3 estimators x 2 objectives, caps and bands', () => {
    const parsed = parseScenario(demo.scenario);
    if (!parsed.ok) throw new Error(parsed.errors.map((e) => `${e.location.path}: ${e.message}`).join('\n'));
    const s = parsed.scenario;
    expect(s.candidates).toHaveLength(6);
    expect(new Set(s.candidates.map((c) => c.estimator.method)).size).toBe(3);
    expect(new Set(s.candidates.map((c) => c.objective.method))).toEqual(
      new Set(['max-diversification', 'min-variance']),
    );
    expect(s.constraints.weightBounds?.default).toEqual([0, 0.15]);
    expect(s.constraints.groups?.length).toBeGreaterThanOrEqual(3);
    expect(s.assets).toEqual(demo.universe.assets);
    // Feasible by construction: the caps leave room for a fully invested portfolio.
    const caps = s.assets!.map((a) => s.constraints.weightBounds?.[a]?.[1] ?? 0.15);
    expect(caps.reduce((a, b) => a + b, 0)).toBeGreaterThan(1);
  });
});

describe('demo data: the price history', () => {
  it('covers about twelve years of weekdays, 2014 to 2025', () => {
    expect(demo.prices.dates[0]).toBe('2014-01-02');
    expect(demo.prices.dates.at(-1)).toBe('2025-12-31');
    expect(demo.prices.dates.length).toBeGreaterThan(3000);
    for (const d of demo.prices.dates) expect([0, 6]).not.toContain(new Date(`${d}T00:00:00Z`).getUTCDay());
  });

  it('has no euro-fund price on Christmas, Good Friday or Easter Monday (Easter 2019-04-21, 2024-03-31)', () => {
    // Easter dates from the published Gregorian tables; the algorithm is Meeus (1991).
    expect(isoOfDay(easterSunday(2019))).toBe('2019-04-21');
    expect(isoOfDay(easterSunday(2024))).toBe('2024-03-31');
    expect(row(demo, '2024-12-25')).toBe(-1); // both calendars closed
    const goodFriday = row(demo, '2024-03-29');
    const easterMonday = row(demo, '2024-04-01');
    expect(easterMonday).toBeGreaterThan(-1); // the US-style calendar trades
    expect(col(demo, 'EQ-EUR')[easterMonday]).toBeNaN();
    expect(col(demo, 'LMI-US')[easterMonday]).toBeGreaterThan(0);
    expect(goodFriday).toBe(-1);
  });

  it('the US-listed stock has no price on US Thanksgiving while the euro funds do (2025-11-27)', () => {
    const t = row(demo, '2025-11-27');
    expect(col(demo, 'LMI-US')[t]).toBeNaN();
    expect(col(demo, 'EQ-GLB')[t]).toBeGreaterThan(0);
  });

  it('later inceptions: no price before the first date, a price on it', () => {
    for (const a of demo.assets.filter((a) => a.inception)) {
      const c = col(demo, a.id);
      const first = c.findIndex((v) => !Number.isNaN(v));
      expect(demo.prices.dates[first], a.id).toBe(a.inception);
      expect(c[first]).toBe(a.startPrice);
    }
    expect(demo.assets.filter((a) => a.inception).length).toBeGreaterThanOrEqual(4);
  });

  it('hedge-fund-style funds publish month-end values only, one per month', () => {
    for (const a of demo.assets.filter((a) => a.pricing === 'monthly' && !a.inception)) {
      const c = col(demo, a.id);
      const months = new Set<string>();
      c.forEach((v, t) => {
        if (Number.isNaN(v)) return;
        const m = demo.prices.dates[t].slice(0, 7);
        expect(months.has(m), `${a.id} ${m}`).toBe(false);
        months.add(m);
      });
      expect(months.size).toBe(144);
    }
  });

  it('a suspension leaves a gap longer than a week; feed gaps are rare single days', () => {
    const c = col(demo, 'RE-GLB');
    const from = row(demo, '2021-03-08');
    for (let t = from; t < from + 8; t++) expect(c[t]).toBeNaN();
    const missing = col(demo, 'EQ-GLB').filter((v) => Number.isNaN(v)).length / demo.prices.dates.length;
    expect(missing).toBeGreaterThan(0);
    expect(missing).toBeLessThan(0.02);
  });

  it('every price is positive and rounded to four decimals; the FX file lists euro trading days only', () => {
    for (const c of demo.prices.closes)
      for (const v of c) if (!Number.isNaN(v)) expect(Math.abs(v * 1e4 - Math.round(v * 1e4))).toBeLessThan(1e-6);
    expect(demo.fx.closes[0].every((v) => v > 0.4 && v < 1.6)).toBe(true);
    expect(demo.fx.dates).not.toContain('2024-04-01');
  });

  it('the price file reads back through the wide CSV parser exactly', () => {
    const files = demoFiles(demo);
    const table = priceTableFromText(files.find((f) => f.name === 'demo-prices.csv')!.text).table;
    expect(table.assets).toEqual(demo.prices.assets);
    expect(table.dates).toEqual(demo.prices.dates);
    table.closes.forEach((c, i) => expect(Array.from(c)).toEqual(Array.from(demo.prices.closes[i])));
    const fx = priceTableFromText(files.find((f) => f.name === 'demo-fx.csv')!.text).table;
    expect(Array.from(fx.closes[0])).toEqual(Array.from(demo.fx.closes[0]));
  });
});

describe('demo data: statistics of the seeded model (ranges are common practice for these asset classes)', () => {
  const vol = (id: string) => sd(monthlyReturns(demo, id)) * Math.sqrt(12);

  it('annualised volatilities: equity 12-25%, core government bonds 3-9%, money market under 1%, single stock over 25%', () => {
    for (const id of ['EQ-GLB', 'EQ-EUR', 'EQ-NAM']) {
      expect(vol(id), id).toBeGreaterThan(0.12);
      expect(vol(id), id).toBeLessThan(0.25);
    }
    expect(vol('GOV-EUR')).toBeGreaterThan(0.03);
    expect(vol('GOV-EUR')).toBeLessThan(0.09);
    expect(vol('MM-EUR')).toBeLessThan(0.01);
    expect(vol('LMI-US')).toBeGreaterThan(0.25);
  });

  it('correlations: equity funds move together, government bonds do not follow equity', () => {
    const eq = monthlyReturns(demo, 'EQ-GLB');
    expect(corr(eq, monthlyReturns(demo, 'EQ-EUR'))).toBeGreaterThan(0.6);
    expect(corr(eq, monthlyReturns(demo, 'GOV-EUR'))).toBeLessThan(0.2);
    expect(corr(eq, monthlyReturns(demo, 'CORP-HY-H'))).toBeGreaterThan(0.3);
  });

  it('stressed days are more volatile than calm ones, and come in spells', () => {
    const c = col(demo, 'EQ-GLB');
    const calm: number[] = [];
    const stressed: number[] = [];
    for (let t = 1; t < c.length; t++) {
      const r = Math.log(c[t] / c[t - 1]);
      if (Number.isFinite(r)) (demo.stressed[t] ? stressed : calm).push(r);
    }
    expect(sd(stressed) / sd(calm)).toBeGreaterThan(1.6);
    let spells = 0;
    for (let t = 1; t < demo.stressed.length; t++) if (demo.stressed[t] && !demo.stressed[t - 1]) spells++;
    expect(spells).toBeGreaterThanOrEqual(3);
    // Stationary share of a two-state Markov chain: p / (p + q) (any textbook on Markov chains).
    const share = demo.stressed.reduce((a, b) => a + b, 0) / demo.stressed.length;
    const stationary =
      regimeSwitching.calmToStressed / (regimeSwitching.calmToStressed + regimeSwitching.stressedToCalm);
    expect(share).toBeGreaterThan(stationary / 3);
    expect(share).toBeLessThan(stationary * 2);
  });

  it('smoothed monthly values are positively autocorrelated at lag one (Getmansky, Lo and Makarov 2004)', () => {
    const lag1 = (x: number[]) => corr(x.slice(1), x.slice(0, -1));
    const funds = demo.assets.filter((a) => a.pricing === 'monthly').map((a) => lag1(monthlyReturns(demo, a.id)));
    expect(mean(funds)).toBeGreaterThan(0.15);
    // Daily-priced funds carry no such smoothing.
    expect(Math.abs(lag1(monthlyReturns(demo, 'EQ-GLB')))).toBeLessThan(0.25);
  });
});

describe('demo data: through the returns engine (shared-core/returns/build-returns.ts)', () => {
  it('monthly euro returns of all 25 assets over the demo window, the USD stock converted with the FX series', () => {
    const result = buildReturns(demo.prices, {
      frequency: 'monthly',
      method: 'log',
      from: '2018-01-01',
      baseCurrency: 'EUR',
      fx: demo.fx,
    });
    expect(result.assets).toEqual(demo.prices.assets);
    expect(result.returns.rows).toBeGreaterThan(90);
    // The converted stock moves with the dollar: its euro return minus its dollar return is the FX return.
    const usdOnly = buildReturns(demo.prices, { frequency: 'monthly', method: 'log', from: '2018-01-01' });
    const k = result.assets.indexOf('LMI-US');
    const n = result.returns.cols;
    const diff: number[] = [];
    for (let t = 0; t < result.returns.rows; t++)
      diff.push(result.returns.data[t * n + k] - usdOnly.returns.data[t * n + k]);
    expect(sd(diff) * Math.sqrt(12)).toBeGreaterThan(0.04);
    expect(sd(diff) * Math.sqrt(12)).toBeLessThan(0.15);
  });

  it('a daily estimate refuses the monthly-priced funds by name, as the engine should', () => {
    expect(() =>
      buildReturns(demo.prices, { frequency: 'daily', method: 'log', baseCurrency: 'EUR', fx: demo.fx }),
    ).toThrow(/HF-/);
  });
});

describe('demo data: the demo scenario solves (shared-core/run/run-scenario.ts)', () => {
  it('all six candidates are optimal, fully invested, and keep the caps, the bands and the illiquid cap', () => {
    const parsed = parseScenario(demo.scenario);
    if (!parsed.ok) throw new Error('the demo scenario does not parse');
    const s = parsed.scenario;
    const run = runScenario(s, demo.prices, { fx: demo.fx });
    expect(run.candidates.map((c) => c.status)).toEqual(Array(6).fill('optimal'));
    const tol = 1e-6;
    for (const c of run.candidates.map(optimal)) {
      const w = c.weights;
      const total = Object.values(w).reduce((a, b) => a + b, 0);
      expect(total, c.id).toBeCloseTo(1, 6);
      for (const [asset, x] of Object.entries(w)) {
        const [lo, hi] = s.constraints.weightBounds?.[asset] ?? s.constraints.weightBounds!.default;
        expect(x, `${c.id} ${asset}`).toBeGreaterThanOrEqual(lo - tol);
        expect(x, `${c.id} ${asset}`).toBeLessThanOrEqual(hi + tol);
      }
      for (const g of s.constraints.groups ?? []) {
        const sum = g.members.reduce((a, m) => a + (w[m] ?? 0), 0);
        if (g.min !== undefined) expect(sum, `${c.id} ${g.name}`).toBeGreaterThanOrEqual(g.min - tol);
        if (g.max !== undefined) expect(sum, `${c.id} ${g.name}`).toBeLessThanOrEqual(g.max + tol);
      }
      const illiquid = demo.assets.filter((a) => a.liquidity === 'illiquid').reduce((a, x) => a + (w[x.id] ?? 0), 0);
      expect(illiquid).toBeLessThanOrEqual(s.constraints.illiquidMax! + tol);
    }
  });
});
