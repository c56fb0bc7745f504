import Database from 'better-sqlite3';
import { spawnSync } from 'node:child_process';
import { chmodSync, chownSync, mkdirSync, readdirSync, rmSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openStore } from '../../../src-main/store/store.js';
import { compileForChild } from './compile-for-child.js';
import { useTempDir } from './temp-dir.js';

/**
 * A store this user may read but not write (issue 16). Everything here runs as root, which may
 * write anything, so the child runs as `nobody` through runuser; where that is impossible (not
 * root, no runuser) the suite fails in CI and is skipped elsewhere with one loud line.
 */
const nobody = Number(spawnSync('id', ['-u', 'nobody'], { encoding: 'utf8' }).stdout.trim());
const canSwitchUser =
  process.getuid?.() === 0 && Number.isInteger(nobody) && spawnSync('runuser', ['--help']).status === 0;
if (!canSwitchUser && process.env.CI !== 'true')
  console.warn('read-only store tests SKIPPED: they need root and runuser to act as another user');

const tempDir = useTempDir();
let child: { script: string; dir: string };
beforeAll(() => {
  if (!canSwitchUser) return;
  child = compileForChild('test/integration/store/as-user-child.ts');
  chmodTree(child.dir);
});
afterAll(() => child && rmSync(child.dir, { recursive: true, force: true }));

function chmodTree(dir: string): void {
  chmodSync(dir, 0o755);
  for (const entry of readdirSync(dir, { withFileTypes: true }))
    if (entry.isDirectory()) chmodTree(join(dir, entry.name));
    else if (!entry.isSymbolicLink()) chmodSync(join(dir, entry.name), 0o644);
}

function asNobody(store: string): Record<string, unknown> {
  const r = spawnSync('runuser', ['-u', 'nobody', '--', process.execPath, child.script, store], { encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`child failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as Record<string, unknown>;
}

/** A store with one household in a folder of its own, both owned by `nobody` unless told otherwise. */
function storeIn(folderOwner: number): { dir: string; path: string } {
  const dir = join(tempDir(), 'folder');
  mkdirSync(dir);
  chmodSync(join(dir, '..'), 0o755);
  const path = join(dir, 'shared.hfstore');
  const store = openStore(path);
  store.createHousehold({ name: 'Existing', baseCurrency: 'EUR' });
  store.close();
  chownSync(dir, folderOwner, 0);
  chownSync(path, nobody, 0);
  return { dir, path };
}

describe.runIf(canSwitchUser || process.env.CI === 'true')('a store this user cannot write (issue 16)', () => {
  it('a read-only file opens read-only: it reads, a write is refused naming the file and what to do, and no -wal or -shm is left', () => {
    const { dir, path } = storeIn(nobody);
    chmodSync(path, 0o444);
    const r = asNobody(path);
    expect(r.readOnly).toEqual({ file: path, why: 'the file is read-only' });
    expect(r.households).toBe(1);
    expect(r.write).toEqual({
      problem: 'read-only',
      message: `${path}: the store is read-only (the file is read-only); Holdfast can show it but not change it, and nothing was written. To save changes, make the file and its folder writable (for example chmod u+w on both) and try again`,
    });
    expect(readdirSync(dir)).toEqual(['shared.hfstore']);
    // Once the user makes it writable, the next write works.
    chmodSync(path, 0o644);
    expect(asNobody(path).write).toBe('ok');
  });

  it('a writable file in a read-only folder is read-only too (SQLite keeps its -wal and -shm beside the store)', () => {
    const { dir, path } = storeIn(0);
    chmodSync(dir, 0o755);
    const r = asNobody(path);
    expect(r.readOnly).toEqual({
      file: path,
      why: `its folder ${dir} is read-only, and SQLite keeps two files beside the store`,
    });
    expect(r.households).toBe(1);
    expect((r.write as { problem: string }).problem).toBe('read-only');
    expect(readdirSync(dir)).toEqual(['shared.hfstore']);
  });

  it('a read-only -shm left by an earlier read-only session no longer blocks writes once the store is writable', () => {
    const { dir, path } = storeIn(nobody);
    chmodSync(path, 0o444);
    // What a read-only session used to leave: SQLite creates the -shm with the store's mode (0444).
    const r = spawnSync(
      'runuser',
      [
        '-u',
        'nobody',
        '--',
        process.execPath,
        '-e',
        `const D = require(${JSON.stringify(require.resolve('better-sqlite3'))}); const db = new D(${JSON.stringify(path)}); db.prepare('SELECT count(*) FROM households').get(); db.close();`,
      ],
      { encoding: 'utf8' },
    );
    expect(r.status, r.stderr).toBe(0);
    expect(statSync(`${path}-shm`).mode & 0o777).toBe(0o444);
    chmodSync(path, 0o644);
    expect(asNobody(path).write).toBe('ok');
    const store = new Database(path, { readonly: true });
    expect((store.prepare('SELECT count(*) AS n FROM households').get() as { n: number }).n).toBe(2);
    store.close();
    expect(readdirSync(dir).every((f) => !f.endsWith('-shm') || (statSync(join(dir, f)).mode & 0o200) !== 0)).toBe(
      true,
    );
  });
});
