import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDemoStore } from '../../src-main/demo/create-demo-store.js';
import { writeDemoFiles } from '../../src-main/demo/write-demo-files.js';
import { exportHousehold } from '../../src-main/io/household-file.js';
import { openStore } from '../../src-main/store/store.js';

/**
 * The published JSON Schemas (docs/schema/) checked by a validator outside the project: Debian's
 * python3-jsonschema (Draft 2020-12 validator), run with /usr/bin/python3. The demo scenario, the
 * demo household exported as holdfast-household@1 and every scenario revision inside it validate;
 * documents Holdfast refuses for a reason the schema can state are refused by it too.
 */
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const schemaPath = (name: string) => join(root, 'docs', 'schema', `${name}.schema.json`);

// JSON Schema patterns are ECMA-262 regular expressions; the asset id's \p{L}\p{Nd} (Unicode
// letters and decimal digits) has no spelling in Python's re, which python3-jsonschema uses, so
// the script rewrites those two classes as Python's [^\W_] (Unicode letters and digits) first.
const VALIDATE = String.raw`
import json, sys, jsonschema
def python_re(node):
    if isinstance(node, dict):
        return {k: (v.replace(r"[\p{L}\p{Nd}._-]*", r"(?:[^\W_]|[._-])*").replace(r"[\p{L}\p{Nd}]", r"[^\W_]")
                    if k == "pattern" else python_re(v)) for k, v in node.items()}
    if isinstance(node, list):
        return [python_re(v) for v in node]
    return node
schema = python_re(json.load(open(sys.argv[1])))
jsonschema.Draft202012Validator.check_schema(schema)
validator = jsonschema.Draft202012Validator(schema)
for path in sys.argv[2:]:
    errors = sorted(validator.iter_errors(json.load(open(path))), key=lambda e: list(e.absolute_path))
    print(json.dumps({"file": path, "errors": [
        {"path": "/".join(str(p) for p in e.absolute_path), "message": e.message} for e in errors]}))
`;

/** Each document's errors as python3-jsonschema reports them ([] when it validates). */
function validate(schema: string, files: string[]): Record<string, { path: string; message: string }[]> {
  const run = spawnSync('/usr/bin/python3', ['-c', VALIDATE, schemaPath(schema), ...files], { encoding: 'utf8' });
  if (run.status !== 0) throw new Error(`python3-jsonschema failed: ${run.stderr}`);
  const out: Record<string, { path: string; message: string }[]> = {};
  for (const line of run.stdout.trim().split('\n')) {
    const { file, errors } = JSON.parse(line) as { file: string; errors: { path: string; message: string }[] };
    out[file] = errors;
  }
  return out;
}

describe('the published JSON Schemas, read by python3-jsonschema (Debian)', () => {
  let dir: string;
  const file = (name: string, value: unknown) => {
    const path = join(dir, name);
    writeFileSync(path, JSON.stringify(value));
    return path;
  };
  let scenario: Record<string, unknown>;
  let household: Record<string, unknown>;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'holdfast-schema-'));
    const demo = writeDemoFiles(join(dir, 'demo'));
    scenario = JSON.parse(readFileSync(join(dir, 'demo', 'demo-scenario.json'), 'utf8')) as Record<string, unknown>;
    expect(demo).toBeTruthy();
    await createDemoStore(join(dir, 'demo.sqlite'));
    const store = openStore(join(dir, 'demo.sqlite'));
    try {
      const name = store.listHouseholds()[0].name;
      household = JSON.parse(exportHousehold(store, name)) as Record<string, unknown>;
    } finally {
      store.close();
    }
  }, 120_000);
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('the demo scenario validates against holdfast-scenario@1', () => {
    const path = join(dir, 'demo', 'demo-scenario.json');
    expect(validate('holdfast-scenario-1', [path])[path]).toEqual([]);
  });

  it('the demo household, exported, validates against holdfast-household@1, and its revisions as scenarios', () => {
    const path = file('household.json', household);
    expect(validate('holdfast-household-1', [path])[path]).toEqual([]);
    const revisions = (household.scenarios as { revisions: { document: unknown }[] }[]).flatMap((s) => s.revisions);
    expect(revisions.length).toBeGreaterThan(0);
    const paths = revisions.map((r, i) => file(`revision-${i}.json`, r.document));
    for (const [p, errors] of Object.entries(validate('holdfast-scenario-1', paths))) expect(errors, p).toEqual([]);
  });

  it('refuses what Holdfast refuses: an unknown key, a wrong format, an unknown method, a bad currency', () => {
    const bad = {
      unknownKey: file('unknown-key.json', { ...scenario, colour: 'blue' }),
      format: file('format.json', { ...scenario, format: 'holdfast-scenario@2' }),
      method: file('method.json', {
        ...scenario,
        candidates: [{ id: 'x', estimator: { method: 'guess' }, objective: { method: 'min-variance' } }],
      }),
      currency: file('currency.json', { ...scenario, baseCurrency: 'euro' }),
      holdingAmount: file('holding.json', { ...household, holdings: [{ assetId: 'EQ-GLB', amount: 'many' }] }),
    };
    const scenarios = validate('holdfast-scenario-1', [bad.unknownKey, bad.format, bad.method, bad.currency]);
    expect(scenarios[bad.unknownKey].map((e) => e.message).join()).toContain("'colour' was unexpected");
    expect(scenarios[bad.format].map((e) => e.path)).toContain('format');
    expect(scenarios[bad.method].some((e) => e.path.startsWith('candidates/0/estimator'))).toBe(true);
    expect(scenarios[bad.currency].map((e) => e.path)).toContain('baseCurrency');
    const households = validate('holdfast-household-1', [bad.holdingAmount]);
    expect(households[bad.holdingAmount].some((e) => e.path.startsWith('holdings/0'))).toBe(true);
  });
});
