import type { Holdings, UniverseMember } from '../../shared-core/contract/service-api.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { listInWords } from '../../shared-core/present/format.js';
import { coarsestPricing } from '../../shared-core/returns/coarsest-pricing.js';
import { SCENARIO_FORMAT, type ScenarioInput } from '../../shared-core/scenario/schema.js';
import { candidateId, candidateLabel } from '../scenario/candidate-grid.js';

/**
 * The limits a new scenario starts from when the household has no mandate on file (no earlier
 * scenario): long-only, no asset above 100 %, illiquid assets at most 10 % together (a prudent
 * common-practice figure, from memory). The page says so beside the limits.
 */
export const STATED_DEFAULTS: NonNullable<ScenarioInput['constraints']> = { longOnly: true, illiquidMax: 0.1 };

export const STATED_DEFAULTS_TEXT =
  'long-only, no asset above 100 %, illiquid assets at most 10 % together, no turnover limit';

/** The household's mandate: the limits of its newest scenario, and where they come from. */
export interface HouseholdMandate {
  /** "Annual review 2025, revision 3". */
  source: string;
  constraints: NonNullable<ScenarioInput['constraints']>;
}

/** The mandate's limits restricted to `assets`: own bounds and band members outside them dropped. */
export function mandateFor(mandate: HouseholdMandate, assets: readonly string[]): ScenarioInput['constraints'] {
  const inScope = new Set(assets);
  const c = mandate.constraints;
  const bounds = c.weightBounds
    ? Object.fromEntries(Object.entries(c.weightBounds).filter(([a]) => a === 'default' || inScope.has(a)))
    : undefined;
  const groups = (c.groups ?? [])
    .map((g) => ({ ...g, members: g.members.filter((m) => inScope.has(m)) }))
    .filter((g) => g.members.length > 0);
  return {
    ...c,
    ...(bounds && Object.keys(bounds).length > 0 ? { weightBounds: bounds } : { weightBounds: undefined }),
    ...(groups.length > 0 ? { groups } : { groups: undefined }),
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
  const document: ScenarioInput = {
    format: SCENARIO_FORMAT,
    name: input.name,
    baseCurrency: input.baseCurrency,
    assets,
    window: { years: 5 },
    returns: { frequency: pricing.frequency, method: 'log', maxFillDays: 5 },
    constraints: input.mandate ? mandateFor(input.mandate, assets) : { ...STATED_DEFAULTS },
    ...(current ? { current } : {}),
    candidates: [
      { id: candidateId(estimator, objective), label: candidateLabel(estimator, objective), estimator, objective },
    ],
  };
  const limits = input.mandate
    ? `Limits from the household's mandate (${input.mandate.source}).`
    : `The household has no mandate on file, so the limits are stated defaults: ${STATED_DEFAULTS_TEXT}.`;
  const frequency =
    pricing.frequency === 'daily'
      ? 'Daily returns: every asset is priced daily.'
      : `${pricing.frequency === 'monthly' ? 'Monthly' : 'Weekly'} returns, because ${listInWords(pricing.assets.slice(0, 3))}${pricing.assets.length > 3 ? ` and ${pricing.assets.length - 3} more` : ''} ${pricing.assets.length === 1 ? 'is' : 'are'} priced ${pricing.frequency}.`;
  return { document, origin: `${limits} ${frequency}` };
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
