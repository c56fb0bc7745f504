import type { Holdings, UniverseMember } from '../../shared-core/contract/service-api.js';
import { SCENARIO_FORMAT, type ScenarioInput } from '../../shared-core/scenario/schema.js';

/**
 * The first revision of a new scenario: the universe's priced assets (exchange-rate series left
 * out), the last five years of daily log returns, long-only, the household's holdings as the
 * turnover reference, and one candidate to start from. The advisor shapes the rest in the editor.
 */
export function starterScenario(input: {
  name: string;
  baseCurrency: string;
  members: readonly UniverseMember[];
  holdings: Holdings | undefined;
}): ScenarioInput {
  const assets = input.members.filter((m) => m.asset.fx === null).map((m) => m.asset.id);
  const inScope = new Set(assets);
  const held = (input.holdings?.positions ?? []).filter((p) => inScope.has(p.asset) && p.valueInBase !== null);
  const heldTotal = held.reduce((s, p) => s + (p.valueInBase ?? 0), 0);
  const current =
    heldTotal > 0 ? Object.fromEntries(held.map((p) => [p.asset, (p.valueInBase ?? 0) / heldTotal])) : undefined;
  return {
    format: SCENARIO_FORMAT,
    name: input.name,
    baseCurrency: input.baseCurrency,
    assets,
    window: { years: 5 },
    returns: { frequency: 'daily', method: 'log', maxFillDays: 5 },
    constraints: { longOnly: true },
    ...(current ? { current } : {}),
    candidates: [
      {
        id: 'lw-maxdiv',
        label: 'Ledoit-Wolf, maximum diversification',
        estimator: { method: 'ledoit-wolf' },
        objective: { method: 'max-diversification' },
      },
    ],
  };
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
