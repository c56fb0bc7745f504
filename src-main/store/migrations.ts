import type Database from 'better-sqlite3';
import { seriesChecksum, type SeriesRowValues } from './series-checksum.js';

/**
 * The store's schema as forward migrations. `PRAGMA user_version` is the number of migrations
 * applied; each runs in its own transaction together with the version bump, so a crash leaves
 * the store at the old version or the new one, never between. A store whose version is above
 * `LATEST_SCHEMA_VERSION` was written by a newer Holdfast and is refused before anything runs.
 */
export const STORE_APPLICATION_ID = 0x48464453; // "HFDS": marks the file as a Holdfast store

const migrations: readonly ((db: Database.Database) => void)[] = [
  // 1: the library: assets, price histories and their import batches, universes.
  (db) => {
    db.exec(`
      CREATE TABLE meta (key TEXT PRIMARY KEY, value TEXT NOT NULL) STRICT;
      CREATE TABLE assets (
        id TEXT PRIMARY KEY,
        display_name TEXT NOT NULL,
        asset_class TEXT,
        region TEXT,
        currency TEXT,
        liquidity TEXT NOT NULL DEFAULT 'daily' CHECK (liquidity IN ('daily', 'monthly', 'illiquid')),
        lock_up_days INTEGER CHECK (lock_up_days IS NULL OR lock_up_days >= 0),
        notes TEXT,
        fx_base TEXT,
        fx_quote TEXT
      ) STRICT;
      CREATE TABLE import_batches (
        id INTEGER PRIMARY KEY,
        source TEXT NOT NULL,
        imported_at TEXT NOT NULL,
        added INTEGER NOT NULL,
        replaced INTEGER NOT NULL,
        assets INTEGER NOT NULL,
        note TEXT
      ) STRICT;
      -- One row per asset holding its whole history as little-endian typed arrays: int32 days
      -- since 1970-01-01, float64 closes, int32 import batch ids. Row-per-price storage read
      -- 500 assets x 3000 days in over a second here; blobs read it in milliseconds.
      CREATE TABLE price_series (
        asset_id TEXT PRIMARY KEY REFERENCES assets(id) ON DELETE CASCADE,
        points INTEGER NOT NULL,
        first_day INTEGER,
        last_day INTEGER,
        days BLOB NOT NULL,
        closes BLOB NOT NULL,
        batches BLOB NOT NULL
      ) STRICT;
      CREATE TABLE universes (id INTEGER PRIMARY KEY, name TEXT NOT NULL UNIQUE, description TEXT) STRICT;
      CREATE TABLE universe_members (
        universe_id INTEGER NOT NULL REFERENCES universes(id) ON DELETE CASCADE,
        asset_id TEXT NOT NULL REFERENCES assets(id),
        position INTEGER NOT NULL,
        tags TEXT NOT NULL DEFAULT '[]',
        PRIMARY KEY (universe_id, asset_id)
      ) STRICT;
    `);
  },
  // 2: clients and their work: households, holdings, scenarios with revisions and drafts, audit log.
  (db) => {
    db.exec(`
      CREATE TABLE households (
        id INTEGER PRIMARY KEY,
        name TEXT NOT NULL UNIQUE,
        base_currency TEXT NOT NULL,
        reference TEXT,
        notes TEXT
      ) STRICT;
      CREATE TABLE holdings (
        household_id INTEGER NOT NULL REFERENCES households(id) ON DELETE CASCADE,
        asset_id TEXT NOT NULL REFERENCES assets(id),
        amount REAL NOT NULL,
        currency TEXT NOT NULL,
        as_of TEXT NOT NULL,
        PRIMARY KEY (household_id, asset_id)
      ) STRICT;
      CREATE TABLE scenarios (
        id INTEGER PRIMARY KEY,
        household_id INTEGER NOT NULL REFERENCES households(id) ON DELETE CASCADE,
        name TEXT NOT NULL,
        created_at TEXT NOT NULL,
        UNIQUE (household_id, name)
      ) STRICT;
      CREATE TABLE scenario_revisions (
        scenario_id INTEGER NOT NULL REFERENCES scenarios(id) ON DELETE CASCADE,
        number INTEGER NOT NULL,
        hash TEXT NOT NULL,
        document TEXT NOT NULL,
        saved_at TEXT NOT NULL,
        author TEXT NOT NULL,
        note TEXT,
        PRIMARY KEY (scenario_id, number)
      ) STRICT;
      CREATE INDEX revisions_by_hash ON scenario_revisions (hash);
      CREATE TABLE scenario_drafts (
        scenario_id INTEGER PRIMARY KEY REFERENCES scenarios(id) ON DELETE CASCADE,
        text TEXT NOT NULL,
        saved_at TEXT NOT NULL
      ) STRICT;
      CREATE TABLE audit_log (
        id INTEGER PRIMARY KEY,
        at TEXT NOT NULL,
        action TEXT NOT NULL,
        entity TEXT NOT NULL,
        entity_id INTEGER NOT NULL,
        revision_hash TEXT,
        detail TEXT
      ) STRICT;
    `);
  },
  // 3: a scenario's universe, the results cache, printed memos, and the data version counter
  // (seeded from the batches imported so far, so earlier stores get a consistent number).
  (db) => {
    db.exec(`
      ALTER TABLE scenarios ADD COLUMN universe_id INTEGER REFERENCES universes(id) ON DELETE SET NULL;
      CREATE TABLE results_cache (
        revision_hash TEXT NOT NULL,
        data_version INTEGER NOT NULL,
        kind TEXT NOT NULL,
        value TEXT NOT NULL,
        created_at TEXT NOT NULL,
        PRIMARY KEY (revision_hash, data_version, kind)
      ) STRICT;
      CREATE TABLE memos (
        id INTEGER PRIMARY KEY,
        scenario_id INTEGER NOT NULL REFERENCES scenarios(id) ON DELETE CASCADE,
        revision_hash TEXT NOT NULL,
        data_version INTEGER NOT NULL,
        sha256 TEXT NOT NULL,
        printed_at TEXT NOT NULL,
        title TEXT,
        pdf BLOB NOT NULL
      ) STRICT;
      CREATE INDEX memos_by_revision ON memos (revision_hash, data_version);
      INSERT INTO meta (key, value) SELECT 'data_version', CAST(count(*) AS TEXT) FROM import_batches;
    `);
  },
  // 4: a memo's own hash (the one its footer prints) and who prepared it, for the audit trail.
  (db) => {
    db.exec(`
      ALTER TABLE memos ADD COLUMN memo_hash TEXT;
      ALTER TABLE memos ADD COLUMN prepared_by TEXT;
    `);
  },
  // 5: a SHA-256 beside every price and exchange-rate series (series-checksum.ts), computed here
  // for the series stored so far. Scenario revisions (hash) and memos (sha256) had theirs already.
  (db) => {
    db.exec('ALTER TABLE price_series ADD COLUMN checksum TEXT');
    const read = db.prepare('SELECT * FROM price_series WHERE asset_id = ?');
    const update = db.prepare('UPDATE price_series SET checksum = ? WHERE asset_id = ?');
    const ids = db.prepare('SELECT asset_id FROM price_series').pluck().all() as string[];
    for (const id of ids) update.run(seriesChecksum(read.get(id) as SeriesRowValues), id);
  },
  // 6: the book review's own state per household: the advisor's drift tolerance, a review note,
  // and when the household was last marked as reviewed. A row only once the advisor sets one.
  (db) => {
    db.exec(`
      CREATE TABLE household_reviews (
        household_id INTEGER PRIMARY KEY REFERENCES households(id) ON DELETE CASCADE,
        drift_tolerance REAL CHECK (drift_tolerance IS NULL OR (drift_tolerance > 0 AND drift_tolerance <= 2)),
        note TEXT,
        reviewed_at TEXT
      ) STRICT;
    `);
  },
  // 7: a household's mandate: the cap per asset and the cap on illiquid assets together that a
  // new scenario starts from (null: none set, as for every household stored before).
  (db) => {
    db.exec(`
      ALTER TABLE households ADD COLUMN mandate_asset_cap REAL
        CHECK (mandate_asset_cap IS NULL OR (mandate_asset_cap > 0 AND mandate_asset_cap <= 1));
      ALTER TABLE households ADD COLUMN mandate_illiquid_max REAL
        CHECK (mandate_illiquid_max IS NULL OR (mandate_illiquid_max >= 0 AND mandate_illiquid_max <= 1));
    `);
  },
  // Add the next migration here: one function per schema version, never edit one that shipped.
];

export const LATEST_SCHEMA_VERSION = migrations.length;

/**
 * Applies the migrations from the store's version up to `target` (default: the latest). Each step
 * begins immediately and reads the version again inside its transaction, so two processes
 * opening an old store at once apply each step once: the second waits, then finds it done.
 */
export function migrate(db: Database.Database, target = LATEST_SCHEMA_VERSION): void {
  const version = () => db.pragma('user_version', { simple: true }) as number;
  while (version() < target)
    db.transaction(() => {
      const v = version();
      if (v >= target) return;
      if (v === 0) db.pragma(`application_id = ${STORE_APPLICATION_ID}`);
      migrations[v](db);
      db.pragma(`user_version = ${v + 1}`);
    }).immediate();
}
