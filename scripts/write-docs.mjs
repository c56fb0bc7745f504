// `npm run docs`: writes the documentation generated from the code (docs/schema/*.json from the
// zod schemas, docs/methods.md from the method definitions), after `build --cli` has emitted
// src-main/docs/ to dist/. test/docs/generated.test.ts fails when the committed files differ.
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const { generatedDocs } = await import(pathToFileURL(join(root, 'dist/src-main/docs/generated-docs.js')).href);
for (const [path, text] of generatedDocs()) {
  mkdirSync(dirname(join(root, path)), { recursive: true });
  writeFileSync(join(root, path), text);
  console.log(`wrote ${path}`);
}
