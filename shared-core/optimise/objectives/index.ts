import type { ObjectiveMethod, ObjectiveSpec } from '../../scenario/objective-spec.js';
import type { ObjectiveComputation } from './computation.js';
import { equalRiskContribution } from './equal-risk-contribution.js';
import { equalWeight } from './equal-weight.js';
import { inverseVolatility } from './inverse-volatility.js';
import { maxDecorrelation } from './max-decorrelation.js';
import { maxDiversification } from './max-diversification.js';
import { maxSharpe } from './max-sharpe.js';
import { minVariance } from './min-variance.js';

/**
 * Every objective's computation by its method: the one place solve-candidate.ts dispatches on.
 * The type asks for one entry per method of shared-core/methods/objective-registry.ts, so an
 * objective defined there without its computation here fails the typecheck.
 */
export const objectiveComputations: {
  [M in ObjectiveMethod]: ObjectiveComputation<Extract<ObjectiveSpec, { method: M }>>;
} = {
  'max-diversification': maxDiversification,
  'min-variance': minVariance,
  'equal-risk-contribution': equalRiskContribution,
  'max-decorrelation': maxDecorrelation,
  'max-sharpe': maxSharpe,
  'inverse-volatility': inverseVolatility,
  'equal-weight': equalWeight,
};

/** The computation of `spec`'s objective, typed for any spec. */
export const objectiveComputation = (spec: ObjectiveSpec): ObjectiveComputation =>
  objectiveComputations[spec.method] as ObjectiveComputation;

export type { ObjectiveComputation } from './computation.js';
