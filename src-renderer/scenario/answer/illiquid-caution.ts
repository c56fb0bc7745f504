import type { CandidateResult } from '../../../shared-core/optimise/result.js';
import type { Scenario } from '../../../shared-core/scenario/schema.js';

/** Above this share of the portfolio an uncapped illiquid weight earns a caution (Holdfast's choice). */
export const ILLIQUID_CAUTION_ABOVE = 0.05;

export interface IlliquidCaution {
  /** The candidate with the largest illiquid weight, and that weight. */
  candidate: string;
  weight: number;
  assets: string[];
}

/**
 * A caution when the scenario sets no cap on illiquid assets together and a solved candidate
 * puts more than 5 % in them: money in a fund with a lock-up cannot be taken back on request.
 */
export function illiquidCaution(
  scenario: Pick<Scenario, 'constraints' | 'assetInfo'>,
  candidates: readonly CandidateResult[],
): IlliquidCaution | null {
  if (scenario.constraints.illiquidMax !== undefined) return null;
  const illiquid = Object.entries(scenario.assetInfo ?? {})
    .filter(([, info]) => info.liquidity === 'illiquid')
    .map(([a]) => a);
  if (illiquid.length === 0) return null;
  let worst: IlliquidCaution | null = null;
  for (const c of candidates) {
    if (c.status !== 'optimal') continue;
    const held = illiquid.filter((a) => (c.weights[a] ?? 0) > 0);
    const weight = held.reduce((s, a) => s + (c.weights[a] ?? 0), 0);
    if (weight > ILLIQUID_CAUTION_ABOVE && (!worst || weight > worst.weight))
      worst = { candidate: c.id, weight, assets: held };
  }
  return worst;
}
