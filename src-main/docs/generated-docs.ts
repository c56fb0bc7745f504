import { publishedSchemas } from './json-schemas.js';
import { methodsPage } from './methods-page.js';

/**
 * Every documentation file generated from the code, by its path from the project root: the JSON
 * Schemas of the interchange formats and the methods page. `npm run docs` writes them;
 * test/docs/generated.test.ts fails when a committed one differs from a fresh generation.
 */
export function generatedDocs(): Map<string, string> {
  const files = new Map<string, string>();
  for (const { file, schema } of publishedSchemas())
    files.set(`docs/schema/${file}`, `${JSON.stringify(schema, null, 2)}\n`);
  files.set('docs/methods.md', methodsPage());
  return files;
}
