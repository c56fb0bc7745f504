import { InputError } from '../errors.js';
import type { PriceTable } from '../prices/price-table.js';
import type { ScenarioInput } from '../scenario/schema.js';
import { demoAssets, type DemoAssetSpec } from './assets.js';
import { DEMO_NOTICE, demoHouseholdProfile, type DemoHouseholdProfile } from './household.js';
import { demoScenario } from './scenario.js';
import { simulate } from './simulate.js';

/**
 * The whole invented demonstration data set from one seed: household, holdings, universe,
 * daily prices, the USD-in-EUR rate and the demo scenario. Pure and deterministic: the same seed
 * gives the same numbers, and `demoFiles` turns them into the same bytes.
 */
// Chosen among the first few hundred seeds because its path reads like a plausible decade: broad
// equity up, a dozen stressed spells, bonds and gold positive. Any integer seed works.
export const DEFAULT_DEMO_SEED = 2;
export const DEMO_FROM = '2014-01-02';
export const DEMO_TO = '2025-12-31';
export const DEMO_UNIVERSE_NAME = 'Demo multi-asset universe (invented)';
/**
 * Column id of the FX series: the price of one US dollar in euro. Named by the currency it
 * prices, the form the returns engine's `fx` table takes (shared-core/returns/build-returns.ts).
 */
export const DEMO_FX_ID = 'USD';
export const PRICE_DECIMALS = 4;
export const FX_DECIMALS = 6;

export interface DemoHoldingValue {
  asset: string;
  currency: 'EUR' | 'USD';
  amount: number;
  /** The amount in euro at the as-of date's rate, rounded to cents. */
  baseAmount: number;
}

export interface DemoData {
  seed: number;
  notice: string;
  household: DemoHouseholdProfile;
  holdings: DemoHoldingValue[];
  assets: readonly DemoAssetSpec[];
  universe: { name: string; assets: string[] };
  /** Closes in each asset's own currency. */
  prices: PriceTable;
  /** One column, `USD`: euro per US dollar on euro trading days. */
  fx: PriceTable;
  /** 1 where the model was in its stressed regime (aligned with `prices.dates`). */
  stressed: Uint8Array;
  scenario: ScenarioInput;
}

export function generateDemo(options: { seed?: number } = {}): DemoData {
  const seed = options.seed ?? DEFAULT_DEMO_SEED;
  if (!Number.isSafeInteger(seed))
    throw new InputError(`the seed must be a whole number, got ${seed}`, { path: 'seed' });
  const sim = simulate(demoAssets, {
    seed,
    from: DEMO_FROM,
    to: DEMO_TO,
    missingRate: 0.0015,
    priceDecimals: PRICE_DECIMALS,
    fxDecimals: FX_DECIMALS,
    fxStart: 0.73,
  });
  const assets = demoAssets;
  const prices: PriceTable = {
    dates: sim.dates,
    assets: assets.map((a) => a.id),
    closes: sim.closes,
    currencies: assets.map((a) => a.currency),
  };
  // The FX file lists euro trading days only.
  const fxRows = sim.dates.map((d, t) => [d, sim.usdInEur[t]] as const).filter(([, v]) => !Number.isNaN(v));
  const fx: PriceTable = {
    dates: fxRows.map(([d]) => d),
    assets: [DEMO_FX_ID],
    closes: [Float64Array.from(fxRows.map(([, v]) => v))],
    currencies: ['EUR'],
  };
  const profile = demoHouseholdProfile;
  const rate = lastOnOrBefore(fx.dates, fx.closes[0], profile.asOf);
  const holdings = profile.holdings.map((h) => ({
    ...h,
    baseAmount: Math.round((h.currency === 'EUR' ? h.amount : h.amount * rate) * 100) / 100,
  }));
  const total = holdings.reduce((s, h) => s + h.baseAmount, 0);
  const current = Object.fromEntries(holdings.map((h) => [h.asset, Math.round((h.baseAmount / total) * 1e6) / 1e6]));
  return {
    seed,
    notice: DEMO_NOTICE,
    household: profile,
    holdings,
    assets,
    universe: { name: DEMO_UNIVERSE_NAME, assets: assets.map((a) => a.id) },
    prices,
    fx,
    stressed: sim.stressed,
    scenario: demoScenario(assets, current),
  };
}

function lastOnOrBefore(dates: readonly string[], values: Float64Array, date: string): number {
  for (let t = dates.length - 1; t >= 0; t--) if (dates[t] <= date && !Number.isNaN(values[t])) return values[t];
  throw new RangeError(`no value on or before ${date}`);
}
