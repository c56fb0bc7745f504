import { z } from 'zod';
import type { OptionSchemas } from '../methods/define.js';
import { objectiveDefinitions } from '../methods/objective-registry.js';

export { objectiveMethods, type ObjectiveMethod, type ObjectiveSpec } from '../methods/objective-registry.js';

/** The objective object of a scenario candidate: one member per definition in methods/objective-registry.ts. */
export const objectiveSpecSchema = z.discriminatedUnion(
  'method',
  objectiveDefinitions.map((d) => d.options(z)) as unknown as OptionSchemas<typeof objectiveDefinitions>,
);
