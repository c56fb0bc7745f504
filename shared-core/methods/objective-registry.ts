import type { z } from 'zod';
import { byMethod } from './by-method.js';
import type { MethodFigures } from './define.js';
import { equalRiskContribution } from './objectives/equal-risk-contribution.js';
import { equalWeight } from './objectives/equal-weight.js';
import { inverseVolatility } from './objectives/inverse-volatility.js';
import { maxDecorrelation } from './objectives/max-decorrelation.js';
import { maxDiversification } from './objectives/max-diversification.js';
import { maxSharpe } from './objectives/max-sharpe.js';
import { minVariance } from './objectives/min-variance.js';

/**
 * Every objective's definition, in the order the editor lists them. A new objective is one file
 * in objectives/ and a line here; the compiler then asks for its computation in the layer above
 * the document (shared-core/optimise/objectives/index.ts).
 */
export const objectiveDefinitions = [
  maxDiversification,
  minVariance,
  equalRiskContribution,
  maxDecorrelation,
  maxSharpe,
  inverseVolatility,
  equalWeight,
] as const;

type Definitions = typeof objectiveDefinitions;
export type ObjectiveMethod = Definitions[number]['method'];
/** A candidate's `objective` object: its method and that method's options. */
export type ObjectiveSpec = z.output<ReturnType<Definitions[number]['options']>>;

export const objectiveMethods: readonly ObjectiveMethod[] = objectiveDefinitions.map((d) => d.method);

const definitions = byMethod(objectiveDefinitions);

/** The definition of one objective. */
export const objectiveDefinition = <M extends ObjectiveMethod>(method: M) => definitions[method];

type Words = (spec: ObjectiveSpec, figures: MethodFigures) => string;
/** The editor's name of the objective with the options that change it. */
export const describeObjective = (spec: ObjectiveSpec, figures: MethodFigures): string =>
  (definitions[spec.method].describe as Words)(spec, figures);
/** The memo's words for the objective, inside a sentence. */
export const objectiveWords = (spec: ObjectiveSpec, figures: MethodFigures): string =>
  (definitions[spec.method].memoWords as Words)(spec, figures);
