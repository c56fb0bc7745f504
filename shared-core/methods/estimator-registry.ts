import type { z } from 'zod';
import { byMethod } from './by-method.js';
import type { MethodFigures } from './define.js';
import { denoised } from './estimators/denoised.js';
import { ewma } from './estimators/ewma.js';
import { ledoitWolf } from './estimators/ledoit-wolf.js';
import { nonlinear } from './estimators/nonlinear.js';
import { oas } from './estimators/oas.js';
import { robust } from './estimators/robust.js';
import { sample } from './estimators/sample.js';

/**
 * Every covariance estimator's definition, in the order the editor and `--method` list them. A new
 * estimator is one file in estimators/ and a line here; the compiler then asks for its
 * computation in the layer above the document (shared-core/estimators/registry.ts).
 */
export const estimatorDefinitions = [sample, ewma, ledoitWolf, oas, denoised, robust, nonlinear] as const;

type Definitions = typeof estimatorDefinitions;
export type EstimatorMethod = Definitions[number]['method'];
/** A candidate's `estimator` object: its method and that method's options. */
export type EstimatorSpec = z.output<ReturnType<Definitions[number]['options']>>;

export const estimatorMethods: readonly EstimatorMethod[] = estimatorDefinitions.map((d) => d.method);

const definitions = byMethod(estimatorDefinitions);

/** The definition of one estimator. */
export const estimatorDefinition = <M extends EstimatorMethod>(method: M) => definitions[method];

type Words = (spec: EstimatorSpec, figures: MethodFigures) => string;
/** The editor's name of the estimator with the options that change it. */
export const describeEstimator = (spec: EstimatorSpec, figures: MethodFigures): string =>
  (definitions[spec.method].describe as Words)(spec, figures);
/** The memo's words for the estimator, inside a sentence. */
export const estimatorWords = (spec: EstimatorSpec, figures: MethodFigures): string =>
  (definitions[spec.method].memoWords as Words)(spec, figures);
/** The memo's few words for the estimator, for table cells. */
export const estimatorShort = (spec: EstimatorSpec, figures: MethodFigures): string =>
  (definitions[spec.method].memoShort as Words)(spec, figures);
