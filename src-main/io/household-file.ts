import { z } from 'zod';
import { householdMandateSchema } from '../../shared-core/scenario/household-mandate.js';
import { InputError } from '../../shared-core/errors.js';
import { issueToInputError } from '../../shared-core/scenario/json-path.js';
import { parseJsonText } from '../../shared-core/scenario/json-text.js';
import { isIsoDate } from '../../shared-core/scenario/iso-date.js';
import { liquidityTags } from '../../shared-core/scenario/schema.js';
import { canonicalJson, sha256Hex } from '../store/canonical-json.js';
import { dayFromIso } from '../store/days.js';
import type { Store } from '../store/store.js';
import { ASSET_ID, ASSET_ID_RULE } from '../../shared-core/prices/asset-id.js';
import { priceProblem } from '../../shared-core/prices/price-value.js';

/**
 * `holdfast-household@1`: one household carried from one installation to another: the household,
 * its holdings, its scenarios with every revision and the draft, its printed memos, and the assets,
 * universes and prices they use. One JSON document; `checksum` is the sha256 of the canonical
 * JSON (canonical-json.ts) of the document without `checksum`, so a damaged or edited file is
 * refused. Revision hashes travel with their documents and are checked on import.
 */
export const HOUSEHOLD_FILE_FORMAT = 'holdfast-household@1';

const iso = z.string().refine(isIsoDate, { message: 'expected a date YYYY-MM-DD' });
const timestamp = z.string().refine((s) => !Number.isNaN(Date.parse(s)) && /^\d{4}-\d{2}-\d{2}T/.test(s), {
  message: 'expected a time such as 2026-01-05T09:00:00.000Z',
});
const currency = z.string().regex(/^[A-Z]{3}$/, 'expected an ISO 4217 code such as EUR');
const assetId = z.string().regex(ASSET_ID, ASSET_ID_RULE);
/** A close as a price file's cell must be (shared-core/prices/price-value.ts). */
const price = z.number().superRefine((value, ctx) => {
  const why = priceProblem(value);
  if (why) ctx.addIssue({ code: 'custom', message: why });
});

export const householdFileSchema = z.strictObject({
  format: z.literal(HOUSEHOLD_FILE_FORMAT),
  exportedAt: timestamp,
  household: z.strictObject({
    name: z.string().min(1),
    baseCurrency: currency,
    reference: z.string().optional(),
    notes: z.string().optional(),
    /** Since the mandate was kept with the household; a file without it has none. */
    mandate: householdMandateSchema.optional(),
  }),
  holdings: z.array(z.strictObject({ assetId, amount: z.number().finite(), currency, asOf: iso })),
  assets: z.array(
    z.strictObject({
      id: assetId,
      displayName: z.string().min(1),
      assetClass: z.string().optional(),
      region: z.string().optional(),
      currency: currency.optional(),
      liquidity: z.strictObject({ tag: z.enum(liquidityTags), lockUpDays: z.number().int().min(0).optional() }),
      notes: z.string().optional(),
      fx: z.strictObject({ base: currency, quote: currency }).optional(),
    }),
  ),
  universes: z.array(
    z.strictObject({
      name: z.string().min(1),
      description: z.string().optional(),
      members: z.array(z.strictObject({ assetId, tags: z.array(z.string()) })),
    }),
  ),
  prices: z.record(
    z.string(),
    z
      .strictObject({ dates: z.array(iso), closes: z.array(price) })
      .refine((p) => p.dates.length === p.closes.length, { message: 'as many closes as dates' }),
  ),
  scenarios: z.array(
    z.strictObject({
      name: z.string().min(1),
      universe: z.string().optional(),
      revisions: z.array(
        z.strictObject({
          number: z.number().int().positive(),
          hash: z.string().regex(/^[0-9a-f]{64}$/, 'expected a sha256 in hex'),
          savedAt: timestamp,
          author: z.string(),
          note: z.string().optional(),
          document: z.unknown(),
        }),
      ),
      draft: z.strictObject({ text: z.string(), savedAt: timestamp }).optional(),
      memos: z.array(
        z.strictObject({
          revisionHash: z.string(),
          dataVersion: z.number().int().min(0),
          printedAt: timestamp,
          title: z.string().optional(),
          sha256: z.string(),
          memoHash: z.string().optional(),
          preparedBy: z.string().optional(),
          pdfBase64: z.string(),
        }),
      ),
    }),
  ),
  checksum: z.string(),
});

export type HouseholdFile = z.infer<typeof householdFileSchema>;

/** The household file of one household of the store, as JSON text. */
export function exportHousehold(store: Store, name: string, now = new Date()): string {
  const h = store.getHousehold(name);
  if (!h) throw new InputError(`no household named '${name}'`);
  const scenarios = store.listScenarios(h.id);
  const universes = [...new Set(scenarios.flatMap((s) => (s.universe ? [s.universe] : [])))].map((u) =>
    store.getUniverse(u)!,
  );
  const used = new Set<string>(store.holdings(h.id).map((x) => x.assetId));
  for (const u of universes) for (const m of u.members) used.add(m.assetId);
  const revisions = new Map(
    scenarios.map((s) => [s.id, store.listRevisions(s.id).map((r) => store.getRevision(s.id, r.number)!)]),
  );
  for (const list of revisions.values())
    for (const r of list) for (const a of r.document.assets ?? []) if (store.getAsset(a)) used.add(a);
  // The exchange-rate series that bring these assets and holdings into the base currency travel
  // with them, or the other installation could not value or estimate them.
  const currencies = new Set<string>(store.holdings(h.id).map((x) => x.currency));
  for (const a of used) {
    const c = store.getAsset(a)?.currency;
    if (c) currencies.add(c);
  }
  for (const c of currencies) {
    if (c === h.baseCurrency) continue;
    const rate = store.fxAsset(c, h.baseCurrency) ?? store.fxAsset(h.baseCurrency, c);
    if (rate) used.add(rate.id);
  }
  const ids = [...used].sort();
  const series = store.priceSeriesMany(ids);
  const body: Omit<HouseholdFile, 'checksum'> = {
    format: HOUSEHOLD_FILE_FORMAT,
    exportedAt: now.toISOString(),
    household: {
      name: h.name,
      baseCurrency: h.baseCurrency,
      reference: h.reference,
      notes: h.notes,
      ...(h.mandate ? { mandate: h.mandate } : {}),
    },
    holdings: store.holdings(h.id),
    assets: ids.map((id) => store.getAsset(id)!),
    universes: universes.map((u) => ({ name: u.name, description: u.description, members: u.members })),
    prices: Object.fromEntries(
      ids
        .filter((id) => series.has(id))
        .map((id) => [id, { dates: series.get(id)!.dates, closes: Array.from(series.get(id)!.closes) }]),
    ),
    scenarios: scenarios.map((s) => {
      const draft = store.getDraft(s.id);
      return {
        name: s.name,
        universe: s.universe,
        revisions: revisions.get(s.id)!.map((r) => ({
          number: r.number,
          hash: r.hash,
          savedAt: r.savedAt,
          author: r.author,
          note: r.note,
          document: r.document,
        })),
        draft: draft && { text: draft.text, savedAt: draft.savedAt },
        memos: store.listMemos(s.id).map((m) => ({
          revisionHash: m.revisionHash,
          dataVersion: m.dataVersion,
          printedAt: m.printedAt,
          title: m.title,
          sha256: m.sha256,
          memoHash: m.memoHash,
          preparedBy: m.preparedBy,
          pdfBase64: Buffer.from(store.getMemoPdf(m.id)!).toString('base64'),
        })),
      };
    }),
  };
  const plain = JSON.parse(JSON.stringify(body)) as Omit<HouseholdFile, 'checksum'>;
  return JSON.stringify({ ...plain, checksum: sha256Hex(canonicalJson(plain)) }, null, 1) + '\n';
}

export interface HouseholdImportResult {
  household: string;
  scenarios: number;
  revisions: number;
  assetsAdded: number;
  pricesAdded: number;
  /** Prices the store holds already with a different close: the store's value was kept. */
  pricesKept: { assetId: string; date: string; stored: number; inFile: number }[];
}

/** Validates a household file (every error names its JSON path) and adds it to the store in one transaction. */
export function importHousehold(store: Store, text: string, file: string): HouseholdImportResult {
  let value: unknown;
  try {
    value = parseJsonText(text);
  } catch (error) {
    throw error instanceof InputError ? error.inFile(file) : error;
  }
  const parsed = householdFileSchema.safeParse(value, { reportInput: true });
  if (!parsed.success)
    throw issueToInputError(parsed.error.issues[0] as unknown as Parameters<typeof issueToInputError>[0]).inFile(file);
  const doc = parsed.data;
  const { checksum, ...rest } = value as Record<string, unknown>;
  if (sha256Hex(canonicalJson(rest)) !== checksum)
    throw new InputError('does not match the file contents: the file was damaged or edited', {
      file,
      path: 'checksum',
    });
  const at = (path: string, message: string) => new InputError(message, { file, path });
  if (store.getHousehold(doc.household.name))
    throw at('household.name', `the store has a household named '${doc.household.name}' already`);
  const inFile = new Set(doc.assets.map((a) => a.id));
  const missing = (id: string) => !inFile.has(id) && !store.getAsset(id);

  return store.transaction(() => {
    const newAssets = doc.assets.filter((a) => !store.getAsset(a.id));
    store.upsertAssets(newAssets);
    let pricesAdded = 0;
    const pricesKept: HouseholdImportResult['pricesKept'] = [];
    const prices = Object.entries(doc.prices).map(([assetId, p]) => {
      if (missing(assetId))
        throw at(`prices.${assetId}`, `prices for asset '${assetId}', which the file does not describe`);
      const stored = store.priceSeries(assetId);
      const have = new Map(stored ? stored.dates.map((d, i) => [d, stored.closes[i]]) : []);
      const dates: string[] = [];
      const closes: number[] = [];
      p.dates.forEach((d, i) => {
        const old = have.get(d);
        if (old === undefined) {
          dates.push(d);
          closes.push(p.closes[i]);
        } else if (old !== p.closes[i]) pricesKept.push({ assetId, date: d, stored: old, inFile: p.closes[i] });
      });
      const order = dates.map((_, i) => i).sort((a, b) => dayFromIso(dates[a]) - dayFromIso(dates[b]));
      pricesAdded += dates.length;
      return { assetId, dates: order.map((i) => dates[i]), closes: order.map((i) => closes[i]) };
    });
    if (pricesAdded > 0)
      store.commitPrices({
        source: `${file} (household ${doc.household.name})`,
        assets: [],
        prices: prices.filter((p) => p.dates.length),
      });
    doc.universes.forEach((u, i) => {
      u.members.forEach((m, j) => {
        if (missing(m.assetId)) throw at(`universes[${i}].members[${j}].assetId`, `unknown asset '${m.assetId}'`);
      });
      const old = store.getUniverse(u.name);
      const members = new Map((old?.members ?? []).map((m) => [m.assetId, m]));
      for (const m of u.members) if (!members.has(m.assetId)) members.set(m.assetId, m);
      store.saveUniverse(u.name, [...members.values()], old?.description ?? u.description);
    });
    const h = store.createHousehold(doc.household);
    store.setHoldings(h.id, doc.holdings);
    let revisions = 0;
    doc.scenarios.forEach((s, i) => {
      const scenario = store.createScenario({ householdId: h.id, name: s.name, universe: s.universe });
      s.revisions.forEach((r, j) => {
        const saved = store.saveRevision(scenario.id, r.document, {
          author: r.author,
          note: r.note,
          savedAt: r.savedAt,
        });
        if (saved.hash !== r.hash)
          throw at(
            `scenarios[${i}].revisions[${j}].hash`,
            'does not match the revision document (sha256 of its canonical JSON)',
          );
        revisions++;
      });
      if (s.draft) store.saveDraft(scenario.id, s.draft.text);
      s.memos.forEach((m, j) => {
        const pdf = Buffer.from(m.pdfBase64, 'base64');
        if (sha256Hex(pdf) !== m.sha256)
          throw at(`scenarios[${i}].memos[${j}].sha256`, 'does not match the memo bytes');
        store.saveMemo({
          scenarioId: scenario.id,
          revisionHash: m.revisionHash,
          dataVersion: m.dataVersion,
          pdf,
          title: m.title,
          printedAt: m.printedAt,
          ...(m.memoHash !== undefined ? { memoHash: m.memoHash } : {}),
          ...(m.preparedBy !== undefined ? { preparedBy: m.preparedBy } : {}),
        });
      });
    });
    return {
      household: h.name,
      scenarios: doc.scenarios.length,
      revisions,
      assetsAdded: newAssets.length,
      pricesAdded,
      pricesKept,
    };
  }, `an import of the household file ${file}`);
}
