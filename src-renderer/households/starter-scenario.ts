import type { Holdings, UniverseMember } from '../../shared-core/contract/service-api.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { formatPercent1, listInWords } from '../../shared-core/present/format.js';
import { coarsestPricing } from '../../shared-core/returns/coarsest-pricing.js';
import { hasMandate, mandateConstraints, type HouseholdMandate } from '../../shared-core/scenario/household-mandate.js';
import { SCENARIO_FORMAT, type ScenarioInput } from '../../shared-core/scenario/schema.js';
import { candidateId, candidateLabel } from '../scenario/candidate-grid.js';

/**
 * The limits a new scenario starts from where the household's mandate sets none: long-only, no
 * asset above 100 %, illiquid assets at most 10 % together (a prudent common-practice figure, from
 * memory). The first revision's note says which limits are these defaults; the page shows it.
 */
export const STATED_DEFAULTS: NonNullable<ScenarioInput['constraints']> = { longOnly: true, illiquidMax: 0.1 };

export const STATED_DEFAULTS_TEXT =
  'long-only, no asset above 100 %, illiquid assets at most 10 % together, no turnover limit';

const percentText = (weight: number) => `${formatPercent1(weight)} %`;
const capWords = (cap: number) => `no asset above ${percentText(cap)}`;
const illiquidWords = (cap: number) => `illiquid assets at most ${percentText(cap)} together`;

/** The limits a mandate sets, in words ("no asset above 15.0 %, illiquid assets at most 5.0 % together"). */
export function mandateInWords(mandate: HouseholdMandate): string {
  return [
    mandate.assetCap !== null ? capWords(mandate.assetCap) : null,
    mandate.illiquidMax !== null ? illiquidWords(mandate.illiquidMax) : null,
  ]
    .filter((w) => w !== null)
    .join(', ');
}

/**
 * The new scenario's limits and where they come from, in words: the household's mandate where
 * it sets a limit, the stated default where it sets none.
 */
export function startingLimits(mandate: HouseholdMandate | undefined): {
  constraints: NonNullable<ScenarioInput['constraints']>;
  origin: string;
} {
  if (!hasMandate(mandate))
    return {
      constraints: { ...STATED_DEFAULTS },
      origin: `The household has no mandate on file, so the limits are stated defaults: ${STATED_DEFAULTS_TEXT}.`,
    };
  const defaults = [
    mandate.assetCap === null ? 'no asset above 100 %' : null,
    mandate.illiquidMax === null ? illiquidWords(STATED_DEFAULTS.illiquidMax!) : null,
  ].filter((w) => w !== null);
  return {
    constraints: { ...STATED_DEFAULTS, ...mandateConstraints(mandate) },
    origin:
      `Limits from the household's mandate: long-only, ${mandateInWords(mandate)}.` +
      (defaults.length > 0
        ? ` The mandate sets no other cap, so these are stated defaults: ${defaults.join(', ')}.`
        : ''),
  };
}

export interface Starter {
  document: ScenarioInput;
  /** Where the limits and the frequency come from, in words: kept as the first revision's note. */
  origin: string;
}

/**
 * The first revision of a new scenario: the universe's priced assets (exchange-rate series left
 * out), the last five years of log returns at the frequency the coarsest of them is priced at (so
 * the first comparison computes), the household's mandate or the stated defaults, its holdings
 * as the turnover reference, and one candidate to start from. The walk-forward's window is left
 * to what the history allows.
 */
export function starterScenario(input: {
  name: string;
  baseCurrency: string;
  members: readonly UniverseMember[];
  holdings: Holdings | undefined;
  /** The universe's prices, for the frequency; absent: daily. */
  prices?: PriceTable;
  /** The household's mandate as stored (each limit null where none is set). */
  mandate?: HouseholdMandate;
}): Starter {
  const assets = input.members.filter((m) => m.asset.fx === null).map((m) => m.asset.id);
  const inScope = new Set(assets);
  const held = (input.holdings?.positions ?? []).filter((p) => inScope.has(p.asset) && p.valueInBase !== null);
  const heldTotal = held.reduce((s, p) => s + (p.valueInBase ?? 0), 0);
  const current =
    heldTotal > 0 ? Object.fromEntries(held.map((p) => [p.asset, (p.valueInBase ?? 0) / heldTotal])) : undefined;
  const pricing = input.prices ? coarsestPricing(input.prices, assets) : { frequency: 'daily' as const, assets: [] };
  const estimator = { method: 'ledoit-wolf' } as const;
  const objective = { method: 'max-diversification' } as const;
  const limits = startingLimits(input.mandate);
  const document: ScenarioInput = {
    format: SCENARIO_FORMAT,
    name: input.name,
    baseCurrency: input.baseCurrency,
    assets,
    window: { years: 5 },
    returns: { frequency: pricing.frequency, method: 'log', maxFillDays: 5 },
    constraints: limits.constraints,
    ...(current ? { current } : {}),
    candidates: [
      { id: candidateId(estimator, objective), label: candidateLabel(estimator, objective), estimator, objective },
    ],
  };
  const frequency =
    pricing.frequency === 'daily'
      ? 'Daily returns: every asset is priced daily.'
      : `${pricing.frequency === 'monthly' ? 'Monthly' : 'Weekly'} returns, because ${listInWords(pricing.assets.slice(0, 3))}${pricing.assets.length > 3 ? ` and ${pricing.assets.length - 3} more` : ''} ${pricing.assets.length === 1 ? 'is' : 'are'} priced ${pricing.frequency}.`;
  return { document, origin: `${limits.origin} ${frequency}` };
}

/** The share of the household's holdings that a universe leaves out (it cannot be traded there). */
export function shareOutsideUniverse(
  holdings: Holdings | undefined,
  members: readonly UniverseMember[],
): number | null {
  if (!holdings || holdings.total === null || holdings.total === 0) return null;
  const inScope = new Set(members.map((m) => m.asset.id));
  const outside = holdings.positions.filter((p) => !inScope.has(p.asset)).reduce((s, p) => s + (p.valueInBase ?? 0), 0);
  return outside / holdings.total;
}
