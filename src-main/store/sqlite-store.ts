import Database from 'better-sqlite3';
import { chmodSync, rmSync } from 'node:fs';
import { InputError, formatInputError } from '../../shared-core/errors.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { isIsoDate } from '../../shared-core/scenario/iso-date.js';
import { parseScenario, type Scenario } from '../../shared-core/scenario/schema.js';
import { hasMandate, householdMandateSchema } from '../../shared-core/scenario/household-mandate.js';
import { canonicalJson, sha256Hex } from './canonical-json.js';
import { dayFromIso, isoFromDay } from './days.js';
import { diffDocuments } from './document-diff.js';
import { CancelledError, NotFoundError } from './errors.js';
import { ASSET_ID, ASSET_ID_RULE } from '../../shared-core/prices/asset-id.js';
import { alignSeries } from './price-table-reader.js';
import { seriesChecksum, type SeriesRowValues } from './series-checksum.js';
import { verifyDatabase } from './verify-store.js';
import { sealBackup } from './backup-digest.js';
import { withNativeBinding } from './native-binding.js';
import { asStorageError, type ReadOnlyReason } from './storage-error.js';
import { announceWriter } from './writer-note.js';
import { float64s, int32s, mergeSeries, toBlob, type SeriesArrays } from './series-codec.js';
import { canonicalAssetClass } from '../../shared-core/scenario/asset-class.js';
import type {
  AssetInput,
  AssetRecord,
  AuditEntry,
  AuditQuery,
  Draft,
  Holding,
  HouseholdInput,
  HouseholdRecord,
  HouseholdReview,
  ImportBatch,
  MemoInfo,
  MemoInput,
  PriceCommit,
  PriceSeries,
  PriceTableQuery,
  Revision,
  RevisionComparison,
  RevisionInfo,
  RevisionMeta,
  ScenarioRecord,
  Store,
  UniverseMember,
  UniverseRecord,
} from './store.js';

interface AssetRow {
  id: string;
  display_name: string;
  asset_class: string | null;
  region: string | null;
  currency: string | null;
  liquidity: 'daily' | 'monthly' | 'illiquid';
  lock_up_days: number | null;
  notes: string | null;
  fx_base: string | null;
  fx_quote: string | null;
}
interface SeriesRow {
  asset_id: string;
  days: Buffer;
  closes: Buffer;
  batches: Buffer;
}
interface RevisionRow {
  scenario_id: number;
  number: number;
  hash: string;
  document: string;
  saved_at: string;
  author: string;
  note: string | null;
}
interface ScenarioRow {
  id: number;
  household_id: number;
  name: string;
  universe: string | null;
  created_at: string;
  latest: number | null;
}
interface MemoRow {
  id: number;
  scenario_id: number;
  revision_hash: string;
  data_version: number;
  sha256: string;
  printed_at: string;
  title: string | null;
  bytes: number;
  memo_hash: string | null;
  prepared_by: string | null;
}

const CURRENCY = /^[A-Z]{3}$/;
const opt = <T>(v: T | null): T | undefined => (v === null ? undefined : v);

/** The Store over one open better-sqlite3 connection. Every statement uses bound parameters. */
export class SqliteStore implements Store {
  readonly schemaVersion: number;

  constructor(
    private readonly db: Database.Database,
    readonly path: string,
    private readonly now: () => Date,
    readonly readOnly?: ReadOnlyReason,
  ) {
    this.schemaVersion = db.pragma('user_version', { simple: true }) as number;
  }

  private readonly statements = new Map<string, Database.Statement>();

  /** A prepared statement, compiled once per connection. */
  private sql(text: string): Database.Statement {
    let s = this.statements.get(text);
    if (!s) this.statements.set(text, (s = this.db.prepare(text)));
    return s;
  }

  close(): void {
    if (this.db.open) this.db.close();
  }

  /**
   * BEGIN IMMEDIATE: the write lock is taken at the start, so a second writer waits for the busy
   * timeout there. A deferred transaction that reads first cannot wait when it later needs to
   * write (SQLite answers SQLITE_BUSY at once, since waiting could deadlock), which is how two
   * writers used to fail. `activity` names a long write for others who find the store busy.
   */
  transaction<T>(fn: () => T, activity?: string): T {
    if (activity === undefined || this.db.inTransaction) return this.db.transaction(fn).immediate();
    // The note is left only once the lock is ours, so a writer that waits never covers the holder's.
    let release: (() => void) | undefined;
    try {
      return this.db
        .transaction(() => {
          release = announceWriter(this.path, activity, this.now());
          return fn();
        })
        .immediate();
    } finally {
      release?.();
    }
  }

  private stamp(): string {
    return this.now().toISOString();
  }

  private audit(
    action: string,
    entity: AuditEntry['entity'],
    entityId: number,
    revisionHash?: string,
    detail?: string,
  ) {
    this.sql(
      'INSERT INTO audit_log (at, action, entity, entity_id, revision_hash, detail) VALUES (?, ?, ?, ?, ?, ?)',
    ).run(this.stamp(), action, entity, entityId, revisionHash ?? null, detail ?? null);
  }

  // ---- assets ----

  upsertAssets(assets: readonly AssetInput[]): void {
    this.transaction(() => assets.forEach((a) => this.upsertAsset(a)));
  }

  private upsertAsset(input: AssetInput): void {
    if (!ASSET_ID.test(input.id)) throw new InputError(`asset id '${input.id}': ${ASSET_ID_RULE}`);
    if (input.currency !== undefined && !CURRENCY.test(input.currency))
      throw new InputError(`asset '${input.id}': currency '${input.currency}' is not an ISO 4217 code such as EUR`);
    const old = this.getAsset(input.id);
    const a: AssetRecord = {
      ...(old ?? { id: input.id, displayName: input.id, liquidity: { tag: 'daily' } }),
      ...Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined)),
    } as AssetRecord;
    if (a.liquidity.lockUpDays !== undefined && !(a.liquidity.lockUpDays >= 0))
      throw new InputError(`asset '${input.id}': lock-up must be zero or more days`);
    this.sql(
      `INSERT INTO assets (id, display_name, asset_class, region, currency, liquidity, lock_up_days, notes, fx_base, fx_quote)
         VALUES (@id, @name, @cls, @region, @currency, @liq, @lock, @notes, @fxBase, @fxQuote)
         ON CONFLICT (id) DO UPDATE SET display_name = @name, asset_class = @cls, region = @region, currency = @currency,
           liquidity = @liq, lock_up_days = @lock, notes = @notes, fx_base = @fxBase, fx_quote = @fxQuote`,
    ).run({
      id: a.id,
      name: a.displayName,
      cls: a.assetClass ? canonicalAssetClass(a.assetClass) : null,
      region: a.region ?? null,
      currency: a.currency ?? null,
      liq: a.liquidity.tag,
      lock: a.liquidity.lockUpDays ?? null,
      notes: a.notes ?? null,
      fxBase: a.fx?.base ?? null,
      fxQuote: a.fx?.quote ?? null,
    });
  }

  private static asset(r: AssetRow): AssetRecord {
    const liquidity = r.lock_up_days === null ? { tag: r.liquidity } : { tag: r.liquidity, lockUpDays: r.lock_up_days };
    const out: AssetRecord = { id: r.id, displayName: r.display_name, liquidity };
    // Stores written before classes had one spelling are read in it.
    if (r.asset_class !== null) out.assetClass = canonicalAssetClass(r.asset_class);
    if (r.region !== null) out.region = r.region;
    if (r.currency !== null) out.currency = r.currency;
    if (r.notes !== null) out.notes = r.notes;
    if (r.fx_base !== null && r.fx_quote !== null) out.fx = { base: r.fx_base, quote: r.fx_quote };
    return out;
  }

  getAsset(id: string): AssetRecord | undefined {
    const row = this.sql('SELECT * FROM assets WHERE id = ?').get(id) as AssetRow | undefined;
    return row && SqliteStore.asset(row);
  }

  listAssets(): AssetRecord[] {
    return (this.sql('SELECT * FROM assets ORDER BY id').all() as AssetRow[]).map(SqliteStore.asset);
  }

  fxAsset(base: string, quote: string): AssetRecord | undefined {
    const row = this.sql('SELECT * FROM assets WHERE fx_base = ? AND fx_quote = ? ORDER BY id LIMIT 1').get(
      base,
      quote,
    ) as AssetRow | undefined;
    return row && SqliteStore.asset(row);
  }

  // ---- prices ----

  commitPrices(commit: PriceCommit): ImportBatch {
    return this.transaction(() => {
      this.upsertAssets(commit.assets);
      const at = this.stamp();
      const batchId = Number(
        this.sql(
          'INSERT INTO import_batches (source, imported_at, added, replaced, assets, note) VALUES (?, ?, 0, 0, 0, ?)',
        ).run(commit.source, at, commit.note ?? null).lastInsertRowid,
      );
      const read = this.sql('SELECT asset_id, days, closes, batches FROM price_series WHERE asset_id = ?');
      const write = this.sql(
        `INSERT INTO price_series (asset_id, points, first_day, last_day, days, closes, batches, checksum)
           VALUES (@asset_id, @points, @first_day, @last_day, @days, @closes, @batches, @checksum)
         ON CONFLICT (asset_id) DO UPDATE SET points = excluded.points, first_day = excluded.first_day,
           last_day = excluded.last_day, days = excluded.days, closes = excluded.closes, batches = excluded.batches,
           checksum = excluded.checksum`,
      );
      let added = 0;
      let replaced = 0;
      commit.prices.forEach((p, index) => {
        if (commit.signal?.aborted) throw new CancelledError();
        const days = 'days' in p ? checkDays(p.assetId, p.days) : toDays(p.assetId, p.dates);
        if (p.closes.length !== days.length)
          throw new InputError(`asset '${p.assetId}': ${days.length} dates but ${p.closes.length} closes`);
        const dateAt = (i: number) => isoFromDay(days[i]);
        for (let i = 0; i < p.closes.length; i++)
          if (!(p.closes[i] > 0) || !Number.isFinite(p.closes[i]))
            throw new InputError(`asset '${p.assetId}' on ${dateAt(i)}: a close must be a positive number`);
        if (!this.getAsset(p.assetId)) throw new InputError(`prices for unknown asset '${p.assetId}'`);
        const row = read.get(p.assetId) as SeriesRow | undefined;
        const merged = mergeSeries(row && decode(row), days, p.closes, batchId);
        added += merged.added;
        replaced += merged.replaced;
        const n = merged.days.length;
        const values: SeriesRowValues = {
          asset_id: p.assetId,
          points: n,
          first_day: n ? merged.days[0] : null,
          last_day: n ? merged.days[n - 1] : null,
          days: toBlob(merged.days),
          closes: toBlob(merged.closes),
          batches: toBlob(merged.batches),
        };
        write.run({ ...values, checksum: seriesChecksum(values) });
        commit.onProgress?.(index + 1, commit.prices.length);
      });
      this.sql('UPDATE import_batches SET added = ?, replaced = ?, assets = ? WHERE id = ?').run(
        added,
        replaced,
        commit.prices.length,
        batchId,
      );
      // Cached results stay valid when a batch changed no price (an import of nothing new).
      if (added + replaced > 0)
        this.sql(
          `INSERT INTO meta (key, value) VALUES ('data_version', '1')
           ON CONFLICT (key) DO UPDATE SET value = CAST(CAST(value AS INTEGER) + 1 AS TEXT)`,
        ).run();
      if (commit.universe) {
        const old = this.getUniverse(commit.universe.name);
        const members = new Map((old?.members ?? []).map((m) => [m.assetId, m]));
        for (const a of [
          ...commit.assets.map((x) => x.id),
          ...commit.prices.map((x) => x.assetId),
          ...(commit.universe.assets ?? []),
        ]) {
          const tags = commit.universe.tags?.[a];
          if (!members.has(a) || tags) members.set(a, { assetId: a, tags: [...(tags ?? members.get(a)?.tags ?? [])] });
        }
        this.saveUniverse(commit.universe.name, [...members.values()], old?.description);
      }
      this.audit('import', 'prices', batchId, undefined, `${commit.source}: ${added} added, ${replaced} replaced`);
      if (commit.signal?.aborted) throw new CancelledError();
      return {
        id: batchId,
        source: commit.source,
        importedAt: at,
        added,
        replaced,
        assets: commit.prices.length,
        ...(commit.note !== undefined ? { note: commit.note } : {}),
      };
    }, `an import of ${commit.source}`);
  }

  priceSeries(assetId: string): PriceSeries | undefined {
    return this.priceSeriesMany([assetId]).get(assetId);
  }

  priceSeriesMany(assetIds: readonly string[]): Map<string, PriceSeries> {
    const out = new Map<string, PriceSeries>();
    for (const [id, s] of this.readSeries(assetIds))
      out.set(id, {
        assetId: id,
        dates: Array.from(s.days, isoFromDay),
        days: s.days,
        closes: s.closes,
        batches: s.batches,
      });
    return out;
  }

  private readSeries(assetIds: readonly string[]): Map<string, SeriesArrays> {
    const rows = this.sql(
      'SELECT asset_id, days, closes, batches FROM price_series WHERE asset_id IN (SELECT value FROM json_each(?))',
    ).all(JSON.stringify(assetIds)) as SeriesRow[];
    return new Map(rows.map((r) => [r.asset_id, decode(r)]));
  }

  /** Days and closes only: what a PriceTable needs (the batch ids stay on disk). */
  private readCloses(assetIds: readonly string[]): Map<string, Pick<SeriesArrays, 'days' | 'closes'>> {
    const rows = this.sql(
      'SELECT asset_id, days, closes FROM price_series WHERE asset_id IN (SELECT value FROM json_each(?))',
    ).all(JSON.stringify(assetIds)) as Omit<SeriesRow, 'batches'>[];
    return new Map(rows.map((r) => [r.asset_id, { days: int32s(r.days), closes: float64s(r.closes) }]));
  }

  priceTable(query: PriceTableQuery): PriceTable {
    let assets: readonly string[];
    if (query.universe !== undefined) {
      const u = this.getUniverse(query.universe);
      if (!u) throw new InputError(`no universe named '${query.universe}'`);
      assets = u.members.map((m) => m.assetId);
    } else assets = query.assets ?? [];
    for (const [key, value] of [
      ['from', query.from],
      ['to', query.to],
    ] as const)
      if (value !== undefined && !isIsoDate(value))
        throw new InputError(`${key}: expected a date YYYY-MM-DD, got '${value}'`);
    const known = new Map(
      (
        this.sql('SELECT id, currency FROM assets WHERE id IN (SELECT value FROM json_each(?))').all(
          JSON.stringify(assets),
        ) as { id: string; currency: string | null }[]
      ).map((r) => [r.id, r.currency]),
    );
    const missing = assets.filter((a) => !known.has(a));
    if (missing.length) throw new InputError(`unknown asset${missing.length > 1 ? 's' : ''}: ${missing.join(', ')}`);
    const series = this.readCloses(assets);
    return alignSeries(
      assets,
      assets.map((a) => series.get(a)),
      query.from ? dayFromIso(query.from) : -1e9,
      query.to ? dayFromIso(query.to) : 1e9,
      assets.map((a) => opt(known.get(a) ?? null)),
    );
  }

  listBatches(): ImportBatch[] {
    return (
      this.sql('SELECT * FROM import_batches ORDER BY id').all() as {
        id: number;
        source: string;
        imported_at: string;
        added: number;
        replaced: number;
        assets: number;
        note: string | null;
      }[]
    ).map((r) => ({
      id: r.id,
      source: r.source,
      importedAt: r.imported_at,
      added: r.added,
      replaced: r.replaced,
      assets: r.assets,
      ...(r.note !== null ? { note: r.note } : {}),
    }));
  }

  dataVersion(): number {
    const row = this.sql("SELECT value FROM meta WHERE key = 'data_version'").get() as { value: string } | undefined;
    return row ? Number(row.value) : 0;
  }

  // ---- universes ----

  saveUniverse(name: string, members: readonly UniverseMember[], description?: string): UniverseRecord {
    if (!name.trim()) throw new InputError('a universe needs a name');
    return this.transaction(() => {
      const seen = new Set<string>();
      for (const m of members) {
        if (seen.has(m.assetId)) throw new InputError(`universe '${name}': asset '${m.assetId}' listed twice`);
        seen.add(m.assetId);
        if (!this.getAsset(m.assetId)) throw new InputError(`universe '${name}': unknown asset '${m.assetId}'`);
      }
      this.sql(
        'INSERT INTO universes (name, description) VALUES (?, ?) ON CONFLICT (name) DO UPDATE SET description = excluded.description',
      ).run(name, description ?? null);
      const id = (this.sql('SELECT id FROM universes WHERE name = ?').get(name) as { id: number }).id;
      this.sql('DELETE FROM universe_members WHERE universe_id = ?').run(id);
      const insert = this.sql(
        'INSERT INTO universe_members (universe_id, asset_id, position, tags) VALUES (?, ?, ?, ?)',
      );
      members.forEach((m, i) => insert.run(id, m.assetId, i, JSON.stringify(m.tags)));
      this.audit('save', 'universe', id, undefined, `${name}: ${members.length} assets`);
      return this.getUniverse(name)!;
    });
  }

  getUniverse(name: string): UniverseRecord | undefined {
    const u = this.sql('SELECT id, name, description FROM universes WHERE name = ?').get(name) as
      { id: number; name: string; description: string | null } | undefined;
    if (!u) return undefined;
    const members = (
      this.sql('SELECT asset_id, tags FROM universe_members WHERE universe_id = ? ORDER BY position').all(u.id) as {
        asset_id: string;
        tags: string;
      }[]
    ).map((m) => ({ assetId: m.asset_id, tags: JSON.parse(m.tags) as string[] }));
    return { id: u.id, name: u.name, ...(u.description !== null ? { description: u.description } : {}), members };
  }

  listUniverses(): UniverseRecord[] {
    return (this.sql('SELECT name FROM universes ORDER BY name').all() as { name: string }[]).map((r) =>
      this.getUniverse(r.name)!,
    );
  }

  deleteUniverse(name: string): void {
    this.transaction(() => {
      const u = this.getUniverse(name);
      if (!u) throw new NotFoundError(`no universe named '${name}'`);
      this.sql('DELETE FROM universes WHERE id = ?').run(u.id);
      this.audit('delete', 'universe', u.id, undefined, name);
    });
  }

  // ---- households and holdings ----

  createHousehold(input: HouseholdInput): HouseholdRecord {
    checkHousehold(input);
    return this.transaction(() => {
      if (this.getHousehold(input.name)) throw new InputError(`a household named '${input.name}' exists already`);
      const id = Number(
        this.sql(
          `INSERT INTO households (name, base_currency, reference, notes, mandate_asset_cap, mandate_illiquid_max)
             VALUES (?, ?, ?, ?, ?, ?)`,
        ).run(
          input.name,
          input.baseCurrency,
          input.reference ?? null,
          input.notes ?? null,
          input.mandate?.assetCap ?? null,
          input.mandate?.illiquidMax ?? null,
        ).lastInsertRowid,
      );
      this.audit('create', 'household', id, undefined, input.name);
      return this.getHousehold(id)!;
    });
  }

  updateHousehold(id: number, changes: Partial<HouseholdInput>): HouseholdRecord {
    return this.transaction(() => {
      const old = this.getHousehold(id);
      if (!old) throw new NotFoundError(`no household with id ${id}`);
      const next = { ...old, ...Object.fromEntries(Object.entries(changes).filter(([, v]) => v !== undefined)) };
      checkHousehold(next);
      this.sql(
        `UPDATE households SET name = ?, base_currency = ?, reference = ?, notes = ?, mandate_asset_cap = ?,
           mandate_illiquid_max = ? WHERE id = ?`,
      ).run(
        next.name,
        next.baseCurrency,
        next.reference ?? null,
        next.notes ?? null,
        next.mandate?.assetCap ?? null,
        next.mandate?.illiquidMax ?? null,
        id,
      );
      this.audit('update', 'household', id, undefined, Object.keys(changes).join(', '));
      return this.getHousehold(id)!;
    });
  }

  getHousehold(idOrName: number | string): HouseholdRecord | undefined {
    const r = this.sql(`SELECT * FROM households WHERE ${typeof idOrName === 'number' ? 'id' : 'name'} = ?`).get(
      idOrName,
    ) as
      | {
          id: number;
          name: string;
          base_currency: string;
          reference: string | null;
          notes: string | null;
          mandate_asset_cap: number | null;
          mandate_illiquid_max: number | null;
        }
      | undefined;
    if (!r) return undefined;
    const out: HouseholdRecord = { id: r.id, name: r.name, baseCurrency: r.base_currency };
    if (r.reference !== null) out.reference = r.reference;
    if (r.notes !== null) out.notes = r.notes;
    const mandate = { assetCap: r.mandate_asset_cap, illiquidMax: r.mandate_illiquid_max };
    if (hasMandate(mandate)) out.mandate = mandate;
    return out;
  }

  listHouseholds(): HouseholdRecord[] {
    return (this.sql('SELECT id FROM households ORDER BY name').all() as { id: number }[]).map((r) =>
      this.getHousehold(r.id)!,
    );
  }

  deleteHousehold(id: number): void {
    this.transaction(() => {
      const h = this.getHousehold(id);
      if (!h) throw new NotFoundError(`no household with id ${id}`);
      this.sql('DELETE FROM households WHERE id = ?').run(id);
      this.audit('delete', 'household', id, undefined, h.name);
    });
  }

  setHoldings(householdId: number, holdings: readonly Holding[]): void {
    this.transaction(() => {
      if (!this.getHousehold(householdId)) throw new NotFoundError(`no household with id ${householdId}`);
      const seen = new Set<string>();
      holdings.forEach((h, i) => {
        const at = `holdings[${i}]`;
        if (seen.has(h.assetId)) throw new InputError(`asset '${h.assetId}' held twice`, { path: at });
        seen.add(h.assetId);
        if (!this.getAsset(h.assetId)) throw new InputError(`unknown asset '${h.assetId}'`, { path: `${at}.assetId` });
        if (!Number.isFinite(h.amount)) throw new InputError('amount must be a number', { path: `${at}.amount` });
        if (!CURRENCY.test(h.currency))
          throw new InputError(`'${h.currency}' is not an ISO 4217 code`, { path: `${at}.currency` });
        if (!isIsoDate(h.asOf)) throw new InputError('expected a date YYYY-MM-DD', { path: `${at}.asOf` });
      });
      this.sql('DELETE FROM holdings WHERE household_id = ?').run(householdId);
      const insert = this.sql(
        'INSERT INTO holdings (household_id, asset_id, amount, currency, as_of) VALUES (?, ?, ?, ?, ?)',
      );
      for (const h of holdings) insert.run(householdId, h.assetId, h.amount, h.currency, h.asOf);
      this.audit('replace', 'holdings', householdId, undefined, `${holdings.length} positions`);
    });
  }

  holdings(householdId: number): Holding[] {
    return (
      this.sql('SELECT asset_id, amount, currency, as_of FROM holdings WHERE household_id = ? ORDER BY asset_id').all(
        householdId,
      ) as { asset_id: string; amount: number; currency: string; as_of: string }[]
    ).map((r) => ({ assetId: r.asset_id, amount: r.amount, currency: r.currency, asOf: r.as_of }));
  }

  householdReview(householdId: number): HouseholdReview {
    const r = this.sql('SELECT drift_tolerance, note, reviewed_at FROM household_reviews WHERE household_id = ?').get(
      householdId,
    ) as { drift_tolerance: number | null; note: string | null; reviewed_at: string | null } | undefined;
    return { driftTolerance: r?.drift_tolerance ?? null, note: r?.note ?? null, reviewedAt: r?.reviewed_at ?? null };
  }

  setHouseholdReview(
    householdId: number,
    changes: { driftTolerance?: number | null; note?: string | null; reviewed?: boolean },
  ): HouseholdReview {
    const t = changes.driftTolerance;
    if (t !== undefined && t !== null && !(Number.isFinite(t) && t > 0 && t <= 2))
      throw new InputError('the drift tolerance must be above 0 % and at most 200 %', { path: 'driftTolerance' });
    return this.transaction(() => {
      if (!this.getHousehold(householdId)) throw new NotFoundError(`no household with id ${householdId}`);
      const old = this.householdReview(householdId);
      const next: HouseholdReview = {
        driftTolerance: t === undefined ? old.driftTolerance : t,
        note: changes.note === undefined ? old.note : changes.note,
        reviewedAt: changes.reviewed ? this.stamp() : old.reviewedAt,
      };
      this.sql(
        `INSERT INTO household_reviews (household_id, drift_tolerance, note, reviewed_at) VALUES (?, ?, ?, ?)
           ON CONFLICT (household_id) DO UPDATE SET drift_tolerance = excluded.drift_tolerance, note = excluded.note,
           reviewed_at = excluded.reviewed_at`,
      ).run(householdId, next.driftTolerance, next.note, next.reviewedAt);
      const what = [
        changes.driftTolerance !== undefined ? 'tolerance' : '',
        changes.note !== undefined ? 'note' : '',
        changes.reviewed ? 'reviewed' : '',
      ].filter(Boolean);
      this.audit(changes.reviewed ? 'review' : 'update', 'review', householdId, undefined, what.join(', '));
      return next;
    });
  }

  // ---- scenarios ----

  createScenario(input: { householdId: number; name: string; universe?: string }): ScenarioRecord {
    if (!input.name.trim()) throw new InputError('a scenario needs a name');
    return this.transaction(() => {
      if (!this.getHousehold(input.householdId)) throw new NotFoundError(`no household with id ${input.householdId}`);
      if (this.getScenario(input.householdId, input.name))
        throw new InputError(`this household has a scenario named '${input.name}' already`);
      let universeId: number | null = null;
      if (input.universe !== undefined) {
        const u = this.getUniverse(input.universe);
        if (!u) throw new InputError(`no universe named '${input.universe}'`);
        universeId = u.id;
      }
      const id = Number(
        this.sql('INSERT INTO scenarios (household_id, name, universe_id, created_at) VALUES (?, ?, ?, ?)').run(
          input.householdId,
          input.name,
          universeId,
          this.stamp(),
        ).lastInsertRowid,
      );
      this.audit('create', 'scenario', id, undefined, input.name);
      return this.getScenarioById(id)!;
    });
  }

  private scenarioQuery(where: string) {
    return this.sql(
      `SELECT s.id, s.household_id, s.name, u.name AS universe, s.created_at,
         (SELECT max(number) FROM scenario_revisions r WHERE r.scenario_id = s.id) AS latest
       FROM scenarios s LEFT JOIN universes u ON u.id = s.universe_id WHERE ${where}`,
    );
  }

  private static scenario(r: ScenarioRow): ScenarioRecord {
    return {
      id: r.id,
      householdId: r.household_id,
      name: r.name,
      ...(r.universe !== null ? { universe: r.universe } : {}),
      createdAt: r.created_at,
      latestRevision: r.latest ?? 0,
    };
  }

  getScenario(householdId: number, name: string): ScenarioRecord | undefined {
    const r = this.scenarioQuery('s.household_id = ? AND s.name = ?').get(householdId, name) as ScenarioRow | undefined;
    return r && SqliteStore.scenario(r);
  }

  getScenarioById(id: number): ScenarioRecord | undefined {
    const r = this.scenarioQuery('s.id = ?').get(id) as ScenarioRow | undefined;
    return r && SqliteStore.scenario(r);
  }

  listScenarios(householdId: number): ScenarioRecord[] {
    return (this.scenarioQuery('s.household_id = ? ORDER BY s.name').all(householdId) as ScenarioRow[]).map(
      SqliteStore.scenario,
    );
  }

  deleteScenario(id: number): void {
    this.transaction(() => {
      const s = this.requireScenario(id);
      this.sql('DELETE FROM scenarios WHERE id = ?').run(id);
      this.audit('delete', 'scenario', id, undefined, s.name);
    });
  }

  private requireScenario(id: number): ScenarioRecord {
    const s = this.getScenarioById(id);
    if (!s) throw new NotFoundError(`no scenario with id ${id}`);
    return s;
  }

  saveRevision(scenarioId: number, document: unknown, meta: RevisionMeta): RevisionInfo {
    const parsed = parseScenario(document);
    if (!parsed.ok) {
      const [first, ...rest] = parsed.errors;
      const more = rest.length ? ` (and ${rest.length} more: ${rest.map(formatInputError).join('; ')})` : '';
      throw new InputError(first.message + more, first.location);
    }
    if (!/^[A-Za-z]{1,4}$/.test(meta.author)) throw new InputError(`author initials '${meta.author}': 1 to 4 letters`);
    const text = canonicalJson(parsed.scenario);
    const hash = sha256Hex(text);
    return this.transaction(() => {
      const s = this.requireScenario(scenarioId);
      const latest = this.getRevision(scenarioId);
      this.sql('DELETE FROM scenario_drafts WHERE scenario_id = ?').run(scenarioId);
      if (latest && latest.hash === hash) return info(latest);
      const number = s.latestRevision + 1;
      this.sql(
        'INSERT INTO scenario_revisions (scenario_id, number, hash, document, saved_at, author, note) VALUES (?, ?, ?, ?, ?, ?, ?)',
      ).run(scenarioId, number, hash, text, meta.savedAt ?? this.stamp(), meta.author, meta.note ?? null);
      this.audit('save', 'revision', scenarioId, hash, `revision ${number}${meta.note ? `: ${meta.note}` : ''}`);
      return info(this.getRevision(scenarioId, number)!);
    });
  }

  listRevisions(scenarioId: number): RevisionInfo[] {
    return (
      this.sql('SELECT * FROM scenario_revisions WHERE scenario_id = ? ORDER BY number').all(
        scenarioId,
      ) as RevisionRow[]
    ).map((r) => info(revision(r)));
  }

  getRevision(scenarioId: number, number?: number): Revision | undefined {
    const r = (
      number === undefined
        ? this.sql('SELECT * FROM scenario_revisions WHERE scenario_id = ? ORDER BY number DESC LIMIT 1').get(
            scenarioId,
          )
        : this.sql('SELECT * FROM scenario_revisions WHERE scenario_id = ? AND number = ?').get(scenarioId, number)
    ) as RevisionRow | undefined;
    return r && revision(r);
  }

  getRevisionByHash(hash: string): Revision | undefined {
    const r = this.sql('SELECT * FROM scenario_revisions WHERE hash = ? ORDER BY saved_at LIMIT 1').get(hash) as
      RevisionRow | undefined;
    return r && revision(r);
  }

  compareRevisions(scenarioId: number, from: number, to: number): RevisionComparison {
    const a = this.getRevision(scenarioId, from);
    const b = this.getRevision(scenarioId, to);
    if (!a || !b) throw new NotFoundError(`scenario ${scenarioId} has no revision ${!a ? from : to}`);
    return { from: info(a), to: info(b), changes: diffDocuments(a.document, b.document) };
  }

  restoreRevision(scenarioId: number, number: number, meta: { author: string; note?: string }): RevisionInfo {
    const old = this.getRevision(scenarioId, number);
    if (!old) throw new NotFoundError(`scenario ${scenarioId} has no revision ${number}`);
    return this.saveRevision(scenarioId, old.document, {
      author: meta.author,
      note: meta.note ?? `restored from revision ${number}`,
    });
  }

  saveDraft(scenarioId: number, text: string): Draft {
    return this.transaction(() => {
      this.requireScenario(scenarioId);
      const savedAt = this.stamp();
      this.sql(
        'INSERT INTO scenario_drafts (scenario_id, text, saved_at) VALUES (?, ?, ?) ON CONFLICT (scenario_id) DO UPDATE SET text = excluded.text, saved_at = excluded.saved_at',
      ).run(scenarioId, text, savedAt);
      this.audit('autosave', 'draft', scenarioId);
      return { scenarioId, text, savedAt };
    });
  }

  getDraft(scenarioId: number): Draft | undefined {
    const r = this.sql('SELECT * FROM scenario_drafts WHERE scenario_id = ?').get(scenarioId) as
      { scenario_id: number; text: string; saved_at: string } | undefined;
    return r && { scenarioId: r.scenario_id, text: r.text, savedAt: r.saved_at };
  }

  discardDraft(scenarioId: number): void {
    this.transaction(() => {
      if (this.sql('DELETE FROM scenario_drafts WHERE scenario_id = ?').run(scenarioId).changes)
        this.audit('discard', 'draft', scenarioId);
    });
  }

  // ---- results cache ----

  getCachedResult(revisionHash: string, dataVersion: number, kind: string): unknown {
    const r = this.sql('SELECT value FROM results_cache WHERE revision_hash = ? AND data_version = ? AND kind = ?').get(
      revisionHash,
      dataVersion,
      kind,
    ) as { value: string } | undefined;
    return r ? JSON.parse(r.value) : undefined;
  }

  putCachedResult(revisionHash: string, dataVersion: number, kind: string, value: unknown): void {
    this.sql(
      `INSERT INTO results_cache (revision_hash, data_version, kind, value, created_at) VALUES (?, ?, ?, ?, ?)
         ON CONFLICT (revision_hash, data_version, kind) DO UPDATE SET value = excluded.value, created_at = excluded.created_at`,
    ).run(revisionHash, dataVersion, kind, JSON.stringify(value), this.stamp());
  }

  // ---- memos ----

  saveMemo(memo: MemoInput): MemoInfo {
    return this.transaction(() => {
      this.requireScenario(memo.scenarioId);
      const rev = this.getRevisionByHash(memo.revisionHash);
      if (!rev || rev.scenarioId !== memo.scenarioId)
        throw new InputError(`revision ${memo.revisionHash} is not a revision of scenario ${memo.scenarioId}`);
      const sha = sha256Hex(memo.pdf);
      const id = Number(
        this.sql(
          'INSERT INTO memos (scenario_id, revision_hash, data_version, sha256, printed_at, title, pdf, memo_hash, prepared_by) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)',
        ).run(
          memo.scenarioId,
          memo.revisionHash,
          memo.dataVersion,
          sha,
          memo.printedAt ?? this.stamp(),
          memo.title ?? null,
          Buffer.from(memo.pdf.buffer, memo.pdf.byteOffset, memo.pdf.byteLength),
          memo.memoHash ?? null,
          memo.preparedBy ?? null,
        ).lastInsertRowid,
      );
      this.audit('print', 'memo', id, memo.revisionHash, sha);
      return this.memoInfo(id)!;
    });
  }

  private memoInfo(id: number): MemoInfo | undefined {
    const r = this.sql(`${MEMO_COLUMNS} WHERE id = ?`).get(id) as MemoRow | undefined;
    return r && memoInfo(r);
  }

  listMemos(scenarioId: number): MemoInfo[] {
    return (this.sql(`${MEMO_COLUMNS} WHERE scenario_id = ? ORDER BY id`).all(scenarioId) as MemoRow[]).map(memoInfo);
  }

  getMemoPdf(id: number): Uint8Array | undefined {
    const r = this.sql('SELECT pdf FROM memos WHERE id = ?').get(id) as { pdf: Buffer } | undefined;
    return r && new Uint8Array(r.pdf);
  }

  findMemo(revisionHash: string, dataVersion: number): MemoInfo | undefined {
    const r = this.sql(`${MEMO_COLUMNS} WHERE revision_hash = ? AND data_version = ? ORDER BY id DESC LIMIT 1`).get(
      revisionHash,
      dataVersion,
    ) as MemoRow | undefined;
    return r && memoInfo(r);
  }

  // ---- audit, checks, backup ----

  auditLog(query: AuditQuery = {}): AuditEntry[] {
    const rows = this.sql(
      `SELECT * FROM audit_log WHERE (@entity IS NULL OR entity = @entity) AND (@entityId IS NULL OR entity_id = @entityId)
         ORDER BY id DESC LIMIT @limit`,
    ).all({ entity: query.entity ?? null, entityId: query.entityId ?? null, limit: query.limit ?? -1 }) as {
      id: number;
      at: string;
      action: string;
      entity: AuditEntry['entity'];
      entity_id: number;
      revision_hash: string | null;
      detail: string | null;
    }[];
    return rows.map((r) => ({
      id: r.id,
      at: r.at,
      action: r.action,
      entity: r.entity,
      entityId: r.entity_id,
      ...(r.revision_hash !== null ? { revisionHash: r.revision_hash } : {}),
      ...(r.detail !== null ? { detail: r.detail } : {}),
    }));
  }

  check(): string[] {
    return verifyDatabase(this.db).problems;
  }

  async backup(destination: string): Promise<void> {
    try {
      await this.db.backup(destination);
      chmodSync(destination, 0o600);
      const copy = new Database(destination, withNativeBinding({ fileMustExist: true }));
      try {
        sealBackup(copy);
      } finally {
        copy.close();
      }
    } catch (error) {
      // A disk that filled up (or failed) part way: no half backup is left to be trusted later.
      for (const f of [destination, `${destination}-wal`, `${destination}-shm`, `${destination}-journal`])
        rmSync(f, { force: true });
      throw asStorageError(error, destination) ?? error;
    }
  }
}

const MEMO_COLUMNS =
  'SELECT id, scenario_id, revision_hash, data_version, sha256, printed_at, title, length(pdf) AS bytes, memo_hash, prepared_by FROM memos';

function memoInfo(r: MemoRow): MemoInfo {
  return {
    id: r.id,
    scenarioId: r.scenario_id,
    revisionHash: r.revision_hash,
    dataVersion: r.data_version,
    sha256: r.sha256,
    printedAt: r.printed_at,
    ...(r.title !== null ? { title: r.title } : {}),
    bytes: r.bytes,
    ...(r.memo_hash !== null ? { memoHash: r.memo_hash } : {}),
    ...(r.prepared_by !== null ? { preparedBy: r.prepared_by } : {}),
  };
}

function revision(r: RevisionRow): Revision {
  return {
    scenarioId: r.scenario_id,
    number: r.number,
    hash: r.hash,
    savedAt: r.saved_at,
    author: r.author,
    ...(r.note !== null ? { note: r.note } : {}),
    document: JSON.parse(r.document) as Scenario,
  };
}

function info(r: Revision): RevisionInfo {
  const { document: _document, ...rest } = r;
  return rest;
}

function decode(r: SeriesRow): SeriesArrays {
  return { days: int32s(r.days), closes: float64s(r.closes), batches: int32s(r.batches) };
}

function toDays(assetId: string, dates: readonly string[]): Int32Array {
  const out = new Int32Array(dates.length);
  for (let i = 0; i < dates.length; i++) {
    if (!isIsoDate(dates[i])) throw new InputError(`asset '${assetId}': '${dates[i]}' is not a date YYYY-MM-DD`);
    out[i] = dayFromIso(dates[i]);
    if (i > 0 && out[i] <= out[i - 1]) throw new InputError(`asset '${assetId}': dates not ascending at ${dates[i]}`);
  }
  return out;
}

function checkDays(assetId: string, days: Int32Array): Int32Array {
  for (let i = 1; i < days.length; i++)
    if (days[i] <= days[i - 1])
      throw new InputError(`asset '${assetId}': dates not ascending at ${isoFromDay(days[i])}`);
  return days;
}

function checkHousehold(h: HouseholdInput): void {
  if (!h.name.trim()) throw new InputError('a household needs a name', { path: 'name' });
  if (!CURRENCY.test(h.baseCurrency))
    throw new InputError(`'${h.baseCurrency}' is not an ISO 4217 code such as EUR`, { path: 'baseCurrency' });
  if (h.mandate) {
    const parsed = householdMandateSchema.safeParse(h.mandate);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      throw new InputError(issue.message, { path: ['mandate', ...issue.path].join('.') });
    }
  }
}
