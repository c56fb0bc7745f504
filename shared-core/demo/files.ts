import type { PriceTable } from '../prices/price-table.js';
import { DEMO_FX_ID, FX_DECIMALS, PRICE_DECIMALS, type DemoData } from './generate.js';

/**
 * The demonstration data as files: a wide price CSV (`date`, then one column per asset id; an
 * empty cell where there is no price), the FX CSV in the same form, the scenario document and a
 * household document. Text only, `\n` line ends, fixed decimals: the same data, the same bytes.
 */
export const DEMO_FILE_NAMES = {
  prices: 'demo-prices.csv',
  fx: 'demo-fx.csv',
  scenario: 'demo-scenario.json',
  household: 'demo-household.json',
  readme: 'README-DEMO.txt',
} as const;

export const DEMO_HOUSEHOLD_FORMAT = 'holdfast-demo-household@1';

export interface DemoFile {
  name: string;
  text: string;
}

export function widePriceCsv(table: PriceTable, decimals: number): string {
  const lines = [['date', ...table.assets].join(',')];
  for (let t = 0; t < table.dates.length; t++) {
    const cells = [table.dates[t]];
    for (const column of table.closes) cells.push(Number.isNaN(column[t]) ? '' : column[t].toFixed(decimals));
    lines.push(cells.join(','));
  }
  return lines.join('\n') + '\n';
}

/** The household document: who they are, what they hold, and the tags of every asset. */
export function demoHouseholdDocument(data: DemoData): unknown {
  const { household } = data;
  return {
    format: DEMO_HOUSEHOLD_FORMAT,
    notice: data.notice,
    seed: data.seed,
    household: {
      name: household.name,
      reference: household.reference,
      baseCurrency: household.baseCurrency,
      members: household.members,
      notes: household.notes,
    },
    asOf: household.asOf,
    holdings: data.holdings,
    assets: data.assets.map((a) => ({
      id: a.id,
      name: a.name,
      assetClass: a.assetClass,
      region: a.region,
      currency: a.currency,
      liquidity: a.liquidity,
      pricing: a.pricing,
      lockUpDays: a.lockUpDays ?? null,
      firstPrice: a.inception ?? data.prices.dates[0],
      ...(a.notes ? { notes: a.notes } : {}),
    })),
    universe: data.universe,
    // Units of `quote` per one `base`, as the store records an exchange-rate series.
    fx: [{ id: DEMO_FX_ID, name: 'US dollar in euro (invented)', base: 'USD', quote: 'EUR' }],
    files: {
      prices: DEMO_FILE_NAMES.prices,
      fx: DEMO_FILE_NAMES.fx,
      scenario: DEMO_FILE_NAMES.scenario,
    },
  };
}

export function demoFiles(data: DemoData): DemoFile[] {
  const readme = [
    'Holdfast demonstration data',
    '',
    data.notice,
    '',
    `Seed ${data.seed}. Daily closes ${data.prices.dates[0]} to ${data.prices.dates[data.prices.dates.length - 1]} from a seeded multi-factor model with calm and stressed regimes.`,
    `${DEMO_FILE_NAMES.prices}: wide form, date then one column per asset id, closes in each asset's own currency (see ${DEMO_FILE_NAMES.household}); an empty cell means no price that day.`,
    `${DEMO_FILE_NAMES.fx}: ${DEMO_FX_ID}, euro per one US dollar, on euro trading days.`,
    `${DEMO_FILE_NAMES.scenario}: holdfast-scenario@1, three estimators times two objectives.`,
    `${DEMO_FILE_NAMES.household}: the invented household, its holdings (amounts in currency) and the asset tags.`,
    '',
  ].join('\n');
  return [
    { name: DEMO_FILE_NAMES.prices, text: widePriceCsv(data.prices, PRICE_DECIMALS) },
    { name: DEMO_FILE_NAMES.fx, text: widePriceCsv(data.fx, FX_DECIMALS) },
    { name: DEMO_FILE_NAMES.scenario, text: JSON.stringify(data.scenario, null, 2) + '\n' },
    { name: DEMO_FILE_NAMES.household, text: JSON.stringify(demoHouseholdDocument(data), null, 2) + '\n' },
    { name: DEMO_FILE_NAMES.readme, text: readme },
  ];
}
