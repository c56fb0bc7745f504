import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { ScenarioInput } from '../../../shared-core/scenario/schema.js';
import { createDemoStore } from '../../../src-main/demo/create-demo-store.js';
import { sha256Hex } from '../../../src-main/store/canonical-json.js';
import { openStore } from '../../../src-main/store/store.js';
import { printMemo } from '../../../src-main/service/print-memo.js';
import { holdfast } from '../import/cli-io.js';
import { flatText } from '../memo/poppler.js';
import { useTempDir } from './temp-dir.js';

const tempDir = useTempDir();

/**
 * Issue 15, disagreement 3: a scenario computes in its own base currency. The invented demo
 * household keeps euro; its scenario saved again in US dollars is solved by `solve --store` in
 * dollars, and the memo (command line and app) must compute it the same way. The memo used to
 * fetch rates in the household's currency and refused the scenario ("EQ-GLB is priced in EUR but
 * there is no EUR rate series in USD").
 */
async function dollarScenario(dir: string) {
  const path = join(dir, 'demo.hfstore');
  const demo = await createDemoStore(path);
  const store = openStore(path);
  const document = store.getRevision(demo.scenarioId)!.document as ScenarioInput;
  const record = store.createScenario({ householdId: demo.householdId, name: 'In dollars' });
  store.saveRevision(record.id, { ...document, name: 'In dollars', baseCurrency: 'USD' }, { author: 'DEMO' });
  const household = store.getHousehold(demo.householdId)!;
  store.close();
  return { path, household: household.name };
}

describe("a scenario in another currency than its household's", () => {
  it('the memo computes in the scenario base currency, as solve --store does, the same from the command line and the app', async () => {
    const dir = tempDir();
    const { path, household } = await dollarScenario(dir);
    const where = ['--store', 'demo.hfstore', '--household', household, '--scenario', 'In dollars'];
    const solved = await holdfast(dir, 'solve', ...where, '--json');
    expect(solved.code, solved.stderr).toBe(0);

    const memo = await holdfast(dir, 'memo', ...where, '--out', 'm.pdf', '--date', '2026-01-15', '--prepared-by', 'AB');
    expect(memo.code, memo.stderr).toBe(0);
    const pdf = readFileSync(join(dir, 'm.pdf'));
    const text = flatText(pdf);
    expect(text).toContain('converted to USD');

    const store = openStore(path);
    try {
      const h = store.getHousehold(household)!;
      const printed = await printMemo(store, h, store.getScenario(h.id, 'In dollars')!, {
        date: '2026-01-15',
        lot: 1000,
        preparedBy: 'AB',
      });
      // One memo workflow: the app's print is the command line's memo, byte for byte.
      expect(printed.reused).toBe(true);
      expect(printed.memo.hash).toBe(sha256Hex(pdf));
    } finally {
      store.close();
    }
  });
});
