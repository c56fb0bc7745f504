import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { isoFromDay } from '../../../src-main/store/days.js';
import { openStore } from '../../../src-main/store/store.js';
import { holdfast } from '../import/cli-io.js';
import { useTempDir } from './temp-dir.js';

const tempDir = useTempDir();

// Park-Miller generator (Park and Miller 1988): invented, seeded prices.
function lcg(seed: number) {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

function pricesCsv(): string {
  const rnd = lcg(99);
  const ids = ['EQA', 'EQB', 'BDA', 'BDB', 'ALT'];
  const level = ids.map(() => 100);
  const lines = ['date,' + ids.join(',')];
  for (let d = 0, day = 19000; d < 400; day++) {
    if ((((day + 3) % 7) + 7) % 7 >= 5) continue;
    const common = rnd() - 0.5;
    ids.forEach((_, i) => (level[i] *= Math.exp(0.004 * (i + 1) * (rnd() - 0.5) + 0.003 * common * (i < 2 ? 1 : 0.2))));
    lines.push(`${isoFromDay(day)},${level.map((p) => p.toFixed(6)).join(',')}`);
    d++;
  }
  return lines.join('\n') + '\n';
}

const scenario = {
  format: 'holdfast-scenario@1',
  name: 'Review',
  baseCurrency: 'EUR',
  constraints: { weightBounds: { default: [0, 0.5] } },
  current: { EQA: 0.5, BDA: 0.5 },
  candidates: [
    { id: 'md-lw', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } },
    { id: 'mv-sample', estimator: { method: 'sample' }, objective: { method: 'min-variance' } },
  ],
};

const withoutTimes = (json: string) =>
  JSON.parse(json, (k, v: unknown) => (k === 'ms' ? 0 : v)) as { candidates: { id: string; status: string }[] };

describe('holdfast solve --store', () => {
  it('gives the same JSON as the file form for the same scenario and prices', async () => {
    const dir = tempDir();
    writeFileSync(join(dir, 'p.csv'), pricesCsv());
    writeFileSync(join(dir, 's.json'), JSON.stringify(scenario));
    expect(
      (await holdfast(dir, 'import', '--store', 'st.hfstore', '--prices', 'p.csv', '--universe', 'Core')).code,
    ).toBe(0);
    const store = openStore(join(dir, 'st.hfstore'));
    const h = store.createHousehold({ name: 'Invented household C', baseCurrency: 'EUR' });
    const s = store.createScenario({ householdId: h.id, name: 'Review', universe: 'Core' });
    store.saveRevision(s.id, scenario, { author: 'AB' });
    store.close();

    const file = await holdfast(dir, 'solve', '--prices', 'p.csv', '--scenario', 's.json', '--json');
    const fromStore = await holdfast(
      dir,
      'solve',
      '--store',
      'st.hfstore',
      '--household',
      'Invented household C',
      '--scenario',
      'Review',
      '--json',
    );
    expect(file.code).toBe(0);
    expect(fromStore.code).toBe(file.code);
    const a = withoutTimes(file.stdout);
    expect(a.candidates.map((c) => c.status)).toEqual(['optimal', 'optimal']);
    expect(withoutTimes(fromStore.stdout)).toEqual(a);
  });

  it('exits 2 naming the store when the household or scenario is unknown, printing nothing', async () => {
    const dir = tempDir();
    writeFileSync(join(dir, 'p.csv'), pricesCsv());
    await holdfast(dir, 'import', '--store', 'st.hfstore', '--prices', 'p.csv', '--universe', 'Core');
    const r = await holdfast(dir, 'solve', '--store', 'st.hfstore', '--household', 'Nobody', '--scenario', 'X');
    expect([r.code, r.stdout]).toEqual([2, '']);
    expect(r.stderr).toBe("holdfast solve: st.hfstore: no household named 'Nobody' in the store\n");
    const both = await holdfast(dir, 'solve', '--store', 'st.hfstore', '--prices', 'p.csv', '--scenario', 'X');
    expect(both.code).toBe(2);
    expect(both.stderr).toMatch(/needs --prices FILE.csv, or --store FILE with --household NAME/);
  });
});
