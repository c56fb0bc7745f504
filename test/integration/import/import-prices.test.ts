import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { importPriceFile, type ImportProgress } from '../../../src-main/io/import-prices.js';
import { isoFromDay } from '../../../src-main/store/days.js';
import { openStore } from '../../../src-main/store/store.js';
import { useTempDir } from '../store/temp-dir.js';

const tempDir = useTempDir();

function wideFile(dir: string, assets: number, days: number): string {
  const lines = ['date,' + Array.from({ length: assets }, (_, i) => `A${i}`).join(',')];
  for (let d = 0; d < days; d++)
    lines.push(`${isoFromDay(20000 + d)},` + Array.from({ length: assets }, (_, i) => 10 + i + d / 100).join(','));
  const path = join(dir, 'wide.csv');
  writeFileSync(path, lines.join('\n') + '\n');
  return path;
}

describe('importPriceFile: progress and cancellation', () => {
  it('reports progress in rows and percent, rising to 100 across reading and writing', async () => {
    const dir = tempDir();
    const store = openStore(join(dir, 's.hfstore'));
    const seen: ImportProgress[] = [];
    const outcome = await importPriceFile(() => store, wideFile(dir, 120, 3000), {
      universe: 'U',
      onProgress: (p) => seen.push(p),
    });
    expect(outcome.status).toBe('applied');
    expect(seen.some((p) => p.phase === 'reading' && p.percent < 90)).toBe(true);
    expect(seen.at(-1)).toEqual({ phase: 'writing', rows: 3000, percent: 100 });
    for (let i = 1; i < seen.length; i++) expect(seen[i].percent).toBeGreaterThanOrEqual(seen[i - 1].percent);
    store.close();
  });

  it('leaves the store as it was when cancelled while writing', async () => {
    const dir = tempDir();
    const store = openStore(join(dir, 's.hfstore'));
    const controller = new AbortController();
    await expect(
      importPriceFile(() => store, wideFile(dir, 40, 300), {
        universe: 'U',
        signal: controller.signal,
        onProgress: (p) => p.phase === 'writing' && p.percent > 95 && controller.abort(),
      }),
    ).rejects.toThrow(/cancelled; nothing was written/);
    expect(store.listAssets()).toEqual([]);
    expect(store.listUniverses()).toEqual([]);
    expect(store.dataVersion()).toBe(0);
    expect(store.check()).toEqual([]);
    store.close();
  });
});
