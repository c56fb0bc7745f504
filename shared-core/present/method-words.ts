import * as estimators from '../methods/estimator-registry.js';
import type { MethodFigures } from '../methods/define.js';
import * as objectives from '../methods/objective-registry.js';
import { formatPct, PLAIN } from './format.js';

/**
 * Each method's words (from its definition, shared-core/methods/) with their figures printed by
 * the one formatter, in the plain notation: a candidate's label made from them is saved in the
 * document, so it must not depend on the screen's locale.
 */
const figures: MethodFigures = { percent: (fraction) => formatPct(fraction, PLAIN, 2) };

type EstimatorSpec = estimators.EstimatorSpec;
type ObjectiveSpec = objectives.ObjectiveSpec;

/** The editor's name of the estimator with the options that change it: "Exponentially weighted, half-life 60". */
export const describeEstimator = (spec: EstimatorSpec): string => estimators.describeEstimator(spec, figures);
/** The memo's words for the estimator, inside a sentence. */
export const estimatorWords = (spec: EstimatorSpec): string => estimators.estimatorWords(spec, figures);
/** The memo's few words for the estimator, for table cells. */
export const estimatorShort = (spec: EstimatorSpec): string => estimators.estimatorShort(spec, figures);
/** The editor's name of the objective with the options that change it. */
export const describeObjective = (spec: ObjectiveSpec): string => objectives.describeObjective(spec, figures);
/** The memo's words for the objective, inside a sentence. */
export const objectiveWords = (spec: ObjectiveSpec): string => objectives.objectiveWords(spec, figures);
