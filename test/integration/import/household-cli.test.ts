import { existsSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { DEMO_SCENARIO_NAME } from '../../../shared-core/demo/index.js';
import { createDemoStore } from '../../../src-main/demo/create-demo-store.js';
import { useTempDir } from '../store/temp-dir.js';
import { holdfast } from './cli-io.js';

const tempDir = useTempDir();
const HOUSEHOLD = 'Maraval-Lindqvist family (invented)';

describe('holdfast export-household and import-household', () => {
  it('carry the invented demo household to a new store, where solve gives the same answer (foreign-currency asset included)', async () => {
    const dir = tempDir();
    await createDemoStore(join(dir, 'a.hfstore'));
    const out = await holdfast(
      dir,
      'export-household',
      '--store',
      'a.hfstore',
      '--household',
      HOUSEHOLD,
      '--out',
      'h.json',
    );
    expect(out.stderr).toBe('');
    expect(out.code).toBe(0);
    expect(statSync(join(dir, 'h.json')).mode & 0o777).toBe(0o600);
    expect(readdirSync(dir).filter((f) => f.includes('.partial-'))).toEqual([]);

    const imported = await holdfast(dir, 'import-household', '--store', 'b.hfstore', '--from', 'h.json', '--json');
    expect(imported.code).toBe(0);
    const result = JSON.parse(imported.stdout);
    expect(result).toMatchObject({ household: HOUSEHOLD, scenarios: 1, revisions: 1, pricesKept: [] });

    const solve = (store: string) =>
      holdfast(dir, 'solve', '--store', store, '--household', HOUSEHOLD, '--scenario', DEMO_SCENARIO_NAME, '--json');
    const [a, b] = [await solve('a.hfstore'), await solve('b.hfstore')];
    expect(a.code).toBe(0);
    expect(b.stderr).toBe('');
    // Equal but for the solver's own timings.
    const answer = (text: string) =>
      JSON.parse(text).candidates.map((c: { solver: { ms?: number } }) => ({ ...c, solver: { ...c.solver, ms: 0 } }));
    expect(answer(b.stdout)).toEqual(answer(a.stdout));
  }, 120_000);

  it('refuse an existing output file, an unknown household and a damaged file, writing nothing (exit 2)', async () => {
    const dir = tempDir();
    await createDemoStore(join(dir, 'a.hfstore'));
    await holdfast(dir, 'export-household', '--store', 'a.hfstore', '--household', HOUSEHOLD, '--out', 'h.json');
    const again = await holdfast(
      dir,
      'export-household',
      '--store',
      'a.hfstore',
      '--household',
      HOUSEHOLD,
      '--out',
      'h.json',
    );
    expect(again.code).toBe(2);
    expect(again.stderr).toMatch(/h\.json: exists already/);
    const unknown = await holdfast(
      dir,
      'export-household',
      '--store',
      'a.hfstore',
      '--household',
      'Nobody',
      '--out',
      'n.json',
    );
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/a\.hfstore: no household named 'Nobody'/);
    expect(existsSync(join(dir, 'n.json'))).toBe(false);

    const { writeFileSync, readFileSync } = await import('node:fs');
    const doc = JSON.parse(readFileSync(join(dir, 'h.json'), 'utf8'));
    doc.household.name = 'Tampered (invented)';
    writeFileSync(join(dir, 'bad.json'), JSON.stringify(doc));
    const bad = await holdfast(dir, 'import-household', '--store', 'c.hfstore', '--from', 'bad.json');
    expect(bad.code).toBe(2);
    expect(bad.stdout).toBe('');
    expect(bad.stderr).toMatch(/bad\.json/);
    expect(existsSync(join(dir, 'c.hfstore'))).toBe(false);
  }, 120_000);
});
