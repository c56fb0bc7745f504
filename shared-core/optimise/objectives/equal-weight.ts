import type { ObjectiveSpec } from '../../scenario/objective-spec.js';
import { ruleObjective } from './rule-weights.js';

/** Equal weight, 1/N (DeMiguel, Garlappi and Uppal 2009): every asset the same weight. */
export const equalWeight = ruleObjective<Extract<ObjectiveSpec, { method: 'equal-weight' }>>(
  (vols) => new Float64Array(vols.length).fill(1),
  'equal weight',
);
