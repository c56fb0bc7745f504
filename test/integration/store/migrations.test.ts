import Database from 'better-sqlite3';
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { sha256Hex } from '../../../src-main/store/canonical-json.js';
import { seriesChecksum } from '../../../src-main/store/series-checksum.js';
import { LATEST_SCHEMA_VERSION, migrate } from '../../../src-main/store/migrations.js';
import { openDatabase } from '../../../src-main/store/open-database.js';
import { StoreOpenError, openStore } from '../../../src-main/store/store.js';
import { useTempDir } from './temp-dir.js';

const tempDir = useTempDir();

// Data a store of each schema version could hold, written with that version's own tables.
function seedAt(db: Database.Database, version: number): void {
  if (version >= 1) {
    db.prepare(
      "INSERT INTO assets (id, display_name, currency, liquidity) VALUES ('EQ1', 'Equity one', 'EUR', 'daily')",
    ).run();
    const days = Buffer.from(new Int32Array([20090, 20091]).buffer);
    const closes = Buffer.from(new Float64Array([100, 101]).buffer);
    const batches = Buffer.from(new Int32Array([1, 2]).buffer);
    db.prepare(
      "INSERT INTO import_batches (source, imported_at, added, replaced, assets) VALUES ('a.csv', '2025-01-01', 1, 0, 1)",
    ).run();
    db.prepare(
      "INSERT INTO import_batches (source, imported_at, added, replaced, assets) VALUES ('b.csv', '2025-01-02', 1, 0, 1)",
    ).run();
    db.prepare(
      "INSERT INTO price_series (asset_id, points, first_day, last_day, days, closes, batches) VALUES ('EQ1', 2, 20090, 20091, ?, ?, ?)",
    ).run(days, closes, batches);
    // From version 5 a series carries its checksum, written with the series.
    if (version >= 5)
      db.prepare("UPDATE price_series SET checksum = ? WHERE asset_id = 'EQ1'").run(
        seriesChecksum({ asset_id: 'EQ1', points: 2, first_day: 20090, last_day: 20091, days, closes, batches }),
      );
    db.prepare("INSERT INTO universes (name) VALUES ('Core')").run();
    db.prepare("INSERT INTO universe_members VALUES (1, 'EQ1', 0, '[\"Equity\"]')").run();
  }
  if (version >= 2) {
    db.prepare("INSERT INTO households (name, base_currency) VALUES ('H', 'EUR')").run();
    db.prepare("INSERT INTO scenarios (household_id, name, created_at) VALUES (1, 'S', '2025-01-03')").run();
  }
  if (version >= 3)
    db.prepare(
      "INSERT INTO memos (scenario_id, revision_hash, data_version, sha256, printed_at, title, pdf) VALUES (1, 'r', 2, ?, '2025-01-04', 'M', x'25504446')",
    ).run(sha256Hex(Buffer.from('%PDF')));
}

describe('store schema migrations (PRAGMA user_version)', () => {
  for (let from = 0; from < LATEST_SCHEMA_VERSION; from++)
    it(`migrates a version-${from} store to version ${LATEST_SCHEMA_VERSION}, keeping its data`, () => {
      const path = join(tempDir(), `v${from}.hfstore`);
      const old = new Database(path);
      migrate(old, from);
      seedAt(old, from);
      expect(old.pragma('user_version', { simple: true })).toBe(from);
      old.close();

      const store = openStore(path);
      expect(store.schemaVersion).toBe(LATEST_SCHEMA_VERSION);
      expect(store.check()).toEqual([]);
      if (from >= 1) {
        expect(store.priceTable({ universe: 'Core' }).dates).toEqual(['2025-01-02', '2025-01-03']);
        expect(store.getUniverse('Core')!.members).toEqual([{ assetId: 'EQ1', tags: ['Equity'] }]);
        // Version 3 seeds the data version from the batches imported before it existed.
        if (from < 3) expect(store.dataVersion()).toBe(2);
      }
      if (from >= 2) {
        const h = store.getHousehold('H')!;
        expect(store.getScenario(h.id, 'S')).toMatchObject({ latestRevision: 0 });
      }
      if (from >= 3) {
        // Version 4 adds the memo hash and the preparer; a memo printed before keeps neither.
        const [memo] = store.listMemos(store.getScenario(store.getHousehold('H')!.id, 'S')!.id);
        expect(memo).toMatchObject({ title: 'M', bytes: 4 });
        expect(memo.memoHash).toBeUndefined();
        expect(memo.preparedBy).toBeUndefined();
      }
      store.close();
    });

  it('version 5 keeps a checksum beside every price series, computed for the series stored before it', () => {
    const path = join(tempDir(), 'v4.hfstore');
    const old = new Database(path);
    migrate(old, 4);
    seedAt(old, 4);
    old.close();
    const store = openStore(path);
    expect(store.check()).toEqual([]);
    store.close();
    const raw = new Database(path);
    expect(raw.prepare("SELECT checksum FROM price_series WHERE asset_id = 'EQ1'").pluck().get()).toMatch(
      /^[0-9a-f]{64}$/,
    );
    // A close changed behind the store's back (as a damaged disk would) no longer matches.
    raw
      .prepare("UPDATE price_series SET closes = ? WHERE asset_id = 'EQ1'")
      .run(Buffer.from(new Float64Array([100, -0.0517]).buffer));
    raw.close();
    const damaged = openStore(path);
    expect(damaged.check()).toEqual(["prices of asset 'EQ1': the stored values do not match their checksum"]);
    damaged.close();
  });

  it('version 7 gives every household a mandate slot, empty for the households stored before it', () => {
    const path = join(tempDir(), 'v6.hfstore');
    const old = new Database(path);
    migrate(old, 6);
    seedAt(old, 6);
    old.close();
    const store = openStore(path);
    const h = store.getHousehold('H')!;
    expect(h.mandate).toBeUndefined();
    const set = store.updateHousehold(h.id, { mandate: { assetCap: 0.2, illiquidMax: 0.1 } });
    expect(set.mandate).toEqual({ assetCap: 0.2, illiquidMax: 0.1 });
    expect(() => store.updateHousehold(h.id, { mandate: { assetCap: 1.2, illiquidMax: null } })).toThrow(
      'the cap per asset must be at most 100 %',
    );
    expect(store.getHousehold('H')!.mandate).toEqual({ assetCap: 0.2, illiquidMax: 0.1 });
    store.close();
    // The schema refuses an out-of-range cap even from a writer that skips the store's check.
    const raw = new Database(path);
    expect(() => raw.prepare('UPDATE households SET mandate_asset_cap = 1.5').run()).toThrow(/CHECK constraint/);
    raw.close();
  });

  it('refuses a store from a newer Holdfast with a clear message and leaves the file byte for byte unchanged', () => {
    const path = join(tempDir(), 'newer.hfstore');
    openStore(path).close();
    const db = new Database(path);
    db.pragma(`user_version = ${LATEST_SCHEMA_VERSION + 1}`);
    db.close();
    const before = sha256Hex(readFileSync(path));
    expect(() => openStore(path)).toThrow(StoreOpenError);
    expect(() => openStore(path)).toThrow(/newer Holdfast \(store schema \d+; this version reads up to \d+\)/);
    expect(sha256Hex(readFileSync(path))).toBe(before);
  });

  it('refuses an SQLite file that is not a Holdfast store, and a file that is not SQLite at all', () => {
    const dir = tempDir();
    const other = new Database(join(dir, 'other.db'));
    other.exec('CREATE TABLE t (x)');
    other.close();
    expect(() => openStore(join(dir, 'other.db'))).toThrow(/not a Holdfast store/);
    writeFileSync(join(dir, 'text.hfstore'), 'date,A\n2025-01-02,1\n');
    expect(() => openStore(join(dir, 'text.hfstore'))).toThrow(StoreOpenError);
    expect(readFileSync(join(dir, 'text.hfstore'), 'utf8')).toBe('date,A\n2025-01-02,1\n');
  });

  it('opens with WAL journaling and foreign keys on; a missing store with create: false is refused', () => {
    const path = join(tempDir(), 'fresh.hfstore');
    const { db } = openDatabase(path, { create: true });
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(db.pragma('foreign_keys', { simple: true })).toBe(1);
    db.close();
    expect(() => openStore(join(tempDir(), 'absent.hfstore'), { create: false })).toThrow(/no such store/);
  });
});
