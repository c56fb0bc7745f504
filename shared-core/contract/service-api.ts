import { z } from 'zod';
import type { ReviewRow } from '../review/review-row.js';
import type { PriceTable } from '../prices/price-table.js';
import { liquidityTags, type ScenarioInput } from '../scenario/schema.js';
import { isoDate } from '../scenario/iso-date.js';
import { DEFAULT_LOT } from '../trades/trade-list.js';
import { householdMandateSchema, NO_MANDATE } from '../scenario/household-mandate.js';
import { method } from './define.js';

/**
 * The one service API of Holdfast: every call the renderer can make of the main process.
 * Transports: IPC channel `holdfast:<name>` (src-main/shell) and `POST /api/<name>` on the local
 * web host (src-main/web-host). Implementation: src-main/service (`createService`).
 *
 * Conventions: ids are strings on the wire; dates are ISO `YYYY-MM-DD`; times are ISO 8601
 * instants; weights are fractions (0.15 = 15 %); currency amounts are plain numbers beside an
 * ISO 4217 code. JSON cannot carry NaN, so a missing price travels as `null`.
 */

// ---------------------------------------------------------------------------------------------
// Building blocks
// ---------------------------------------------------------------------------------------------

const id = z.string().min(1, 'expected an id');
const currencyCode = z.string().regex(/^[A-Z]{3}$/, 'expected an ISO 4217 code such as EUR');
const instant = z.string();
const empty = z.strictObject({});
const done = z.object({ ok: z.literal(true) });

/** Author initials on a saved revision or memo: two to four letters, as advisers sign files. */
export const initialsSchema = z
  .string()
  .trim()
  .regex(/^[A-Za-z]{2,4}$/, 'expected initials: two to four letters')
  .transform((s) => s.toUpperCase());

export const householdSchema = z.object({
  id,
  name: z.string(),
  baseCurrency: currencyCode,
  /** The firm's own client reference (free text). */
  reference: z.string(),
  notes: z.string(),
  /** The standing limits a new scenario starts from; each null while none is set. */
  mandate: householdMandateSchema,
  /** From the audit log; null for a household written before the log recorded it. */
  createdAt: instant.nullable(),
  updatedAt: instant.nullable(),
});
export type Household = z.infer<typeof householdSchema>;

/** What the advisor types to create or edit a household. */
export const householdFieldsSchema = z.strictObject({
  name: z.string().trim().min(1, 'a household needs a name').max(120, 'at most 120 characters'),
  baseCurrency: currencyCode,
  reference: z.string().trim().max(60, 'at most 60 characters').default(''),
  notes: z.string().max(4000, 'at most 4000 characters').default(''),
  mandate: householdMandateSchema.default(NO_MANDATE),
});
export type HouseholdFields = z.input<typeof householdFieldsSchema>;

export const householdSummarySchema = householdSchema.extend({
  scenarioCount: z.number().int(),
  holdingsAsOf: isoDate.nullable(),
  /** Sum of holdings in the base currency (stored exchange rates); null when a rate is missing. */
  holdingsTotal: z.number().nullable(),
});
export type HouseholdSummary = z.infer<typeof householdSummarySchema>;

export const positionSchema = z.strictObject({
  asset: id,
  /** Market value in `currency` (not units). */
  amount: z.number().finite().min(0, 'a holding amount cannot be negative'),
  currency: currencyCode,
});
export type Position = z.infer<typeof positionSchema>;

export const valuedPositionSchema = positionSchema.extend({
  /** The amount in the household's base currency at the stored exchange rate of `asOf`; null without a rate. */
  valueInBase: z.number().nullable(),
  /** Share of the total in the base currency; null when any position lacks a rate. */
  weight: z.number().nullable(),
});
export type ValuedPosition = z.infer<typeof valuedPositionSchema>;

export const holdingsSchema = z.object({
  householdId: id,
  baseCurrency: currencyCode,
  /** Date the amounts were valued; null while the household has no holdings on file. */
  asOf: isoDate.nullable(),
  positions: z.array(valuedPositionSchema),
  /** Sum in the base currency; null when a position has no exchange rate on file. */
  total: z.number().nullable(),
  /** The exchange rates used, in words ("USD to EUR 0.9132 on 2025-12-31, series FX-EURUSD"). */
  rates: z.array(z.string()),
});
export type Holdings = z.infer<typeof holdingsSchema>;

export const liquiditySchema = z.enum(liquidityTags);

export const assetSchema = z.object({
  id,
  name: z.string(),
  /** Empty when not tagged yet. */
  assetClass: z.string(),
  region: z.string(),
  /** ISO 4217 code of the prices; null until the advisor sets it. */
  currency: currencyCode.nullable(),
  liquidity: liquiditySchema,
  /** For `illiquid`: days of lock-up before a redemption can be asked for, where known. */
  lockUpDays: z.number().int().min(0).nullable(),
  notes: z.string(),
  /** Set when the series is an exchange rate: units of `quote` per one `base`. */
  fx: z.object({ base: currencyCode, quote: currencyCode }).nullable(),
});
export type Asset = z.infer<typeof assetSchema>;

export const assetEditSchema = z.strictObject({
  name: z.string().trim().min(1, 'an asset needs a display name').optional(),
  assetClass: z.string().trim().optional(),
  region: z.string().trim().optional(),
  currency: currencyCode.optional(),
  liquidity: liquiditySchema.optional(),
  lockUpDays: z.number().int().min(0).nullable().optional(),
  notes: z.string().optional(),
});

export const universeSchema = z.object({
  id,
  /** Unique; what `holdfast import --universe NAME` and scenarios refer to. */
  name: z.string(),
  description: z.string(),
  assetCount: z.number().int(),
});
export type Universe = z.infer<typeof universeSchema>;

export const universeMemberSchema = z.object({
  asset: assetSchema,
  /** Group tags of this asset in this universe (the names group bands refer to). */
  groups: z.array(z.string()),
});
export type UniverseMember = z.infer<typeof universeMemberSchema>;

// ---------------------------------------------------------------------------------------------
// Prices
// ---------------------------------------------------------------------------------------------

export const priceGapSchema = z.object({
  /** Last date with a price before the gap. */
  after: isoDate,
  /** First date with a price after the gap. */
  before: isoDate,
  /** Weekdays strictly between the two without a price. */
  missingWeekdays: z.number().int(),
});
export type PriceGap = z.infer<typeof priceGapSchema>;

export const assetCoverageSchema = z.object({
  asset: id,
  name: z.string(),
  currency: currencyCode.nullable(),
  observations: z.number().int(),
  firstDate: isoDate.nullable(),
  lastDate: isoDate.nullable(),
  /** Median weekdays from one price to the next: 1 for a daily series, about 21 for a monthly one. */
  typicalSpacingWeekdays: z.number().nullable(),
  /**
   * Runs of missing weekdays longer than the request's `minGapWeekdays` and than one and a half
   * times the usual spacing (so a monthly series is not a gap every month).
   */
  gaps: z.array(priceGapSchema),
});
export type AssetCoverage = z.infer<typeof assetCoverageSchema>;

export const coverageSchema = z.object({
  /** Earliest and latest price date over the assets asked for. */
  firstDate: isoDate.nullable(),
  lastDate: isoDate.nullable(),
  minGapWeekdays: z.number().int(),
  assets: z.array(assetCoverageSchema),
  dataVersion: z.number().int(),
});
export type Coverage = z.infer<typeof coverageSchema>;

export const priceSeriesSchema = z.object({
  asset: id,
  name: z.string(),
  currency: currencyCode.nullable(),
  dates: z.array(isoDate),
  closes: z.array(z.number()),
});
export type PriceSeries = z.infer<typeof priceSeriesSchema>;

/** `PriceTable` as JSON: columns of closes with null where the asset has no price. */
export const priceTableWireSchema = z.object({
  dates: z.array(z.string()),
  assets: z.array(z.string()),
  closes: z.array(z.array(z.number().nullable())),
  currencies: z.array(z.string().nullable()).optional(),
});
export type PriceTableWire = z.infer<typeof priceTableWireSchema>;

export function priceTableToWire(table: PriceTable): PriceTableWire {
  return {
    dates: [...table.dates],
    assets: [...table.assets],
    closes: table.closes.map((col) => Array.from(col, (v) => (Number.isFinite(v) ? v : null))),
    ...(table.currencies ? { currencies: table.currencies.map((c) => c ?? null) } : {}),
  };
}

export function priceTableFromWire(wire: PriceTableWire): PriceTable {
  return {
    dates: wire.dates,
    assets: wire.assets,
    closes: wire.closes.map((col) => Float64Array.from(col, (v) => (v === null ? Number.NaN : v))),
    ...(wire.currencies ? { currencies: wire.currencies.map((c) => c ?? undefined) } : {}),
  };
}

const dateWindow = z
  .strictObject({ from: isoDate.optional(), to: isoDate.optional() })
  .refine((w) => w.from === undefined || w.to === undefined || w.from <= w.to, {
    message: "the window's 'from' date is after its 'to' date",
  });

// ---------------------------------------------------------------------------------------------
// Imports (jobs, so progress and cancel work over IPC and HTTP alike)
// ---------------------------------------------------------------------------------------------

export const dateOrders = ['iso', 'day-first', 'month-first'] as const;

export const importSourceSchema = z.discriminatedUnion('kind', [
  /** A file on the machine that runs the service. */
  z.strictObject({ kind: z.literal('path'), path: z.string().min(1, 'expected a file path') }),
  /** The text of a file the user picked in the page. */
  z.strictObject({
    kind: z.literal('text'),
    fileName: z.string().min(1, 'expected the file name'),
    text: z.string(),
  }),
]);
export type ImportSource = z.infer<typeof importSourceSchema>;

export const importStates = [
  /** Reading and checking the file; nothing written. */
  'checking',
  /** Checked; waiting for the user to confirm (nothing written yet). */
  'ready',
  /** Dates could be read day-first or month-first: the user must choose, never a silent guess. */
  'needs-date-order',
  /** The file cannot be imported as it is; see `report.errors`. */
  'invalid',
  'applying',
  'applied',
  'cancelled',
  'failed',
] as const;
export type ImportState = (typeof importStates)[number];

export const cellProblemSchema = z.object({
  /** 1-based line of the file; null for a problem of the file as a whole. */
  line: z.number().int().nullable(),
  column: z.number().int().nullable(),
  message: z.string(),
});
export type CellProblem = z.infer<typeof cellProblemSchema>;

export const assetImportReportSchema = z.object({
  asset: z.string(),
  rows: z.number().int(),
  firstDate: isoDate.nullable(),
  lastDate: isoDate.nullable(),
  missingDays: z.number().int(),
  /** Cells left empty (a wide file's asset without a price that day). */
  emptyCells: z.number().int(),
  nonPositive: z.array(cellProblemSchema),
  /** The first unreadable cells, with line and column; `unparseableCount` counts them all. */
  unparseable: z.array(cellProblemSchema),
  unparseableCount: z.number().int(),
  repeatedDates: z.array(isoDate),
  /** One-day moves above the threshold: flagged, not rejected. */
  suspiciousMoves: z.array(z.object({ date: isoDate, move: z.number() })),
  /** Against what the store already holds (zero until the file is checked against it). */
  newDates: z.number().int(),
  changedValues: z.number().int(),
  /** The first changed closes: date, stored value, value in the file. */
  changes: z.array(z.object({ date: isoDate, stored: z.number(), incoming: z.number() })),
  isNewAsset: z.boolean(),
});
export type AssetImportReport = z.infer<typeof assetImportReportSchema>;

export const importReportSchema = z.object({
  fileName: z.string(),
  layout: z.enum(['wide', 'long']),
  delimiter: z.enum(['comma', 'semicolon', 'tab']),
  decimal: z.enum(['point', 'comma']),
  /** Null while the dates read both day-first and month-first (`dateOrderAmbiguous`). */
  dateOrder: z.enum(dateOrders).nullable(),
  dateOrderAmbiguous: z.boolean(),
  rows: z.number().int(),
  /** Problems of the file as a whole that stop the import (with line and column where known). */
  errors: z.array(cellProblemSchema),
  /** Relative one-day move above which a close is flagged for a second look. */
  suspiciousMoveThreshold: z.number(),
  assets: z.array(assetImportReportSchema),
});
export type ImportReport = z.infer<typeof importReportSchema>;

export const importJobSchema = z.object({
  jobId: id,
  fileName: z.string(),
  universe: z.string(),
  state: z.enum(importStates),
  progress: z.object({
    rows: z.number().int(),
    /** 0 to 100; of the checking pass while checking, of the writing pass while applying. */
    percent: z.number(),
  }),
  report: importReportSchema.nullable(),
  /** A sentence for the user when the state is invalid, failed or cancelled. */
  message: z.string().nullable(),
  applied: z
    .object({
      assetsAdded: z.number().int(),
      pricesAdded: z.number().int(),
      pricesChanged: z.number().int(),
    })
    .nullable(),
});
export type ImportJob = z.infer<typeof importJobSchema>;

// ---------------------------------------------------------------------------------------------
// Scenarios and their revisions
// ---------------------------------------------------------------------------------------------

/** A `holdfast-scenario@1` document as written; the service validates it with `parseScenario`. */
const scenarioDocument = z.custom<ScenarioInput>();

export const revisionSummarySchema = z.object({
  scenarioId: id,
  /** 1, 2, 3 ... in order of saving. */
  number: z.number().int(),
  /** SHA-256 of the canonical document: the key of the results cache and the memo footer. */
  hash: z.string(),
  savedAt: instant,
  author: z.string(),
  note: z.string(),
});
export type RevisionSummary = z.infer<typeof revisionSummarySchema>;

export const scenarioSummarySchema = z.object({
  id,
  householdId: id,
  name: z.string(),
  /** The universe the scenario chooses from, when it names one. */
  universe: z.string().nullable(),
  createdAt: instant,
  /** Time of the newest revision or draft. */
  updatedAt: instant,
  latestRevision: revisionSummarySchema.nullable(),
  revisionCount: z.number().int(),
  /** An autosaved draft newer than the latest revision exists. */
  hasDraft: z.boolean(),
});
export type ScenarioSummary = z.infer<typeof scenarioSummarySchema>;

export const scenarioDetailSchema = z.object({
  scenario: scenarioSummarySchema,
  /** The latest saved revision's document (null only before the first revision). */
  document: scenarioDocument.nullable(),
  /**
   * The autosaved draft: whatever the editor held, valid or not. `document` is the parsed JSON of
   * `text`, or null when the text is not JSON.
   */
  draft: z.object({ document: z.unknown(), text: z.string(), savedAt: instant }).nullable(),
});
export type ScenarioDetail = z.infer<typeof scenarioDetailSchema>;

// ---------------------------------------------------------------------------------------------
// Memos and settings
// ---------------------------------------------------------------------------------------------

export const memoSummarySchema = z.object({
  id,
  scenarioId: id,
  revisionHash: z.string(),
  dataVersion: z.number().int(),
  /** SHA-256 of the PDF bytes. */
  hash: z.string(),
  printedAt: instant,
  title: z.string(),
  bytes: z.number().int(),
  /** The memo's own hash, as its footer prints it (absent for memos printed before it was kept). */
  memoHash: z.string().optional(),
  preparedBy: z.string().optional(),
});
export type MemoSummary = z.infer<typeof memoSummarySchema>;

export const settingsSchema = z.object({
  /** Initials printed on memos and signed on revisions. */
  preparedBy: z.string().nullable(),
});
export type Settings = z.infer<typeof settingsSchema>;

// ---------------------------------------------------------------------------------------------
// The table
// ---------------------------------------------------------------------------------------------

export const serviceApi = {
  'app.info': method(
    'Version, store location, whether the store holds the invented demonstration data, its data version, the page to open first and whether the store is read-only.',
    empty,
    z.object({
      version: z.string(),
      storePath: z.string(),
      demo: z.boolean(),
      /** Increases whenever prices change: half of the results cache key. */
      dataVersion: z.number().int(),
      /** Where the app opens (the demo opens on its household's scenario). */
      startAt: z.object({ householdId: id, scenarioId: id }).nullable(),
      /** Why the store cannot be changed ("the file is read-only"), or null when it can. */
      readOnly: z.string().nullable(),
    }),
  ),
  'settings.get': method('The advisor settings kept in the store.', empty, settingsSchema),
  'settings.set': method(
    'Sets the initials printed on memos and signed on revisions.',
    z.strictObject({ preparedBy: initialsSchema.nullable() }),
    settingsSchema,
  ),

  'households.list': method(
    'Every household, by name, with its holdings date and total and its number of scenarios.',
    empty,
    z.array(householdSummarySchema),
  ),
  'households.get': method('One household.', z.strictObject({ householdId: id }), householdSummarySchema),
  'households.create': method('Creates a household.', householdFieldsSchema, householdSummarySchema),
  'households.update': method(
    "Changes a household's name, base currency, reference, notes or mandate.",
    z.strictObject({ householdId: id, fields: householdFieldsSchema }),
    householdSummarySchema,
  ),
  'holdings.get': method(
    "A household's current holdings: market values in currency, as of a date, valued in `baseCurrency` (a scenario's) or else the household's own.",
    z.strictObject({ householdId: id, baseCurrency: currencyCode.optional() }),
    holdingsSchema,
  ),
  'holdings.set': method(
    "Replaces a household's current holdings (one transaction; every asset must exist in the store).",
    z.strictObject({
      householdId: id,
      asOf: isoDate,
      positions: z.array(positionSchema).refine((ps) => new Set(ps.map((p) => p.asset)).size === ps.length, {
        message: 'an asset appears twice; give one amount per asset',
      }),
    }),
    holdingsSchema,
  ),

  'universes.list': method('Every universe with its number of assets.', empty, z.array(universeSchema)),
  'universes.get': method(
    'One universe: its assets with their descriptive tags and group tags.',
    z.strictObject({ universeId: id }),
    z.object({ universe: universeSchema, members: z.array(universeMemberSchema) }),
  ),
  'universes.setGroups': method(
    "Sets an asset's group tags within a universe.",
    z.strictObject({
      universeId: id,
      asset: id,
      groups: z.array(z.string().trim().min(1, 'a group tag cannot be empty')),
    }),
    universeMemberSchema,
  ),
  'assets.list': method('Every asset in the store.', empty, z.array(assetSchema)),
  'assets.get': method('One asset.', z.strictObject({ assetId: id }), assetSchema),
  'assets.update': method(
    "Changes an asset's descriptive tags (name, class, region, currency, liquidity, notes).",
    z.strictObject({ assetId: id, fields: assetEditSchema }),
    assetSchema,
  ),

  'prices.coverage': method(
    'Which asset has prices when: first and last date, count and gaps, per asset of a universe (or of the list given).',
    z.strictObject({
      universeId: id.optional(),
      assets: z.array(id).optional(),
      /** Weekday gaps up to this length count as holidays, not gaps (common practice: 5). */
      minGapWeekdays: z.number().int().min(1).default(5),
    }),
    coverageSchema,
  ),
  'prices.series': method(
    "One asset's stored closes, for a chart.",
    z.strictObject({ assetId: id, window: dateWindow.optional() }),
    priceSeriesSchema,
  ),
  'prices.table': method(
    'The aligned price table of a set of assets over a window (null where an asset has no price), as the shared core reads it.',
    z.strictObject({ assets: z.array(id).min(1, 'expected at least one asset'), window: dateWindow.optional() }),
    z.object({ table: priceTableWireSchema, dataVersion: z.number().int() }),
  ),

  'imports.start': method(
    'Starts checking a price file (nothing is written until `imports.confirm`); poll `imports.status`.',
    z.strictObject({
      source: importSourceSchema,
      universe: z.string().trim().min(1, 'expected the name of the universe to add the assets to'),
      /** Price currency given to assets the store does not know yet. */
      currency: currencyCode.optional(),
      suspiciousMoveThreshold: z.number().positive().optional(),
    }),
    importJobSchema,
  ),
  'imports.status': method(
    'Progress, state and validation report of an import.',
    z.strictObject({ jobId: id }),
    importJobSchema,
  ),
  'imports.confirm': method(
    'Writes a checked import in one transaction; `dateOrder` answers an ambiguous file; changed values are written only with `applyChanges`.',
    z.strictObject({
      jobId: id,
      dateOrder: z.enum(dateOrders).optional(),
      applyChanges: z.boolean().default(false),
    }),
    importJobSchema,
  ),
  'imports.history': method(
    'Price imports written to the store, newest first.',
    empty,
    z.array(
      z.object({
        id,
        source: z.string(),
        importedAt: instant,
        added: z.number().int(),
        replaced: z.number().int(),
        assets: z.number().int(),
        note: z.string(),
      }),
    ),
  ),
  'imports.cancel': method(
    'Stops an import; the store stays as it was.',
    z.strictObject({ jobId: id }),
    importJobSchema,
  ),

  'scenarios.list': method(
    "A household's scenarios with their latest revision.",
    z.strictObject({ householdId: id }),
    z.array(scenarioSummarySchema),
  ),
  'scenarios.get': method(
    'A scenario: its latest revision and its autosaved draft.',
    z.strictObject({ scenarioId: id }),
    scenarioDetailSchema,
  ),
  'scenarios.create': method(
    'Creates a scenario for a household and saves its document as revision 1.',
    z.strictObject({
      householdId: id,
      document: z.unknown(),
      universe: z.string().min(1).optional(),
      author: initialsSchema,
      note: z.string().max(2000).default(''),
    }),
    scenarioDetailSchema,
  ),
  'scenarios.saveDraft': method(
    'Autosaves what the editor holds (valid or not); replaces the previous draft.',
    z.strictObject({ scenarioId: id, document: z.unknown() }),
    z.object({ savedAt: instant }),
  ),
  'scenarios.saveRevision': method(
    'Saves a valid document as the next revision with a note and the author initials; clears the draft.',
    z.strictObject({
      scenarioId: id,
      document: z.unknown(),
      author: initialsSchema,
      note: z.string().max(2000).default(''),
    }),
    revisionSummarySchema,
  ),
  'scenarios.revisions': method(
    "A scenario's revisions, newest first.",
    z.strictObject({ scenarioId: id }),
    z.array(revisionSummarySchema),
  ),
  'scenarios.revision': method(
    'One earlier revision with its document (to open beside the current one).',
    z.strictObject({ scenarioId: id, revision: z.number().int().min(1) }),
    z.object({ revision: revisionSummarySchema, document: scenarioDocument }),
  ),
  'scenarios.compare': method(
    'What changed between two revisions, as JSON paths with the values before and after.',
    z.strictObject({ scenarioId: id, from: z.number().int().min(1), to: z.number().int().min(1) }),
    z.object({
      from: revisionSummarySchema,
      to: revisionSummarySchema,
      changes: z.array(z.object({ path: z.string(), before: z.unknown(), after: z.unknown() })),
    }),
  ),
  'scenarios.restore': method(
    'Saves an earlier revision again as the newest one (history is never rewritten).',
    z.strictObject({
      scenarioId: id,
      revision: z.number().int().min(1),
      author: initialsSchema,
      note: z.string().max(2000).default(''),
    }),
    revisionSummarySchema,
  ),

  'results.get': method(
    'A cached result for (revision hash, data version, kind), or null.',
    z.strictObject({
      revisionHash: z.string().min(1),
      dataVersion: z.number().int().min(0),
      kind: z.string().min(1).default('comparison'),
    }),
    z.object({ results: z.unknown().nullable() }),
  ),
  'results.put': method(
    'Caches a result (JSON) under (revision hash, data version, kind).',
    z.strictObject({
      revisionHash: z.string().min(1),
      dataVersion: z.number().int().min(0),
      kind: z.string().min(1).default('comparison'),
      results: z.unknown(),
    }),
    done,
  ),

  'memos.print': method(
    "Prints the allocation memo of a scenario's newest revision (stored prices, the household's holdings, the settings' initials) and keeps it in the store; the same inputs give the same bytes, and an identical memo already stored is returned instead.",
    z.strictObject({
      scenarioId: id,
      /** The memo's date (never the clock inside the PDF); today when absent. */
      date: isoDate.optional(),
      /** Trades are rounded to multiples of this amount in the base currency. */
      lot: z.number().positive().default(DEFAULT_LOT),
      /** The candidate the memo recommends; the revision's `recommended` when absent. */
      recommended: z.string().min(1).optional(),
      /** The advisor's own reasons, printed before the figures. */
      rationale: z.string().max(4000).optional(),
    }),
    z.object({ memo: memoSummarySchema, reused: z.boolean() }),
  ),
  'memos.list': method(
    'The memos printed for a scenario, newest first.',
    z.strictObject({ scenarioId: id }),
    z.array(memoSummarySchema),
  ),
  'memos.get': method(
    'A printed memo with its PDF bytes (base64), unchanged since printing.',
    z.strictObject({ memoId: id }),
    z.object({ memo: memoSummarySchema, pdfBase64: z.string() }),
  ),

  'book.review': method(
    'The book review: every household against the recommendation it follows, on the latest prices (reads the store only).',
    z.strictObject({
      /** Re-solve each recommendation on the latest prices and report how far the optimum moved. */
      resolve: z.boolean().default(false),
    }),
    z.object({ rows: z.array(z.custom<ReviewRow>()), dataVersion: z.number().int() }),
  ),
  'book.setReview': method(
    "Sets a household's drift tolerance or review note (null clears), or marks it as reviewed now.",
    z.strictObject({
      householdId: id,
      /** Sum |current - target| beyond which the household needs attention, as a fraction (0.05 = 5 %). */
      driftTolerance: z
        .number()
        .gt(0, 'the drift tolerance must be above 0 %')
        .max(2, 'the drift tolerance must be at most 200 %')
        .nullable()
        .optional(),
      note: z.string().max(2000, 'the note must be at most 2,000 characters').nullable().optional(),
      reviewed: z.boolean().optional(),
    }),
    z.object({ driftTolerance: z.number().nullable(), note: z.string().nullable(), reviewedAt: z.string().nullable() }),
  ),
} as const;

export type ServiceApiTable = typeof serviceApi;
export type ServiceMethodName = keyof ServiceApiTable;
