import type { Constraints } from './schema.js';

/**
 * A candidate's mandate: the scenario's constraints with the candidate's own entries in their
 * place, the weight-bound table entry by entry (a candidate that caps one asset keeps every
 * other asset's bound and the scenario's default). The comparison, the walk-forward and the
 * memo's words all read the mandate from here, so they solve and describe the same one.
 */
export function mergedConstraints(base: Constraints, own: Constraints | undefined): Constraints {
  if (!own) return base;
  const weightBounds =
    base.weightBounds || own.weightBounds ? { ...base.weightBounds, ...own.weightBounds } : undefined;
  return { ...base, ...own, ...(weightBounds ? { weightBounds } : {}) };
}
