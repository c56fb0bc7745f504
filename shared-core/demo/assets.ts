import type { FactorName } from './factors.js';
import type { CalendarName } from './calendar.js';

/**
 * The invented holdings universe of the demonstration household: descriptive fund names of a
 * made-up fund range ("Demo ..."), one invented listed company, and the exposures that drive
 * their synthetic prices. None of them is, or imitates, a real fund, index or company.
 */
export type AssetClass =
  | 'equity'
  | 'government-bond'
  | 'corporate-bond'
  | 'inflation-linked'
  | 'gold'
  | 'real-estate'
  | 'hedge-fund'
  | 'money-market'
  | 'single-stock';

export type Liquidity = 'daily' | 'monthly' | 'illiquid';

export interface DemoAssetSpec {
  id: string;
  name: string;
  assetClass: AssetClass;
  region: string;
  currency: 'EUR' | 'USD';
  liquidity: Liquidity;
  /** `monthly`: a net asset value is published on the last euro trading day of each month only. */
  pricing: 'daily' | 'monthly';
  calendar: CalendarName;
  /** First price date (the simulation start when absent). */
  inception?: string;
  startPrice: number;
  /** Annual log drift beyond the factors (carry, fees, manager skill). */
  drift: number;
  /** Annualised volatility of the asset's own noise. */
  ownVol: number;
  loadings: Partial<Record<FactorName, number>>;
  /** For `illiquid`: days of lock-up before a redemption can be asked for. */
  lockUpDays?: number;
  /** Inclusive ISO dates during which dealing was suspended (no prices): a long gap on purpose. */
  suspended?: readonly [string, string];
  notes?: string;
}

export const demoAssets: readonly DemoAssetSpec[] = [
  eq('EQ-GLB', 'Demo Global Equity Fund', 'global', { world: 1, us: 0.6, fx: 0.65 }, 0.02),
  eq(
    'EQ-GLB-SUS',
    'Demo Global Sustainable Equity Fund',
    'global',
    { world: 1, us: 0.5, europe: 0.15, fx: 0.55 },
    0.03,
    {
      inception: '2017-02-01',
    },
  ),
  eq('EQ-EUR', 'Demo Europe Equity Fund', 'europe', { world: 0.95, europe: 1 }, 0.03),
  eq('EQ-EUR-SMALL', 'Demo Europe Smaller Companies Fund', 'europe', { world: 1.05, europe: 1, smallcap: 1 }, 0.05),
  eq('EQ-NAM', 'Demo North America Equity Fund', 'north-america', { world: 1, us: 1, fx: 1 }, 0.025),
  eq('EQ-EM', 'Demo Emerging Markets Equity Fund', 'emerging', { world: 1, emerging: 1, fx: 0.7 }, 0.05),
  eq(
    'EQ-APAC',
    'Demo Asia-Pacific Equity Fund',
    'asia-pacific',
    { world: 0.9, emerging: 0.4, japan: 0.3, fx: 0.6 },
    0.05,
    {
      inception: '2016-03-01',
    },
  ),
  eq('EQ-JPN', 'Demo Japan Equity Fund', 'japan', { world: 0.85, japan: 1, fx: 0.4 }, 0.04),
  bond('GOV-EUR', 'Demo Euro Government Bond Fund', 'government-bond', 'europe', { rates: 7 }, 0.012, 0.008),
  bond(
    'GOV-EUR-SHORT',
    'Demo Euro Short-Term Government Bond Fund',
    'government-bond',
    'europe',
    { rates: 2 },
    0.003,
    0.003,
  ),
  bond(
    'GOV-GLB-H',
    'Demo Global Government Bond Fund (EUR hedged)',
    'government-bond',
    'global',
    { rates: 6.5 },
    0.015,
    0.012,
  ),
  bond('CORP-EUR', 'Demo Euro Corporate Bond Fund', 'corporate-bond', 'europe', { rates: 5, credit: 5 }, 0.02, 0.01),
  bond(
    'CORP-HY-H',
    'Demo Global High Yield Bond Fund (EUR hedged)',
    'corporate-bond',
    'global',
    { rates: 3.5, credit: 4, world: 0.15 },
    0.045,
    0.02,
  ),
  bond(
    'CORP-EM',
    'Demo Emerging Markets Debt Fund',
    'corporate-bond',
    'emerging',
    { rates: 5, credit: 3, emerging: 0.25, world: 0.1, fx: 0.5 },
    0.045,
    0.03,
    {
      inception: '2017-09-01',
    },
  ),
  bond(
    'ILB-EUR',
    'Demo Euro Inflation-Linked Bond Fund',
    'inflation-linked',
    'europe',
    { rates: 6, inflation: 6 },
    0.008,
    0.01,
  ),
  bond(
    'ILB-GLB-H',
    'Demo Global Inflation-Linked Bond Fund (EUR hedged)',
    'inflation-linked',
    'global',
    { rates: 5.5, inflation: 5 },
    0.01,
    0.015,
    {
      inception: '2017-10-02',
    },
  ),
  {
    id: 'GOLD',
    name: 'Demo Physical Gold Fund',
    assetClass: 'gold',
    region: 'global',
    currency: 'EUR',
    liquidity: 'daily',
    pricing: 'daily',
    calendar: 'euro',
    startPrice: 100,
    drift: -0.002,
    ownVol: 0.01,
    loadings: { gold: 1, fx: 1 },
  },
  eq(
    'RE-EUR',
    'Demo Europe Listed Real Estate Fund',
    'europe',
    { world: 0.6, europe: 0.4, property: 1, rates: 2 },
    0.05,
    {
      assetClass: 'real-estate',
    },
  ),
  eq(
    'RE-GLB',
    'Demo Global Listed Real Estate Fund',
    'global',
    { world: 0.6, us: 0.3, property: 0.9, fx: 0.6, rates: 1.5 },
    0.04,
    {
      assetClass: 'real-estate',
      suspended: ['2021-03-08', '2021-03-17'],
      notes: 'Invented: dealing suspended for eight trading days in March 2021 (no prices).',
    },
  ),
  hedge('HF-MACRO', 'Demo Global Macro Fund', 'monthly', { world: 0.15, trend: 0.4, rates: 1, fx: 0.1 }, 0.03, 0.05),
  hedge('HF-LS', 'Demo Equity Long/Short Fund', 'monthly', { world: 0.45, smallcap: 0.2 }, 0.02, 0.04, {
    inception: '2016-07-01',
  }),
  hedge('HF-TREND', 'Demo Trend-Following Fund', 'monthly', { trend: 1.1, rates: 1 }, 0.01, 0.04),
  hedge('HF-CREDIT', 'Demo Credit Opportunities Fund', 'illiquid', { credit: 3, world: 0.15 }, 0.05, 0.025, {
    inception: '2017-06-01',
    lockUpDays: 730,
    notes: 'Invented: quarterly redemptions after a two-year lock-up.',
  }),
  {
    id: 'MM-EUR',
    name: 'Demo Euro Money Market Fund',
    assetClass: 'money-market',
    region: 'europe',
    currency: 'EUR',
    liquidity: 'daily',
    pricing: 'daily',
    calendar: 'euro',
    startPrice: 100,
    drift: 0.002,
    ownVol: 0.0015,
    loadings: { rates: 0.25 },
  },
  {
    id: 'LMI-US',
    name: 'Lindqvist Marine Instruments Inc. (invented)',
    assetClass: 'single-stock',
    region: 'north-america',
    currency: 'USD',
    liquidity: 'daily',
    pricing: 'daily',
    calendar: 'us',
    startPrice: 42.5,
    drift: 0.02,
    ownVol: 0.3,
    loadings: { world: 1.15, us: 0.8, smallcap: 0.6 },
    notes:
      "Invented: shares kept from the sale of the family's former business; listed in the United States, priced in USD.",
  },
];

function eq(
  id: string,
  name: string,
  region: string,
  loadings: DemoAssetSpec['loadings'],
  ownVol: number,
  extra: Partial<DemoAssetSpec> = {},
): DemoAssetSpec {
  return {
    id,
    name,
    assetClass: 'equity',
    region,
    currency: 'EUR',
    liquidity: 'daily',
    pricing: 'daily',
    calendar: 'euro',
    startPrice: 100,
    drift: -0.005,
    ownVol,
    loadings,
    ...extra,
  };
}

function bond(
  id: string,
  name: string,
  assetClass: AssetClass,
  region: string,
  loadings: DemoAssetSpec['loadings'],
  carry: number,
  ownVol: number,
  extra: Partial<DemoAssetSpec> = {},
): DemoAssetSpec {
  return { ...eq(id, name, region, loadings, ownVol), assetClass, drift: carry, ...extra };
}

function hedge(
  id: string,
  name: string,
  liquidity: Liquidity,
  loadings: DemoAssetSpec['loadings'],
  drift: number,
  ownVol: number,
  extra: Partial<DemoAssetSpec> = {},
): DemoAssetSpec {
  return {
    ...eq(id, name, 'global', loadings, ownVol),
    assetClass: 'hedge-fund',
    liquidity,
    pricing: 'monthly',
    drift,
    ...extra,
  };
}
