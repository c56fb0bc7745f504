import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dispatch } from '../../../shared-core/contract/dispatch.js';
import { serviceApi, type Holdings } from '../../../shared-core/contract/service-api.js';
import type { ScenarioInput } from '../../../shared-core/scenario/schema.js';
import { isSolved } from '../../../shared-core/optimise/result.js';
import { DEFAULT_LOT } from '../../../shared-core/trades/trade-list.js';
import { memoFromStore } from '../../../src-main/app/memo.js';
import { createDemoStore } from '../../../src-main/demo/create-demo-store.js';
import { buildView } from '../../../src-main/memo/memo-view.js';
import { createService, type Service } from '../../../src-main/service/index.js';
import { openStore, type Store } from '../../../src-main/store/store.js';
import { tradesFromHoldings } from '../../../src-renderer/scenario/trade-list.js';

// The screen's trade list (TradeListView: the holdings the page reads through the service, then
// tradesFromHoldings) and the memo's trades table (buildView) are one list: on the invented
// demonstration store, with its US-dollar holding valued at the stored rate, they are equal row
// for row, rounded to the same lot.
describe('one trade list on the screen and in the memo', () => {
  let dir: string;
  let store: Store;
  let service: Service;
  let householdId: number;
  let scenarioId: number;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'holdfast-trades-'));
    const demo = await createDemoStore(join(dir, 'demo.sqlite'));
    store = openStore(demo.path, { create: false });
    service = createService(store, { settingsPath: join(dir, 'settings.json'), demo: true });
    ({ householdId, scenarioId } = demo);
  }, 120_000);
  afterAll(() => {
    service?.dispose();
    store?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('gives the same rows, totals and rounding cash for the recommended candidate', async () => {
    const household = store.getHousehold(householdId)!;
    const scenario = store.getScenarioById(scenarioId)!;
    const memo = await memoFromStore(store, 'demo.sqlite', household.name, scenario.name, {
      date: '2026-01-15',
      lot: DEFAULT_LOT,
      preparedBy: 'QA',
    });
    const view = buildView(memo.input);
    const got = await dispatch(serviceApi, service, 'holdings.get', { householdId: String(householdId) });
    if (!got.ok) throw new Error(got.error.message);
    const recommended = memo.input.run.candidates.find((c) => c.id === memo.input.recommended)!;
    if (!isSolved(recommended)) throw new Error('the demo recommendation is solved');
    const screen = tradesFromHoldings(recommended.weights, got.result as Holdings);
    if (!screen.ok) throw new Error(screen.reason);

    expect(view.trades).not.toBeNull();
    expect(screen.plan).toEqual(view.trades);
    expect(screen.currency).toBe(memo.input.household.baseCurrency);

    // Lot rounding on both: every trade is whole lots, or a full sale to the last unit.
    const plan = screen.plan;
    expect(plan.lot).toBe(1000);
    expect(plan.rows.filter((r) => r.trade !== 0).length).toBeGreaterThan(3);
    for (const r of plan.rows) if (r.after !== 0) expect(Math.abs(r.trade % 1000)).toBe(0);
    expect(plan.residual).toBe(plan.sells - plan.buys);
    // ... and the rounding moved some trade away from the exact one (target - held).
    expect(plan.rows.some((r) => r.after !== 0 && Math.abs(r.trade - (r.target - r.current)) >= 1)).toBe(true);
  }, 120_000);

  it("is told in the scenario's base currency when it differs from the household's", async () => {
    // The demo household keeps euro; the same scenario saved in US dollars. The page asks for the
    // holdings in the scenario's currency (ScenarioPage), as the memo values them.
    const household = store.getHousehold(householdId)!;
    const document = store.getRevision(scenarioId)!.document as ScenarioInput;
    const record = store.createScenario({ householdId, name: 'In dollars' });
    store.saveRevision(record.id, { ...document, name: 'In dollars', baseCurrency: 'USD' }, { author: 'QA' });
    const memo = await memoFromStore(store, 'demo.sqlite', household.name, 'In dollars', {
      date: '2026-01-15',
      lot: DEFAULT_LOT,
      preparedBy: 'QA',
    });
    const view = buildView(memo.input);
    const got = await dispatch(serviceApi, service, 'holdings.get', {
      householdId: String(householdId),
      baseCurrency: 'USD',
    });
    if (!got.ok) throw new Error(got.error.message);
    const recommended = memo.input.run.candidates.find((c) => c.id === memo.input.recommended)!;
    if (!isSolved(recommended)) throw new Error('the demo recommendation is solved');
    const screen = tradesFromHoldings(recommended.weights, got.result as Holdings);
    if (!screen.ok) throw new Error(screen.reason);
    expect(screen.currency).toBe('USD');
    expect(screen.plan).toEqual(view.trades);
    // In the household's own currency the totals differ: the question the page must not mix up.
    const euro = await dispatch(serviceApi, service, 'holdings.get', { householdId: String(householdId) });
    if (!euro.ok) throw new Error(euro.error.message);
    expect((euro.result as Holdings).baseCurrency).toBe('EUR');
    expect((euro.result as Holdings).total).not.toBeCloseTo((got.result as Holdings).total!, 0);
  }, 120_000);
});
