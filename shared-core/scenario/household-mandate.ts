import { z } from 'zod';
import type { Constraints } from './schema.js';

/**
 * A household's mandate: the standing limits its adviser agreed with it, kept with the household
 * (the store, the household file, the service) and copied into each new scenario, where the
 * advisor may tighten them per scenario. Weights are fractions (0.15 = 15 %); null: no limit set.
 * The messages name each field as the household form labels it, in per cent.
 */
export const householdMandateSchema = z.strictObject({
  /** The most any one asset may weigh. */
  assetCap: z
    .number({ message: 'the cap per asset must be a number of per cent' })
    .gt(0, 'the cap per asset must be above 0 %')
    .max(1, 'the cap per asset must be at most 100 %')
    .nullable()
    .default(null),
  /** The most the illiquid assets (a lock-up, no daily dealing) may weigh together. */
  illiquidMax: z
    .number({ message: 'the cap on illiquid assets together must be a number of per cent' })
    .min(0, 'the cap on illiquid assets together must be at least 0 %')
    .max(1, 'the cap on illiquid assets together must be at most 100 %')
    .nullable()
    .default(null),
});
export type HouseholdMandate = z.infer<typeof householdMandateSchema>;

export const NO_MANDATE: HouseholdMandate = { assetCap: null, illiquidMax: null };

/** Whether the household has any limit on file. */
export function hasMandate(mandate: HouseholdMandate | undefined): mandate is HouseholdMandate {
  return mandate !== undefined && (mandate.assetCap !== null || mandate.illiquidMax !== null);
}

/** A scenario's limits from the mandate: long-only, every asset under the cap, illiquid assets together under theirs. */
export function mandateConstraints(mandate: HouseholdMandate): Constraints {
  return {
    longOnly: true,
    ...(mandate.assetCap !== null ? { weightBounds: { default: [0, mandate.assetCap] } } : {}),
    ...(mandate.illiquidMax !== null ? { illiquidMax: mandate.illiquidMax } : {}),
  };
}
