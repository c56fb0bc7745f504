/**
 * The Store: the typed API of Holdfast's one local SQLite file (the advisor's whole library).
 * The service layer, the memo writer, the demo creator and the command line call these methods;
 * no other module opens SQLite or holds SQL (test/unit/architecture.test.ts).
 *
 * Every method that changes something is one SQLite transaction: a process killed at any
 * moment leaves all of that change or none of it. `transaction(fn)` groups several calls into
 * one (better-sqlite3 nests them as savepoints).
 *
 * Errors: bad arguments from a user (unknown names, invalid scenario documents) are
 * `InputError`s from shared-core/errors.ts; a file that is not a Holdfast store, or one written
 * by a newer Holdfast, is a `StoreOpenError` and the file is left untouched.
 */
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import type { HouseholdMandate } from '../../shared-core/scenario/household-mandate.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';
import type { ReadOnlyReason } from './storage-error.js';

export type LiquidityTag = 'daily' | 'monthly' | 'illiquid';

export interface Liquidity {
  tag: LiquidityTag;
  /** Lock-up in days before a redemption can be asked for (illiquid holdings). */
  lockUpDays?: number;
}

export interface AssetRecord {
  /** Stable id, the column header of the price file (letters, digits, `._-`). */
  id: string;
  displayName: string;
  assetClass?: string;
  region?: string;
  /** ISO 4217 code of the prices; undefined until the advisor sets it. */
  currency?: string;
  liquidity: Liquidity;
  notes?: string;
  /** Set when the series is an exchange rate: price = units of `quote` per one unit of `base`. */
  fx?: { base: string; quote: string };
}

/** What a caller gives to create or update an asset; omitted fields keep their stored value. */
export type AssetInput = { id: string } & Partial<Omit<AssetRecord, 'id'>>;

export interface ImportBatch {
  id: number;
  /** The file (or other origin) the prices came from, as the user named it. */
  source: string;
  importedAt: string;
  /** Points written: added and replaced. */
  added: number;
  replaced: number;
  assets: number;
  note?: string;
}

/** Points to set for one asset; each replaces any stored close of the same date. */
export type PriceWrite = {
  assetId: string;
  closes: ArrayLike<number>;
} & (
  | {
      /** ISO dates, ascending, no repeats. */
      dates: readonly string[];
    }
  | {
      /** The same as whole days since 1970-01-01 (see days.ts), for large imports. */
      days: Int32Array;
    }
);

/** The stored history of one asset, every point with the import batch it came from. */
export interface PriceSeries {
  assetId: string;
  dates: string[];
  /** `dates` as whole days since 1970-01-01. */
  days: Int32Array;
  closes: Float64Array;
  batches: Int32Array;
}

export interface PriceCommit {
  /** File name or other origin, kept with the batch. */
  source: string;
  note?: string;
  /** Assets created when new, or updated with the fields given. */
  assets: readonly AssetInput[];
  prices: readonly PriceWrite[];
  /** Universe that the assets join (created when absent). */
  universe?: {
    name: string;
    /** Members to add besides the assets of `assets` and `prices`. */
    assets?: readonly string[];
    tags?: Readonly<Record<string, readonly string[]>>;
  };
  /** Called inside the transaction after each asset's prices are written (done of total). */
  onProgress?: (done: number, total: number) => void;
  /** Checked between assets; on abort the transaction rolls back and `CancelledError` is thrown. */
  signal?: AbortSignal;
}

export interface UniverseMember {
  assetId: string;
  /** Group tags (asset class, region, manager, ...), the sets a scenario's group bands use. */
  tags: string[];
}

export interface UniverseRecord {
  id: number;
  name: string;
  description?: string;
  members: UniverseMember[];
}

export interface PriceTableQuery {
  /** A universe by name (its members in their stored order) ... */
  universe?: string;
  /** ... or an explicit list of asset ids, in this order. */
  assets?: readonly string[];
  /** Inclusive ISO date window; open ends take the whole history. */
  from?: string;
  to?: string;
}

export interface HouseholdRecord {
  id: number;
  name: string;
  baseCurrency: string;
  reference?: string;
  notes?: string;
  /** The standing limits; absent while none is set. */
  mandate?: HouseholdMandate;
}
export type HouseholdInput = Omit<HouseholdRecord, 'id'>;

export interface Holding {
  assetId: string;
  /** Market value in `currency`. */
  amount: number;
  currency: string;
  /** ISO date the amount refers to. */
  asOf: string;
}

/** The book review's state of one household (defaults until the advisor sets them). */
export interface HouseholdReview {
  /** Sum |current - target| beyond which the household needs attention; null: the default. */
  driftTolerance: number | null;
  note: string | null;
  /** When the advisor last marked the household as reviewed. */
  reviewedAt: string | null;
}

export interface ScenarioRecord {
  id: number;
  householdId: number;
  name: string;
  universe?: string;
  createdAt: string;
  /** Number of the newest revision; 0 while only a draft exists. */
  latestRevision: number;
}

export interface RevisionInfo {
  scenarioId: number;
  /** 1, 2, 3, ... in the order saved. */
  number: number;
  /** sha256 (hex) of the canonical JSON of the validated document (see canonical-json.ts). */
  hash: string;
  savedAt: string;
  /** Initials of the advisor who saved it. */
  author: string;
  note?: string;
}

export interface RevisionMeta {
  author: string;
  note?: string;
  /** The original time when a revision comes from a household file; default now. */
  savedAt?: string;
}

export interface Revision extends RevisionInfo {
  document: Scenario;
}

export interface DocumentChange {
  /** JSON path such as `constraints.weightBounds.default[1]`. */
  path: string;
  before?: unknown;
  after?: unknown;
}

export interface RevisionComparison {
  from: RevisionInfo;
  to: RevisionInfo;
  changes: DocumentChange[];
}

export interface Draft {
  scenarioId: number;
  /** The editor's text as typed: it may not be a valid scenario yet. */
  text: string;
  savedAt: string;
}

export interface MemoInput {
  scenarioId: number;
  revisionHash: string;
  dataVersion: number;
  pdf: Uint8Array;
  title?: string;
  /** The original print time when a memo comes from a household file; default now. */
  printedAt?: string;
  /** The memo's own hash, printed in its footer (src-main/memo/memo-hash.ts). */
  memoHash?: string;
  preparedBy?: string;
}

export interface MemoInfo {
  id: number;
  scenarioId: number;
  revisionHash: string;
  dataVersion: number;
  /** sha256 (hex) of the PDF bytes. */
  sha256: string;
  printedAt: string;
  title?: string;
  bytes: number;
  memoHash?: string;
  preparedBy?: string;
}

export interface AuditEntry {
  id: number;
  at: string;
  action: string;
  entity: 'household' | 'holdings' | 'scenario' | 'revision' | 'draft' | 'universe' | 'prices' | 'memo' | 'review';
  entityId: number;
  /** Revision hash where the change concerns a scenario revision. */
  revisionHash?: string;
  detail?: string;
}

export interface AuditQuery {
  entity?: AuditEntry['entity'];
  entityId?: number;
  limit?: number;
}

export interface OpenStoreOptions {
  /** Create the file (owner-only, 0600) when it does not exist. Default true. */
  create?: boolean;
  /** Clock for timestamps (tests pass a fixed one). */
  now?: () => Date;
  /** How long a write waits for another writer before failing as busy (default BUSY_TIMEOUT_MS, 5 s). */
  busyTimeoutMs?: number;
}

export interface Store {
  readonly path: string;
  /** Schema version (`PRAGMA user_version`). */
  readonly schemaVersion: number;
  /** Set when this process cannot write the store (it is open read-only): which file and why. */
  readonly readOnly?: ReadOnlyReason;
  close(): void;
  /**
   * Runs `fn` as one write transaction, begun immediately (nested store calls become
   * savepoints). `activity` ("an import of prices.csv") is what another process that finds the
   * store busy is told.
   */
  transaction<T>(fn: () => T, activity?: string): T;

  // Assets
  upsertAssets(assets: readonly AssetInput[]): void;
  getAsset(id: string): AssetRecord | undefined;
  listAssets(): AssetRecord[];

  // Prices (FX series are assets with `fx` set)
  /** Writes prices (and new assets, and universe membership) as one import batch. */
  commitPrices(commit: PriceCommit): ImportBatch;
  priceSeries(assetId: string): PriceSeries | undefined;
  /** Several series at once, for diffs against a file about to be imported. */
  priceSeriesMany(assetIds: readonly string[]): Map<string, PriceSeries>;
  /** The aligned wide table of a universe or asset list over a date window. */
  priceTable(query: PriceTableQuery): PriceTable;
  /** The FX series quoting `quote` per one `base`, if stored. */
  fxAsset(base: string, quote: string): AssetRecord | undefined;
  listBatches(): ImportBatch[];
  /** Increases with every price commit: the second half of the results-cache key. */
  dataVersion(): number;

  // Universes
  saveUniverse(name: string, members: readonly UniverseMember[], description?: string): UniverseRecord;
  getUniverse(name: string): UniverseRecord | undefined;
  listUniverses(): UniverseRecord[];
  deleteUniverse(name: string): void;

  // Households and holdings
  createHousehold(input: HouseholdInput): HouseholdRecord;
  updateHousehold(id: number, changes: Partial<HouseholdInput>): HouseholdRecord;
  getHousehold(idOrName: number | string): HouseholdRecord | undefined;
  listHouseholds(): HouseholdRecord[];
  /** Deletes the household with its holdings, scenarios, revisions, drafts and memos. */
  deleteHousehold(id: number): void;
  /** Replaces the household's current holdings. */
  setHoldings(householdId: number, holdings: readonly Holding[]): void;
  holdings(householdId: number): Holding[];
  /** The book review's tolerance, note and last review of a household. */
  householdReview(householdId: number): HouseholdReview;
  /** Sets the tolerance and the note (undefined keeps, null clears); `reviewed` stamps the review now. */
  setHouseholdReview(
    householdId: number,
    changes: { driftTolerance?: number | null; note?: string | null; reviewed?: boolean },
  ): HouseholdReview;

  // Scenarios, revisions, drafts
  createScenario(input: { householdId: number; name: string; universe?: string }): ScenarioRecord;
  getScenario(householdId: number, name: string): ScenarioRecord | undefined;
  getScenarioById(id: number): ScenarioRecord | undefined;
  listScenarios(householdId: number): ScenarioRecord[];
  deleteScenario(id: number): void;
  /**
   * Validates `document` (`parseScenario`; errors name their JSON path) and saves it as the next
   * revision, discarding the draft. Saving a document equal to the newest revision adds nothing
   * and returns that revision.
   */
  saveRevision(scenarioId: number, document: unknown, meta: RevisionMeta): RevisionInfo;
  listRevisions(scenarioId: number): RevisionInfo[];
  /** A revision by number, or the newest when omitted. */
  getRevision(scenarioId: number, number?: number): Revision | undefined;
  getRevisionByHash(hash: string): Revision | undefined;
  compareRevisions(scenarioId: number, from: number, to: number): RevisionComparison;
  /** Saves an earlier revision's document again as the newest revision (history is kept). */
  restoreRevision(scenarioId: number, number: number, meta: { author: string; note?: string }): RevisionInfo;
  saveDraft(scenarioId: number, text: string): Draft;
  getDraft(scenarioId: number): Draft | undefined;
  discardDraft(scenarioId: number): void;

  // Results cache keyed by (revision hash, data version, kind)
  getCachedResult(revisionHash: string, dataVersion: number, kind: string): unknown;
  putCachedResult(revisionHash: string, dataVersion: number, kind: string, value: unknown): void;

  // Memos
  saveMemo(memo: MemoInput): MemoInfo;
  listMemos(scenarioId: number): MemoInfo[];
  getMemoPdf(id: number): Uint8Array | undefined;
  /** The memo printed from exactly this revision and data, for an unchanged reprint. */
  findMemo(revisionHash: string, dataVersion: number): MemoInfo | undefined;

  // Audit log (written by the methods above, in the same transaction as their change)
  auditLog(query?: AuditQuery): AuditEntry[];

  /**
   * What is damaged, each named ([] when sound): SQLite's structure and links, and every price
   * series, scenario revision and memo against its checksum (verify-store.ts).
   */
  check(): string[];
  /** Online backup (SQLite's backup API) to a new file, owner-only. */
  backup(destination: string): Promise<void>;
}

export { openStore } from './open-store.js';
export { restoreStore, type RestoreResult } from './restore.js';
export { checkStoreFile } from './check-store-file.js';
export type { StoreVerdict } from './verify-store.js';
export { StoreOpenError, CancelledError, NotFoundError } from './errors.js';
export { StorageError, type StorageProblem, type ReadOnlyReason } from './storage-error.js';
