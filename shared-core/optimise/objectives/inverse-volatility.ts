import type { ObjectiveSpec } from '../../scenario/objective-spec.js';
import { pct } from '../explain.js';
import { ruleObjective } from './rule-weights.js';

/** Inverse volatility (common practice): each weight proportional to 1 / sigma_i. */
export const inverseVolatility = ruleObjective<Extract<ObjectiveSpec, { method: 'inverse-volatility' }>>(
  (vols) => Float64Array.from(vols, (v) => 1 / v),
  'inverse-volatility weight',
  (fig, i) => ` (volatility ${pct(fig.vols[i])})`,
);
