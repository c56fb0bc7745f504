import { z } from 'zod';
import { SCENARIO_FORMAT, scenarioSchema } from '../../shared-core/scenario/schema.js';
import { HOUSEHOLD_FILE_FORMAT, householdFileSchema } from '../io/household-file.js';

/**
 * The published JSON Schemas of the two interchange formats, generated from the zod schemas that
 * validate them (zod 4's `z.toJSONSchema`), so the schema a user reads and the one the program
 * checks are one. They describe a document as written (`io: 'input'`: defaults optional).
 * JSON Schema cannot say everything zod checks: the cross-field rules (a lower bound above its
 * upper bound, repeated candidate ids, the checksum) are stated in `description` and checked only
 * by Holdfast.
 */
export interface PublishedSchema {
  /** File name under docs/schema/. */
  file: string;
  schema: Record<string, unknown>;
}

const SCENARIO_RULES =
  'Also checked by Holdfast, beyond this schema: each weight bound [lower, upper] has lower <= upper, and ' +
  'upper <= 1 unless constraints.longOnly is false; a group min is at most its max; candidate ids are ' +
  'unique; recommended names a candidate; window gives from or years, not both; an ewma estimator gives ' +
  'lambda or halfLife, not both; dates are real calendar days.';

const HOUSEHOLD_RULES =
  'Also checked by Holdfast, beyond this schema: checksum is the SHA-256 of the canonical JSON of the ' +
  'document without checksum (a damaged or edited file is refused); each prices entry has as many closes ' +
  'as dates; each revision hash matches its document, which is a holdfast-scenario@1 document; dates ' +
  'are real calendar days and closes positive finite numbers.';

function published(file: string, id: string, title: string, rules: string, schema: z.ZodType): PublishedSchema {
  const generated = z.toJSONSchema(schema, { io: 'input', target: 'draft-2020-12', unrepresentable: 'any' });
  const { $schema, ...body } = generated;
  return { file, schema: { $schema, $id: id, title, description: rules, ...body } };
}

export function publishedSchemas(): PublishedSchema[] {
  return [
    published(
      'holdfast-scenario-1.schema.json',
      SCENARIO_FORMAT,
      'holdfast-scenario@1: a Holdfast scenario',
      SCENARIO_RULES,
      scenarioSchema,
    ),
    published(
      'holdfast-household-1.schema.json',
      HOUSEHOLD_FILE_FORMAT,
      'holdfast-household@1: one household carried between installations',
      HOUSEHOLD_RULES,
      householdFileSchema,
    ),
  ];
}
