import Database from 'better-sqlite3';
import { existsSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { sha256Hex } from '../../../src-main/store/canonical-json.js';
import { LATEST_SCHEMA_VERSION } from '../../../src-main/store/migrations.js';
import { openStore } from '../../../src-main/store/store.js';
import { useTempDir } from '../store/temp-dir.js';
import { holdfast } from './cli-io.js';

const tempDir = useTempDir();

const FIRST = 'date,EQ1,BD1\n2025-01-02,100,50\n2025-01-03,101,50.5\n';

function workspace(files: Record<string, string>): string {
  const dir = tempDir();
  for (const [name, text] of Object.entries(files)) writeFileSync(join(dir, name), text);
  return dir;
}

describe('holdfast import', () => {
  it('creates the store owner-only, adds the assets and prices, and puts them in the universe', async () => {
    const dir = workspace({ 'p.csv': FIRST });
    const r = await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'p.csv', '--universe', 'Core');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/wide form, comma-separated, decimal point, ISO dates; 2 rows, 2 assets/);
    expect(r.stdout).toMatch(/4 prices added, 0 replaced/);
    expect(statSync(join(dir, 's.hfstore')).mode & 0o777).toBe(0o600);
    const store = openStore(join(dir, 's.hfstore'), { create: false });
    const t = store.priceTable({ universe: 'Core' });
    expect(t.assets).toEqual(['EQ1', 'BD1']);
    expect(Array.from(t.closes[1])).toEqual([50, 50.5]);
    expect(store.listBatches()[0].source).toBe('p.csv');
    store.close();
  });

  it('exits 2 with the validation report naming file, line and column, and creates no store', async () => {
    const dir = workspace({ 'bad.csv': 'date,EQ1\n2025-01-02,100\n2025-01-03,-4\n2025-01-06,abc\n' });
    const r = await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'bad.csv', '--universe', 'Core');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("bad.csv:4:2: EQ1: 'abc' is not a number");
    expect(r.stderr).toContain('bad.csv:3:2: EQ1: a price must be above zero');
    expect(r.stderr).toContain('nothing was written');
    expect(r.stdout).toBe('');
    expect(existsSync(join(dir, 's.hfstore'))).toBe(false);
  });

  it('leaves an existing store byte for byte unchanged when the file is invalid', async () => {
    const dir = workspace({ 'p.csv': FIRST, 'bad.csv': 'date,EQ1\n2025-01-07,1\n2025-01-07,2\n' });
    await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'p.csv', '--universe', 'Core');
    const before = sha256Hex(readFileSync(join(dir, 's.hfstore')));
    const r = await holdfast(
      dir,
      'import',
      '--store',
      's.hfstore',
      '--prices',
      'bad.csv',
      '--universe',
      'Core',
      '--json',
    );
    expect(r.code).toBe(2);
    const out = JSON.parse(r.stdout);
    expect(out.status).toBe('invalid');
    expect(out.report.problems).toEqual([
      { line: 3, column: 1, message: 'date 2025-01-07 repeats the date of line 2' },
    ]);
    expect(sha256Hex(readFileSync(join(dir, 's.hfstore')))).toBe(before);
  });

  it('shows changed values on re-import and writes them only with --apply; new dates need no confirmation', async () => {
    const dir = workspace({
      'p.csv': FIRST,
      'p2.csv': 'date,EQ1,BD1\n2025-01-03,101.5,50.5\n2025-01-06,102,51\n',
    });
    await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'p.csv', '--universe', 'Core');
    const dry = await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'p2.csv', '--universe', 'Core');
    expect(dry.code).toBe(1);
    expect(dry.stdout).toContain('plan: 0 new assets, 2 new prices, 1 changed, 1 unchanged');
    expect(dry.stdout).toContain('EQ1: 1 changed (2025-01-03: 101 -> 101.5)');
    expect(dry.stderr).toMatch(/nothing was written.*--apply/);
    let store = openStore(join(dir, 's.hfstore'));
    expect(store.priceSeries('EQ1')!.dates).toEqual(['2025-01-02', '2025-01-03']);
    expect(store.dataVersion()).toBe(1);
    store.close();

    const applied = await holdfast(
      dir,
      'import',
      '--store',
      's.hfstore',
      '--prices',
      'p2.csv',
      '--universe',
      'Core',
      '--apply',
      '--json',
    );
    expect(applied.code).toBe(0);
    expect(JSON.parse(applied.stdout).batch).toMatchObject({ added: 2, replaced: 1, assets: 2 });
    store = openStore(join(dir, 's.hfstore'));
    expect(Array.from(store.priceSeries('EQ1')!.closes)).toEqual([100, 101.5, 102]);
    expect(Array.from(store.priceSeries('EQ1')!.batches)).toEqual([1, 2, 2]);
    store.close();

    const again = await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'p2.csv', '--universe', 'Core');
    expect(again.code).toBe(0);
    expect(again.stdout).toContain('nothing new');
  });

  it('asks for the date order of an ambiguous file instead of guessing', async () => {
    const dir = workspace({ 'p.csv': 'date;EQ1\n03/04/2025;1,5\n04/04/2025;1,6\n' });
    const r = await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'p.csv', '--universe', 'U');
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/--date-order/);
    const ok = await holdfast(
      dir,
      'import',
      '--store',
      's.hfstore',
      '--prices',
      'p.csv',
      '--universe',
      'U',
      '--date-order',
      'day-first',
    );
    expect(ok.code).toBe(0);
    const store = openStore(join(dir, 's.hfstore'));
    expect(store.priceSeries('EQ1')!.dates).toEqual(['2025-04-03', '2025-04-04']);
    expect(Array.from(store.priceSeries('EQ1')!.closes)).toEqual([1.5, 1.6]);
    store.close();
  });

  it('names a missing price file and a store from a newer Holdfast, exiting 2', async () => {
    const dir = workspace({ 'p.csv': FIRST });
    const missing = await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'nope.csv', '--universe', 'U');
    expect([missing.code, missing.stderr]).toEqual([2, 'holdfast import: nope.csv: no such file\n']);
    openStore(join(dir, 'new.hfstore')).close();
    const db = new Database(join(dir, 'new.hfstore'));
    db.pragma(`user_version = ${LATEST_SCHEMA_VERSION + 1}`);
    db.close();
    const newer = await holdfast(dir, 'import', '--store', 'new.hfstore', '--prices', 'p.csv', '--universe', 'U');
    expect(newer.code).toBe(2);
    expect(newer.stderr).toMatch(/new\.hfstore: was written by a newer Holdfast/);
  });
});

describe('holdfast backup and restore', () => {
  it('backs up a store and restores it, keeping the store it replaces', async () => {
    const dir = workspace({ 'p.csv': FIRST, 'p2.csv': 'date,EQ1\n2025-01-06,103\n' });
    await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'p.csv', '--universe', 'Core');
    const b = await holdfast(dir, 'backup', '--store', 's.hfstore', '--out', 'b.hfstore');
    expect(b.code).toBe(0);
    expect(statSync(join(dir, 'b.hfstore')).mode & 0o777).toBe(0o600);
    expect((await holdfast(dir, 'backup', '--store', 's.hfstore', '--out', 'b.hfstore')).code).toBe(2);
    await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'p2.csv', '--universe', 'Core');
    const r = await holdfast(dir, 'restore', '--from', 'b.hfstore', '--store', 's.hfstore');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/the store it replaced is kept as .*s\.hfstore\.replaced-/);
    const store = openStore(join(dir, 's.hfstore'), { create: false });
    expect(store.priceSeries('EQ1')!.dates).toEqual(['2025-01-02', '2025-01-03']);
    expect(store.check()).toEqual([]);
    store.close();
  });

  it('refuses to restore a damaged backup or one that is not a store, leaving the store as it was', async () => {
    const dir = workspace({ 'p.csv': FIRST, 'text.csv': FIRST });
    await holdfast(dir, 'import', '--store', 's.hfstore', '--prices', 'p.csv', '--universe', 'Core');
    await holdfast(dir, 'backup', '--store', 's.hfstore', '--out', 'b.hfstore');
    // Damage the b-tree page of the assets table (its header and cell pointers).
    const db = new Database(join(dir, 'b.hfstore'), { readonly: true });
    const root = (db.prepare("SELECT rootpage FROM sqlite_schema WHERE name = 'assets'").get() as { rootpage: number })
      .rootpage;
    const pageSize = db.pragma('page_size', { simple: true }) as number;
    db.close();
    const bytes = readFileSync(join(dir, 'b.hfstore'));
    for (let i = (root - 1) * pageSize; i < (root - 1) * pageSize + 24; i++) bytes[i] = 0xa5;
    writeFileSync(join(dir, 'b.hfstore'), bytes);
    const before = sha256Hex(readFileSync(join(dir, 's.hfstore')));
    const damaged = await holdfast(dir, 'restore', '--from', 'b.hfstore', '--store', 's.hfstore');
    expect(damaged.code).toBe(2);
    expect(damaged.stderr).toMatch(/b\.hfstore: /);
    const text = await holdfast(dir, 'restore', '--from', 'text.csv', '--store', 's.hfstore');
    expect(text.code).toBe(2);
    expect(text.stderr).toMatch(/text\.csv: cannot be read as a Holdfast store/);
    expect(sha256Hex(readFileSync(join(dir, 's.hfstore')))).toBe(before);
  });
});
