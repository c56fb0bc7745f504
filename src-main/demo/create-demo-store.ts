import { existsSync, mkdtempSync, renameSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import {
  DEMO_FILE_NAMES,
  DEMO_FX_ID,
  DEMO_NOTICE,
  DEMO_SCENARIO_NAME,
  DEMO_UNIVERSE_NAME,
} from '../../shared-core/demo/index.js';
import { demoGroups } from '../../shared-core/demo/scenario.js';
import { InputError } from '../../shared-core/errors.js';
import { importPriceFile, type PriceImportOutcome } from '../io/import-prices.js';
import { openStore, type Store } from '../store/store.js';
import { writeDemoFiles } from './write-demo-files.js';

export const DEMO_FX_UNIVERSE = 'Exchange rates (invented)';
/** Initials on the demo's saved revision: the invented demonstration, not a real adviser. */
export const DEMO_AUTHOR = 'DEMO';

export interface DemoStore {
  path: string;
  householdId: number;
  scenarioId: number;
}

/**
 * Creates a store holding the invented demonstration household the way a user would build one:
 * `holdfast demo` files, the real price import (validation, batch, universe) for the prices and
 * the FX series, then the tags, the household with its holdings and the scenario as revision 1.
 * Built under a temporary name and renamed at the end, so a crash never leaves half a demo store.
 */
export async function createDemoStore(
  path: string,
  options: { seed?: number; now?: () => Date } = {},
): Promise<DemoStore> {
  const full = resolve(path);
  if (existsSync(full))
    throw new InputError('already exists; the demo store is created only where there is none', { file: path });
  const filesDir = mkdtempSync(join(tmpdir(), 'holdfast-demo-files-'));
  const building = join(dirname(full), `.${Date.now()}.demo-building`);
  let store: Store | undefined;
  try {
    const { data } = writeDemoFiles(filesDir, { seed: options.seed });
    const open = () => (store ??= openStore(building, { create: true, now: options.now }));
    const expectApplied = (outcome: PriceImportOutcome, file: string) => {
      if (outcome.status === 'applied') return;
      const report = outcome.report as { problems?: unknown[]; assets?: { asset: string; ok: boolean }[] };
      const bad = (report.assets ?? []).filter((a) => !a.ok);
      throw new Error(
        `demo import of ${file} ended '${outcome.status}': ` +
          JSON.stringify({ problems: report.problems, assets: bad }).slice(0, 1200),
      );
    };
    expectApplied(
      await importPriceFile(open, join(filesDir, DEMO_FILE_NAMES.prices), {
        file: DEMO_FILE_NAMES.prices,
        universe: DEMO_UNIVERSE_NAME,
        currency: 'EUR',
        note: DEMO_NOTICE,
      }),
      DEMO_FILE_NAMES.prices,
    );
    expectApplied(
      await importPriceFile(open, join(filesDir, DEMO_FILE_NAMES.fx), {
        file: DEMO_FILE_NAMES.fx,
        universe: DEMO_FX_UNIVERSE,
        currency: 'EUR',
        note: DEMO_NOTICE,
      }),
      DEMO_FILE_NAMES.fx,
    );
    const s = open();
    const householdId = s.transaction(() => {
      s.upsertAssets([
        ...data.assets.map((a) => ({
          id: a.id,
          displayName: a.name,
          assetClass: a.assetClass,
          region: a.region,
          currency: a.currency,
          liquidity: { tag: a.liquidity, ...(a.lockUpDays !== undefined ? { lockUpDays: a.lockUpDays } : {}) },
          notes: a.notes ?? 'Invented demonstration fund.',
        })),
        {
          id: DEMO_FX_ID,
          displayName: 'US dollar in euro (invented series)',
          currency: 'EUR',
          liquidity: { tag: 'daily' as const },
          fx: { base: 'USD', quote: 'EUR' },
          notes: 'Invented demonstration exchange rate: euro per one US dollar.',
        },
      ]);
      const groupOf = (assetClass: string) =>
        Object.entries(demoGroups).find(([, classes]) => (classes as readonly string[]).includes(assetClass))?.[0];
      s.saveUniverse(
        DEMO_UNIVERSE_NAME,
        data.assets.map((a) => ({
          assetId: a.id,
          tags: [a.assetClass, a.region, ...(groupOf(a.assetClass) ? [groupOf(a.assetClass)!] : [])],
        })),
        'Invented demonstration universe: made-up funds and one made-up listed company.',
      );
      const household = s.createHousehold({
        name: data.household.name,
        baseCurrency: data.household.baseCurrency,
        reference: data.household.reference,
        notes: `${data.household.notes} ${DEMO_NOTICE}`,
      });
      s.setHoldings(
        household.id,
        data.holdings.map((h) => ({
          assetId: h.asset,
          amount: h.amount,
          currency: h.currency,
          asOf: data.household.asOf,
        })),
      );
      return household.id;
    });
    const scenario = s.createScenario({ householdId, name: DEMO_SCENARIO_NAME, universe: DEMO_UNIVERSE_NAME });
    s.saveRevision(scenario.id, data.scenario, { author: DEMO_AUTHOR, note: 'Invented demonstration scenario.' });
    s.close();
    store = undefined;
    renameSync(building, full);
    return { path: full, householdId, scenarioId: scenario.id };
  } finally {
    (store as Store | undefined)?.close();
    for (const suffix of ['', '-wal', '-shm']) rmSync(`${building}${suffix}`, { force: true });
    rmSync(filesDir, { recursive: true, force: true });
  }
}
