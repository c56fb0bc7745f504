import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, rmSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dispatch } from '../../../shared-core/contract/dispatch.js';
import { serviceApi } from '../../../shared-core/contract/service-api.js';
import { createService } from '../../../src-main/service/index.js';
import { StorageError, openStore } from '../../../src-main/store/store.js';
import { writerNotePath } from '../../../src-main/store/writer-note.js';
import { replyStatus } from '../../../src-main/web-host/reply-status.js';
import { runCliInProcess } from '../../support/run-cli-in-process.js';
import { compileForChild } from './compile-for-child.js';
import { useTempDir } from './temp-dir.js';

const tempDir = useTempDir();
let child: { script: string; dir: string };
beforeAll(() => {
  child = compileForChild('test/integration/store/hold-child.ts');
});
afterAll(() => rmSync(child.dir, { recursive: true, force: true }));

/**
 * Starts a second process holding the store's write lock for `ms`, or with `until` until
 * `release()` is called (`ms` then bounds the hold); resolves once it holds the lock.
 */
async function holdStore(
  store: string,
  ms: number,
  activity: string,
  until?: 'released',
): Promise<{ done: Promise<number>; release: () => void }> {
  const releaseFile = `${store}.release`;
  const args = [child.script, store, String(ms), activity, ...(until ? [releaseFile] : [])];
  const proc: ChildProcess = spawn(process.execPath, args, { stdio: ['ignore', 'pipe', 'inherit'] });
  const done = new Promise<number>((resolve) => proc.on('close', (code) => resolve(code ?? -1)));
  await new Promise<void>((resolve, reject) => {
    let out = '';
    proc.stdout!.on('data', (d) => {
      out += d;
      if (out.includes('HOLDING')) resolve();
    });
    proc.on('close', () => reject(new Error(`child ended before holding the store: ${out}`)));
  });
  return { done, release: () => writeFileSync(releaseFile, '') };
}

function freshStore(): string {
  const path = join(tempDir(), 'two.hfstore');
  openStore(path).close();
  return path;
}

describe('two processes writing one store (issue 16)', () => {
  it('a write that meets another writer waits for it (BEGIN IMMEDIATE with a busy timeout) and then succeeds', async () => {
    const path = freshStore();
    const held = await holdStore(path, 800, 'an import of slow.csv');
    const store = openStore(path);
    const started = Date.now();
    const household = store.createHousehold({ name: 'Second writer', baseCurrency: 'EUR' });
    expect(Date.now() - started).toBeGreaterThan(300);
    expect(store.listHouseholds().map((h) => h.name)).toContain(household.name);
    expect(store.listHouseholds()).toHaveLength(2);
    store.close();
    expect(await held.done).toBe(0);
  });

  it('past the busy timeout the error names what holds the store and what to do, and nothing is written', async () => {
    const path = freshStore();
    const held = await holdStore(path, 30_000, 'an import of prices.csv', 'released');
    expect(existsSync(writerNotePath(path))).toBe(true);
    const store = openStore(path, { busyTimeoutMs: 300 });
    let caught: unknown;
    try {
      store.createHousehold({ name: 'Too early', baseCurrency: 'EUR' });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(StorageError);
    expect((caught as StorageError).problem).toBe('busy');
    expect((caught as Error).message).toMatch(
      /two\.hfstore: the store is busy with an import of prices\.csv \(process \d+, since \d\d:\d\d:\d\d UTC\); nothing was written\. Try again when it has finished$/,
    );

    // The app's service: code `busy`, HTTP 503, the same words; never `internal`.
    const service = createService(store);
    const reply = await dispatch(serviceApi, service, 'households.create', {
      name: 'From the app',
      baseCurrency: 'EUR',
    });
    expect(reply.ok).toBe(false);
    if (!reply.ok) {
      expect(reply.error.code).toBe('busy');
      expect(reply.error.message).toContain('busy with an import of prices.csv');
      expect(replyStatus(reply)).toBe(503);
    }
    service.dispose();
    store.close();
    held.release();
    expect(await held.done).toBe(0);
    expect(existsSync(writerNotePath(path))).toBe(false);
    const after = openStore(path);
    expect(after.listHouseholds().map((h) => h.name)).toEqual([expect.stringMatching(/^Held by \d+$/)]);
    after.close();
  });

  it('the command line says the same in one line and exits 1, with no stack trace', async () => {
    const dir = tempDir();
    const path = join(dir, 'cli.hfstore');
    openStore(path).close();
    writeFileSync(join(dir, 'p.csv'), 'date,A\n2025-01-02,10\n2025-01-03,11\n');
    const held = await holdStore(path, 30_000, 'an import of big.csv', 'released');
    const out = await runCliInProcess(
      ['import', '--store', 'cli.hfstore', '--prices', 'p.csv', '--universe', 'U', '--apply'],
      dir,
    );
    held.release();
    expect(out.code).toBe(1);
    expect(out.stderr).toMatch(
      /^holdfast import: .*cli\.hfstore: the store is busy with an import of big\.csv \(process \d+/m,
    );
    expect(out.stderr).not.toMatch(/internal|SqliteError|\n\s+at /);
    expect(await held.done).toBe(0);
  }, 20_000);

  it('a note left by a killed writer is ignored: the message does not blame a process that is gone', async () => {
    const path = freshStore();
    const held = await holdStore(path, 30_000, 'an import of live.csv', 'released');
    // What a writer killed while holding the store leaves: a note naming a process that is gone.
    writeFileSync(
      writerNotePath(path),
      JSON.stringify({ pid: 2 ** 22 + 12345, activity: 'an import of old.csv', since: '2026-01-01T00:00:00Z' }),
    );
    const store = openStore(path, { busyTimeoutMs: 200 });
    expect(() => store.createHousehold({ name: 'X', baseCurrency: 'EUR' })).toThrow(
      /the store is busy: another Holdfast window or command is writing to it; nothing was written\. Try again in a moment/,
    );
    store.close();
    held.release();
    await held.done;
  });
});
