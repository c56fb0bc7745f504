import { existsSync, readFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { generatedDocs } from '../../src-main/docs/generated-docs.js';
import { estimatorDefinitions } from '../../shared-core/methods/estimator-registry.js';
import { objectiveDefinitions } from '../../shared-core/methods/objective-registry.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

describe('the documentation generated from the code is the committed one', () => {
  for (const [path, fresh] of generatedDocs())
    it(`${path} equals a fresh generation (run npm run docs after changing a schema or a method)`, () => {
      expect(existsSync(join(root, path)), `${path} is missing: run npm run docs`).toBe(true);
      expect(readFileSync(join(root, path), 'utf8')).toBe(fresh);
    });

  it('the methods page has every estimator and objective with its formula, use and source', () => {
    const page = generatedDocs().get('docs/methods.md')!;
    for (const d of [...estimatorDefinitions, ...objectiveDefinitions]) {
      expect(page).toContain(`### ${d.label} (\`${d.method}\`)`);
      for (const text of [d.formula, d.whenToUse, d.source]) {
        expect(text.trim().length).toBeGreaterThan(10);
        expect(page).toContain(text);
      }
    }
  });
});
