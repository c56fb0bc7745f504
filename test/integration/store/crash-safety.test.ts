import { spawn } from 'node:child_process';
import { copyFileSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { importPriceFile } from '../../../src-main/io/import-prices.js';
import { isoFromDay } from '../../../src-main/store/days.js';
import { openStore, type Store } from '../../../src-main/store/store.js';
import { compileForChild } from './compile-for-child.js';
const ASSETS = 300;

function priceFile(path: string, fromDay: number, days: number, level: number): void {
  const lines = ['date,' + Array.from({ length: ASSETS }, (_, i) => `A${i}`).join(',')];
  for (let d = 0; d < days; d++)
    lines.push(
      `${isoFromDay(fromDay + d)},` +
        Array.from({ length: ASSETS }, (_, i) => (level + i + d * 0.01).toFixed(2)).join(','),
    );
  writeFileSync(path, lines.join('\n') + '\n');
}

/** Everything an import changes, as one comparable value. */
function snapshot(store: Store) {
  const series = store.priceSeriesMany(Array.from({ length: ASSETS }, (_, i) => `A${i}`));
  return {
    dataVersion: store.dataVersion(),
    batches: store.listBatches().length,
    members: store.getUniverse('Core')?.members.length ?? 0,
    series: [...series.values()].map((s) => [s.assetId, s.dates.join(), Array.from(s.closes).join()]),
  };
}

function runChild(script: string, store: string, csv: string, point: string, killAfterMs?: number) {
  return new Promise<{ killed: boolean; stdout: string }>((resolve, reject) => {
    const child = spawn(process.execPath, [script, store, csv, point], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    let killed = false;
    const kill = () => {
      if (!killed && child.exitCode === null) {
        killed = true;
        child.kill('SIGKILL');
      }
    };
    child.stdout.on('data', (chunk) => {
      stdout += chunk;
      if (stdout.includes('AT ')) kill();
    });
    child.stderr.on('data', (chunk) => (stderr += chunk));
    if (killAfterMs !== undefined) setTimeout(kill, killAfterMs);
    child.on('error', reject);
    child.on('close', (code, signal) => {
      if (!killed && code !== 0) reject(new Error(`child failed (${code ?? signal}): ${stderr}`));
      else resolve({ killed: killed && signal === 'SIGKILL', stdout });
    });
  });
}

describe('crash safety: a child process SIGKILLed mid-import', () => {
  let child: { script: string; dir: string };
  let dir: string;
  let before: ReturnType<typeof snapshot>;
  let after: ReturnType<typeof snapshot>;

  beforeAll(async () => {
    child = compileForChild('test/integration/store/kill-child.ts');
    dir = mkdtempSync(join(tmpdir(), 'holdfast-crash-'));
    priceFile(join(dir, 'first.csv'), 20000, 200, 100);
    // The second file adds 200 dates and changes every stored close of the last 50 days.
    priceFile(join(dir, 'second.csv'), 20150, 250, 101);
    const store = openStore(join(dir, 'base.hfstore'));
    await importPriceFile(() => store, join(dir, 'first.csv'), { universe: 'Core' });
    before = snapshot(store);
    store.close();
    copyFileSync(join(dir, 'base.hfstore'), join(dir, 'full.hfstore'));
    const full = openStore(join(dir, 'full.hfstore'));
    await importPriceFile(() => full, join(dir, 'second.csv'), { universe: 'Core', apply: true });
    after = snapshot(full);
    full.close();
    expect(after).not.toEqual(before);
  });

  afterAll(() => {
    rmSync(child.dir, { recursive: true, force: true });
    rmSync(dir, { recursive: true, force: true });
  });

  const points = ['reading', 'write:1', 'write:500000', 'write:1000000'];
  for (const point of points)
    it(`leaves a sound store holding none of the import when killed at ${point}`, async () => {
      const path = join(dir, `kill-${point.replace(':', '-')}.hfstore`);
      copyFileSync(join(dir, 'base.hfstore'), path);
      const run = await runChild(child.script, path, join(dir, 'second.csv'), point);
      expect(run.killed).toBe(true);
      expect(run.stdout).toBe(`AT ${point}\n`);
      const store = openStore(path);
      expect(store.check()).toEqual([]);
      expect(snapshot(store)).toEqual(before);
      store.close();
    });

  it('without a kill the child writes all of the import', async () => {
    const path = join(dir, 'complete.hfstore');
    copyFileSync(join(dir, 'base.hfstore'), path);
    const run = await runChild(child.script, path, join(dir, 'second.csv'), 'none');
    expect(run.stdout).toBe('DONE applied\n');
    const store = openStore(path);
    expect(snapshot(store)).toEqual(after);
    store.close();
  });

  // Kills at arbitrary moments (including inside the commit): each store holds all or none.
  for (const ms of [150, 300, 450, 600, 750])
    it(`leaves all or none of the import when killed ${ms} ms after start`, async () => {
      const path = join(dir, `timed-${ms}.hfstore`);
      copyFileSync(join(dir, 'base.hfstore'), path);
      await runChild(child.script, path, join(dir, 'second.csv'), 'none', ms);
      const store = openStore(path);
      expect(store.check()).toEqual([]);
      const state = snapshot(store);
      store.close();
      expect([before, after]).toContainEqual(state);
    });
});
