import { z } from 'zod';
import type { OptionSchemas } from '../methods/define.js';
import { estimatorDefinitions } from '../methods/estimator-registry.js';

export { estimatorMethods, type EstimatorMethod, type EstimatorSpec } from '../methods/estimator-registry.js';
export { shrinkageTargets, type ShrinkageTarget } from '../methods/estimators/ledoit-wolf.js';

/**
 * The estimator object of a scenario candidate: `method` plus that method's options, named as the
 * command-line flags are (`target`, `lambda`, `halfLife`). One member per definition in
 * methods/estimator-registry.ts.
 */
export const estimatorSpecSchema = z.discriminatedUnion(
  'method',
  estimatorDefinitions.map((d) => d.options(z)) as unknown as OptionSchemas<typeof estimatorDefinitions>,
);
