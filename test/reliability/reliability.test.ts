import { spawn, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import {
  chmodSync,
  chownSync,
  copyFileSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  readdirSync,
  rmSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createDemoStore } from '../../src-main/demo/create-demo-store.js';
import { contentDigest } from '../../src-main/store/backup-digest.js';
import { isoFromDay } from '../../src-main/store/days.js';
import { openDatabase, openReadOnly } from '../../src-main/store/open-database.js';
import { guardStorage } from '../../src-main/store/guard-storage.js';
import { SqliteStore } from '../../src-main/store/sqlite-store.js';
import { StorageError, checkStoreFile, openStore } from '../../src-main/store/store.js';
import {
  Tally,
  canSwitchUser,
  cliBuilt,
  holdfast,
  holdfastKilledAfter,
  inParallel,
  looksCrashed,
  type Run,
} from './harness.js';

/**
 * The reliability suite (issue 16): what a user's machine does to a store, tried as a user
 * would: SIGKILLs in the middle of imports and restores, two writers at once for 30 s, damaged
 * backups, a read-only store, a full disk, and malformed price, scenario and household files
 * through every command. Each attempt ends completed (or interrupted with the store whole),
 * refused cleanly (exit 2 for bad input or 1 for storage, a one-line message naming the file,
 * nothing written), crashed (a stack trace, an internal error, an unexpected exit) or lost (a
 * store that fails its check, holds half a change, or lacks what was acknowledged). It prints
 * the counts; crashed and lost must both be 0.
 */
const tallies = new Map<string, Tally>();
const tally = (name: string) => tallies.get(name) ?? (tallies.set(name, new Tally()), tallies.get(name)!);

let work: string;
beforeAll(() => {
  if (!cliBuilt) throw new Error('dist/ is not built: run npm run build (npm test does) before this suite');
  work = mkdtempSync(join(tmpdir(), 'holdfast-reliability-'));
  chmodSync(work, 0o755);
});
afterAll(() => {
  const total = new Tally();
  for (const [name, t] of tallies) {
    console.log(t.line(name));
    for (const k of Object.keys(total.counts) as (keyof Tally['counts'])[]) total.counts[k] += t.counts[k];
    total.failures.push(...t.failures);
  }
  console.log(total.line('reliability suite, all'));
  for (const f of total.failures) console.log(`  ${f}`);
  rmSync(work, { recursive: true, force: true });
});

function folder(name: string): string {
  const dir = join(work, name);
  mkdirSync(dir, { recursive: true });
  return dir;
}

/** A wide price file of `assets` x `days` weekdays from `fromDay`, closes moved by `level`. */
function priceFile(path: string, assets: number, fromDay: number, days: number, level: number): void {
  const lines = ['date,' + Array.from({ length: assets }, (_, i) => `A${i}`).join(',')];
  for (let d = 0; d < days; d++)
    lines.push(
      `${isoFromDay(fromDay + d)},` +
        Array.from({ length: assets }, (_, i) => (level + i + d * 0.01).toFixed(2)).join(','),
    );
  writeFileSync(path, lines.join('\n') + '\n');
}

/** What an import changes, read without writing: every series' values, the batches, the universe. */
function pricesState(path: string): string {
  const db = openReadOnly(path);
  try {
    const hash = createHash('sha256');
    for (const r of db
      .prepare('SELECT asset_id, days, closes, batches FROM price_series ORDER BY asset_id')
      .raw()
      .all() as [string, Buffer, Buffer, Buffer][])
      hash.update(r[0]).update(r[1]).update(r[2]).update(r[3]);
    hash.update(String(db.prepare('SELECT count(*) FROM import_batches').pluck().get()));
    hash.update(String(db.prepare('SELECT count(*) FROM universe_members').pluck().get()));
    return hash.digest('hex');
  } finally {
    db.close();
  }
}

/** Every row of the store (less a backup's seal), read without writing. */
function content(path: string): string {
  const db = openReadOnly(path);
  try {
    return contentDigest(db);
  } finally {
    db.close();
  }
}

const sound = (path: string) => existsSync(path) && checkStoreFile(path).problems.length === 0;

/** Classifies a run that should have been refused: `code` and a message naming one of `names`. */
function refusal(run: Run, code: number, ...names: string[]): 'refused' | 'crashed' {
  if (looksCrashed(run) || run.signal !== null) return 'crashed';
  return run.code === code && names.some((n) => run.stderr.includes(n)) ? 'refused' : 'crashed';
}

describe.runIf(cliBuilt)('reliability (issue 16)', () => {
  it('10 SIGKILLs during an import: each store is sound and holds all of the import or none', async () => {
    const t = tally('SIGKILL during import');
    const dir = folder('kill-import');
    priceFile(join(dir, 'first.csv'), 300, 20000, 300, 100);
    priceFile(join(dir, 'second.csv'), 300, 20200, 400, 101);
    const base = join(dir, 'base.hfstore');
    expect((await holdfast(['import', '--store', base, '--prices', 'first.csv', '--universe', 'Core'], dir)).code).toBe(
      0,
    );
    const full = join(dir, 'full.hfstore');
    copyFileSync(base, full);
    const started = Date.now();
    const complete = await holdfast(
      ['import', '--store', full, '--prices', 'second.csv', '--universe', 'Core', '--apply'],
      dir,
    );
    const duration = Date.now() - started;
    expect(complete.code, complete.stderr).toBe(0);
    const before = pricesState(base);
    const after = pricesState(full);
    expect(after).not.toBe(before);
    for (let i = 1; i <= 10; i++) {
      const path = join(dir, `kill-${i}.hfstore`);
      copyFileSync(base, path);
      const run = await holdfastKilledAfter(
        ['import', '--store', path, '--prices', 'second.csv', '--universe', 'Core', '--apply'],
        dir,
        Math.round((duration * i) / 11),
      );
      const state = sound(path) ? pricesState(path) : 'unsound';
      if (state !== before && state !== after) t.add('lost', `import killed at ${i}/11 of ${duration} ms: ${state}`);
      else if (!run.killed && (run.code !== 0 || looksCrashed(run))) t.add('crashed', `import ${i}: ${run.stderr}`);
      else t.add('completed', `import killed at ${i}/11`);
    }
    expect(t.failures).toEqual([]);
  }, 120_000);

  it('10 SIGKILLs during a restore: the store is always the old one or the backup, whole', async () => {
    const t = tally('SIGKILL during restore');
    const dir = folder('kill-restore');
    priceFile(join(dir, 'big.csv'), 200, 18000, 2500, 50);
    priceFile(join(dir, 'small.csv'), 5, 20000, 20, 10);
    const source = join(dir, 'source.hfstore');
    expect((await holdfast(['import', '--store', source, '--prices', 'big.csv', '--universe', 'Core'], dir)).code).toBe(
      0,
    );
    expect((await holdfast(['backup', '--store', source, '--out', 'b.hfstore'], dir)).code).toBe(0);
    const old = join(dir, 'old.hfstore');
    expect((await holdfast(['import', '--store', old, '--prices', 'small.csv', '--universe', 'Core'], dir)).code).toBe(
      0,
    );
    const oldState = content(old);
    const newState = content(join(dir, 'b.hfstore'));
    const trial = join(dir, 'trial.hfstore');
    copyFileSync(old, trial);
    const started = Date.now();
    expect((await holdfast(['restore', '--from', 'b.hfstore', '--store', trial], dir)).code).toBe(0);
    const duration = Date.now() - started;
    expect(content(trial)).toBe(newState);
    for (let i = 1; i <= 10; i++) {
      const sub = folder(`kill-restore/${i}`);
      const path = join(sub, 'store.hfstore');
      copyFileSync(old, path);
      const run = await holdfastKilledAfter(
        ['restore', '--from', join(dir, 'b.hfstore'), '--store', path],
        sub,
        Math.round((duration * i) / 11),
      );
      const state = sound(path) ? content(path) : 'unsound or missing';
      if (state !== oldState && state !== newState)
        t.add('lost', `restore killed at ${i}/11 of ${duration} ms: ${state}`);
      else if (!run.killed && (run.code !== 0 || looksCrashed(run))) t.add('crashed', `restore ${i}: ${run.stderr}`);
      else t.add('completed', `restore killed at ${i}/11`);
    }
    expect(t.failures).toEqual([]);
  }, 120_000);

  it('two writers for 30 s: the app edits while imports run; every acknowledged change is kept, none fails as internal', async () => {
    const t = tally('two writers, 30 s');
    const dir = folder('two-writers');
    priceFile(join(dir, 'a.csv'), 300, 20000, 500, 100);
    priceFile(join(dir, 'b.csv'), 300, 20000, 500, 102);
    const store = join(dir, 's.hfstore');
    expect((await holdfast(['import', '--store', store, '--prices', 'a.csv', '--universe', 'Core'], dir)).code).toBe(0);
    const serve = spawn(process.execPath, [cliPath(), 'serve', '--store', store], {
      cwd: dir,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let served = '';
    serve.stdout.on('data', (d) => (served += d));
    const url = await new Promise<URL>((resolve, reject) => {
      const timer = setInterval(() => {
        const m = /Open (http:\/\/127\.0\.0\.1:\d+\/#token=(\S+))/.exec(served);
        if (m) {
          clearInterval(timer);
          resolve(new URL(m[1]));
        }
      }, 50);
      serve.on('close', () => reject(new Error(`serve ended: ${served}`)));
    });
    const token = url.hash.slice('#token='.length);
    const call = async (method: string, body: unknown) => {
      const r = await fetch(`${url.origin}/api/${method}`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
        body: JSON.stringify(body),
      });
      return {
        status: r.status,
        reply: (await r.json()) as { ok: boolean; error?: { code: string; message: string } },
      };
    };
    const until = Date.now() + 30_000;
    const acknowledged: string[] = [];
    let imports = 0;
    const importer = (async () => {
      for (let n = 0; Date.now() < until; n++) {
        const run = await holdfast(
          ['import', '--store', store, '--prices', n % 2 ? 'a.csv' : 'b.csv', '--universe', 'Core', '--apply'],
          dir,
        );
        if (run.code === 0) {
          imports++;
          t.add('completed', 'import');
        } else if (run.code === 1 && /the store is busy/.test(run.stderr) && !looksCrashed(run))
          t.add('refused', 'import busy');
        else t.add('crashed', `import ${n}: exit ${run.code}: ${run.stderr.slice(0, 400)}`);
      }
    })();
    const editor = (async () => {
      for (let n = 0; Date.now() < until; n++) {
        const name = `Invented household ${n}`;
        const r = await call('households.create', { name, baseCurrency: 'EUR' });
        if (r.status === 200 && r.reply.ok) {
          acknowledged.push(name);
          t.add('completed', 'edit');
        } else if (r.status === 503 && r.reply.error?.code === 'busy') t.add('refused', 'edit busy');
        else t.add('crashed', `edit ${n}: ${r.status} ${JSON.stringify(r.reply.error)}`);
        await new Promise((resolve) => setTimeout(resolve, 20));
      }
    })();
    await Promise.all([importer, editor]);
    serve.kill('SIGINT');
    await new Promise((resolve) => serve.on('close', resolve));
    expect(sound(store)).toBe(true);
    const after = openStore(store, { create: false });
    const names = new Set(after.listHouseholds().map((h) => h.name));
    const batches = after.listBatches().length;
    after.close();
    for (const name of acknowledged) if (!names.has(name)) t.add('lost', `acknowledged edit '${name}' missing`);
    if (batches !== imports + 1) t.add('lost', `${imports} imports acknowledged, ${batches - 1} batches stored`);
    console.log(`two writers: ${imports} imports and ${acknowledged.length} edits acknowledged in 30 s`);
    expect(imports).toBeGreaterThan(2);
    expect(acknowledged.length).toBeGreaterThan(50);
    expect(t.failures).toEqual([]);
  }, 90_000);

  it('damaged backups (16 bytes flipped at 24 places, the middle included): refused naming the damage, or restored unchanged', async () => {
    const t = tally('damaged backup');
    const dir = folder('damaged');
    const source = join(dir, 'source.hfstore');
    // The demonstration store: prices, exchange rates, a household, its scenario's revisions.
    await createDemoStore(source);
    expect((await holdfast(['backup', '--store', source, '--out', 'b.hfstore'], dir)).code).toBe(0);
    const good = readFileSync(join(dir, 'b.hfstore'));
    const goodContent = content(join(dir, 'b.hfstore'));
    const places = [0.5, ...Array.from({ length: 23 }, (_, i) => (i + 1) / 24)];
    const jobs = places.map((at, i) => async () => {
      const sub = folder(`damaged/${i}`);
      const bytes = Buffer.from(good);
      const offset = Math.floor(bytes.length * at);
      for (let k = offset; k < offset + 16 && k < bytes.length; k++) bytes[k] ^= 0xff;
      writeFileSync(join(sub, 'b.hfstore'), bytes);
      copyFileSync(join(dir, 'source.hfstore'), join(sub, 's.hfstore'));
      const before = readFileSync(join(sub, 's.hfstore'));
      const run = await holdfast(['restore', '--from', 'b.hfstore', '--store', 's.hfstore'], sub);
      if (looksCrashed(run) || run.signal) return t.add('crashed', `flip at ${offset}: ${run.stderr}`);
      if (run.code === 2 && /^holdfast restore: b\.hfstore: /.test(run.stderr)) {
        const same = Buffer.compare(before, readFileSync(join(sub, 's.hfstore'))) === 0;
        return t.add(same ? 'refused' : 'lost', `flip at ${offset}: refused but the store changed`);
      }
      // Accepted: only right if the flip fell where nothing is stored (free space in a page).
      if (run.code === 0 && content(join(sub, 's.hfstore')) === goodContent)
        return t.add('completed', `flip at ${offset}`);
      t.add(run.code === 0 ? 'lost' : 'crashed', `flip at ${offset}: exit ${run.code}: ${run.stderr}`);
    });
    await inParallel(jobs);
    console.log(
      `damaged backup: ${good.length} bytes; the middle flip was ${t.counts.refused ? 'among the refused' : 'accepted'}`,
    );
    expect(t.failures).toEqual([]);
    expect(t.counts.refused).toBeGreaterThan(12);
  }, 120_000);

  describe.runIf(canSwitchUser || process.env.CI === 'true')('a store this user cannot write', () => {
    it('read-only file and read-only folder: import and serve say so naming the file; no -shm is left; once writable, it works', async () => {
      const t = tally('read-only store');
      const dir = folder('read-only');
      chownSync(dir, nobodyId(), 0);
      writeFileSync(join(dir, 'p.csv'), 'date,EQ1\n2025-01-02,100\n2025-01-03,101\n');
      writeFileSync(join(dir, 'q.csv'), 'date,EQ2\n2025-01-02,50\n2025-01-03,51\n');
      const store = join(dir, 's.hfstore');
      expect((await holdfast(['import', '--store', store, '--prices', 'p.csv', '--universe', 'Core'], dir)).code).toBe(
        0,
      );
      chownSync(store, nobodyId(), 0);
      chmodSync(store, 0o444);
      const before = readFileSync(store);
      const run = await holdfast(
        ['import', '--store', store, '--prices', 'q.csv', '--universe', 'Core'],
        dir,
        'nobody',
      );
      const clean =
        refusal(run, 1, `${store}: the store is read-only (the file is read-only)`) === 'refused' &&
        Buffer.compare(before, readFileSync(store)) === 0 &&
        readdirSync(dir).every((f) => !/-(shm|wal)$/.test(f));
      t.add(clean ? 'refused' : 'crashed', `read-only import: ${run.code} ${run.stderr} ${readdirSync(dir)}`);

      const served = await serveAs('nobody', store, dir);
      const create = await served.call('households.create', { name: 'Invented', baseCurrency: 'EUR' });
      t.add(
        served.banner.includes('The store is read-only (the file is read-only)') &&
          create.status === 507 &&
          create.reply.error?.code === 'storage' &&
          /the store is read-only/.test(create.reply.error.message)
          ? 'refused'
          : 'crashed',
        `serve read-only: ${served.banner} ${create.status} ${JSON.stringify(create.reply)}`,
      );
      t.add((await served.call('households.list', {})).status === 200 ? 'completed' : 'crashed', 'serve reads');
      await served.stop();
      t.add(readdirSync(dir).every((f) => !/-(shm|wal)$/.test(f)) ? 'completed' : 'lost', `left: ${readdirSync(dir)}`);

      chmodSync(store, 0o644);
      const fixed = await holdfast(
        ['import', '--store', store, '--prices', 'q.csv', '--universe', 'Core'],
        dir,
        'nobody',
      );
      t.add(fixed.code === 0 ? 'completed' : 'crashed', `after chmod: ${fixed.stderr}`);

      // A read-only folder: the store itself is writable, but SQLite cannot create its -wal there.
      const locked = folder('read-only-folder');
      copyFileSync(store, join(locked, 's.hfstore'));
      chownSync(join(locked, 's.hfstore'), nobodyId(), 0);
      chmodSync(locked, 0o755);
      const inFolder = await holdfast(
        ['import', '--store', join(locked, 's.hfstore'), '--prices', join(dir, 'p.csv'), '--universe', 'X'],
        locked,
        'nobody',
      );
      t.add(refusal(inFolder, 1, `its folder ${locked} is read-only`), `read-only folder: ${inFolder.stderr}`);
      expect(t.failures).toEqual([]);
    }, 60_000);
  });

  it('a full disk: the write is refused naming the store, which stays sound and unchanged; with room again it works', async () => {
    const t = tally('full disk');
    const dir = folder('full-disk');
    priceFile(join(dir, 'small.csv'), 3, 20000, 10, 10);
    priceFile(join(dir, 'large.csv'), 300, 18000, 1500, 20);
    const mount = join(dir, 'disk');
    mkdirSync(mount);
    const mounted = spawnSync('mount', ['-t', 'tmpfs', '-o', 'size=3m', 'tmpfs', mount]).status === 0;
    try {
      if (mounted) {
        const store = join(mount, 's.hfstore');
        expect(
          (await holdfast(['import', '--store', store, '--prices', 'small.csv', '--universe', 'Core'], dir)).code,
        ).toBe(0);
        const before = pricesState(store);
        const run = await holdfast(['import', '--store', store, '--prices', 'large.csv', '--universe', 'Core'], dir);
        t.add(refusal(run, 1, `${store}: the disk is full; nothing was written`), `tmpfs import: ${run.stderr}`);
        t.add(sound(store) && pricesState(store) === before ? 'completed' : 'lost', 'store after a full disk');
        // Fill what is left of the disk, then ask for a backup on it: refused, and no half file left.
        try {
          writeFileSync(join(mount, 'filler'), Buffer.alloc(8 * 1024 * 1024));
        } catch {
          // ENOSPC once the disk is full: that is the point
        }
        const backup = await holdfast(['backup', '--store', store, '--out', join(mount, 'b.hfstore')], dir);
        t.add(refusal(backup, 1, 'the disk is full'), `tmpfs backup: ${backup.code} ${backup.stderr}`);
        t.add(existsSync(join(mount, 'b.hfstore')) ? 'lost' : 'completed', 'no half backup left');
        rmSync(join(mount, 'filler'));
        const roomy = await holdfast(['import', '--store', store, '--prices', 'small.csv', '--universe', 'More'], dir);
        t.add(roomy.code === 0 && sound(store) ? 'completed' : 'crashed', `with room: ${roomy.stderr}`);
      }
      // Always, and the only proof where mounting is not allowed: SQLite's own SQLITE_FULL,
      // produced by capping the store's pages (PRAGMA max_page_count).
      const path = join(dir, 'capped.hfstore');
      openStore(path).close();
      const { db } = openDatabase(path, { create: false });
      db.pragma(`max_page_count = ${db.pragma('page_count', { simple: true }) as number}`);
      const capped = guardStorage(new SqliteStore(db, path, () => new Date()), undefined);
      try {
        capped.commitPrices({
          source: 'large.csv',
          assets: [{ id: 'EQ1' }],
          prices: [
            {
              assetId: 'EQ1',
              days: Int32Array.from({ length: 5000 }, (_, i) => 10000 + i),
              closes: new Float64Array(5000).fill(1),
            },
          ],
        });
        t.add('lost', 'a write beyond the cap was accepted');
      } catch (error) {
        t.add(
          error instanceof StorageError &&
            error.problem === 'disk-full' &&
            error.message.startsWith(`${path}: the disk is full`)
            ? 'refused'
            : 'crashed',
          `capped: ${String(error)}`,
        );
      } finally {
        capped.close();
      }
      t.add(sound(path) ? 'completed' : 'lost', 'capped store afterwards');
      console.log(
        `full disk: ${mounted ? 'a 3 MB tmpfs mounted by the test, and' : 'no mount allowed here; only'} a simulated SQLITE_FULL`,
      );
    } finally {
      if (mounted) spawnSync('umount', [mount]);
    }
    expect(t.failures).toEqual([]);
  }, 60_000);

  it('malformed price, scenario and household files through every command: each refused with exit 2 naming the file, nothing written', async () => {
    const t = tally('malformed inputs');
    const dir = folder('malformed');
    expect((await holdfast(['demo', '--out', '.'], dir)).code).toBe(0);
    const store = join(dir, 's.hfstore');
    expect(
      (await holdfast(['import', '--store', store, '--prices', 'demo-prices.csv', '--universe', 'Demo'], dir)).code,
    ).toBe(0);
    const storeBefore = readFileSync(store);
    for (const [name, text] of Object.entries(malformedPrices())) writeFileSync(join(dir, name), text);
    for (const [name, text] of Object.entries(malformedScenarios())) writeFileSync(join(dir, name), text);
    for (const [name, text] of Object.entries(malformedHouseholds())) writeFileSync(join(dir, name), text);
    mkdirSync(join(dir, 'folder.csv'));
    const prices = [...Object.keys(malformedPrices()), 'folder.csv', 'missing.csv'];
    const scenarios = Object.keys(malformedScenarios());
    const households = Object.keys(malformedHouseholds());
    // Every price file through the import and two of the four other commands, every scenario
    // through two of the three that read one (in rotation), so each command meets many of each.
    const runs: [string[], string[]][] = [];
    const priceCommands = [
      (p: string) => ['estimate', '--prices', p],
      (p: string) => ['solve', '--prices', p, '--scenario', 'demo-scenario.json'],
      (p: string) => ['backtest', '--prices', p, '--scenario', 'demo-scenario.json'],
      (p: string) => [
        'memo',
        '--prices',
        p,
        '--scenario',
        'demo-scenario.json',
        '--household-name',
        'Invented',
        '--out',
        `memo-${p}.pdf`,
      ],
    ];
    prices.forEach((p, i) => {
      runs.push([['import', '--store', 's.hfstore', '--prices', p, '--universe', 'Demo', '--apply'], [p]]);
      runs.push([priceCommands[i % 4](p), [p, 'demo-scenario.json']]);
      runs.push([priceCommands[(i + 2) % 4](p), [p, 'demo-scenario.json']]);
    });
    const scenarioCommands = [
      (s: string) => ['solve', '--prices', 'demo-prices.csv', '--scenario', s],
      (s: string) => ['backtest', '--prices', 'demo-prices.csv', '--scenario', s],
      (s: string) => [
        'memo',
        '--prices',
        'demo-prices.csv',
        '--scenario',
        s,
        '--household-name',
        'Invented',
        '--out',
        `memo-${s}.pdf`,
      ],
    ];
    scenarios.forEach((s, i) => {
      runs.push([scenarioCommands[i % 3](s), [s]]);
      runs.push([scenarioCommands[(i + 1) % 3](s), [s]]);
    });
    for (const h of households) runs.push([['import-household', '--store', 's.hfstore', '--from', h], [h]]);
    await inParallel(
      runs.map(([args, files]) => async () => {
        const run = await holdfast(args, dir);
        const outcome = refusal(run, 2, ...files);
        t.add(outcome, `${args.join(' ')}: exit ${run.code}: ${run.stderr.slice(0, 300)}`);
      }),
    );
    // Nothing written: no memo, the store byte for byte as it was.
    const written = readdirSync(dir).filter((f) => f.startsWith('memo-') || /-(wal|shm)$/.test(f));
    if (written.length) t.add('lost', `files written for refused input: ${written.join(', ')}`);
    if (Buffer.compare(storeBefore, readFileSync(store)) !== 0) t.add('lost', 'the store changed on refused input');
    console.log(
      `malformed inputs: ${prices.length} price files, ${scenarios.length} scenario files, ${households.length} household files over ${runs.length} runs`,
    );
    expect(prices.length + scenarios.length).toBeGreaterThanOrEqual(40);
    for (const command of ['estimate', 'solve', 'backtest', 'memo', 'import', 'import-household'])
      expect(runs.filter(([args]) => args[0] === command).length, command).toBeGreaterThanOrEqual(5);
    expect(t.failures).toEqual([]);
  }, 240_000);
});

function cliPath(): string {
  return new URL('../../dist/src-main/cli/main.js', import.meta.url).pathname;
}

function nobodyId(): number {
  return Number(spawnSync('id', ['-u', 'nobody'], { encoding: 'utf8' }).stdout.trim());
}

/** `holdfast serve` as another user; resolves with what it printed first and a way to call it. */
async function serveAs(user: string, store: string, cwd: string) {
  const child = spawn('runuser', ['-u', user, '--', process.execPath, cliPath(), 'serve', '--store', store], {
    cwd,
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  let err = '';
  child.stdout.on('data', (d) => (out += d));
  child.stderr.on('data', (d) => (err += d));
  const url = await new Promise<URL>((resolve, reject) => {
    const timer = setInterval(() => {
      const m = /Open (http:\/\/127\.0\.0\.1:\d+\/#token=\S+)/.exec(out);
      if (m) {
        clearInterval(timer);
        resolve(new URL(m[1]));
      }
    }, 50);
    child.on('close', () => {
      clearInterval(timer);
      reject(new Error(`serve ended: ${out} ${err}`));
    });
  });
  const token = url.hash.slice('#token='.length);
  return {
    banner: out,
    async call(method: string, body: unknown) {
      const r = await fetch(`${url.origin}/api/${method}`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
        body: JSON.stringify(body),
      });
      return {
        status: r.status,
        reply: (await r.json()) as { ok: boolean; error?: { code: string; message: string } },
      };
    },
    stop: () =>
      new Promise<void>((resolve) => {
        child.on('close', () => resolve());
        // runuser does not pass Ctrl-C on: it goes to the command runuser started (its child).
        spawnSync('pkill', ['-INT', '-P', String(child.pid)]);
      }),
  };
}

/** Price files a user might hand over by mistake (invented names and values). */
function malformedPrices(): Record<string, string | Buffer> {
  const header = 'date,EQ1,BD1\n';
  return {
    'empty.csv': '',
    'header-only.csv': header,
    'no-date-column.csv': 'asset,EQ1\n1,2\n2,3\n',
    'bad-date.csv': header + '2025-13-45,100,50\n2025-01-03,101,51\n',
    'text-close.csv': header + '2025-01-02,abc,50\n2025-01-03,101,51\n',
    'negative-close.csv': header + '2025-01-02,-100,50\n2025-01-03,101,51\n',
    'zero-close.csv': header + '2025-01-02,0,50\n2025-01-03,101,51\n',
    'repeated-date.csv': header + '2025-01-02,100,50\n2025-01-02,101,51\n',
    'ragged-row.csv': header + '2025-01-02,100\n2025-01-03,101,51,7\n',
    'duplicate-column.csv': 'date,EQ1,EQ1\n2025-01-02,100,50\n2025-01-03,101,51\n',
    'binary.csv': Buffer.from(Array.from({ length: 4096 }, (_, i) => (i * 7919) % 256)),
    'huge-cell.csv': header + `2025-01-02,${'9'.repeat(5_000_000)},50\n2025-01-03,101,51\n`,
    'nan-close.csv': header + '2025-01-02,NaN,50\n2025-01-03,Infinity,51\n',
    'date-only.csv': 'date\n2025-01-02\n2025-01-03\n',
    'unclosed-quote.csv': header + '"2025-01-02,100,50\n2025-01-03,101,51\n',
    'percent-close.csv': header + '2025-01-02,100%,50\n2025-01-03,101%,51\n',
    'currency-sign.csv': header + '2025-01-02,€100,50\n2025-01-03,€101,51\n',
    'overflow-close.csv': header + '2025-01-02,1e400,50\n2025-01-03,101,51\n',
    'letters-in-date.csv': header + '2025-01-0x,100,50\n2025-01-03,101,51\n',
    'spaced-number.csv': header + '2025-01-02,1 0 0,50\n2025-01-03,101,51\n',
    'nul-bytes.csv': header + '2025-01-02,100\u0000,50\n',
    'no-header.csv': '2025-01-02,100,50\n2025-01-03,101,51\n',
    'html.csv': '<!doctype html><html><body>not prices</body></html>\n',
    'json.csv': '{"EQ1": [100, 101]}\n',
  };
}

/** Scenario documents broken in the ways an edited file breaks. */
function malformedScenarios(): Record<string, string> {
  const demo = (patch: Record<string, unknown>) =>
    JSON.stringify({
      format: 'holdfast-scenario@1',
      name: 'Broken',
      baseCurrency: 'EUR',
      candidates: [{ id: 'mv', estimator: { method: 'sample' }, objective: { method: 'min-variance' } }],
      ...patch,
    });
  return {
    'empty.json': '',
    'truncated.json': '{"format": "holdfast-scenario@1", "name": ',
    'array.json': '[]',
    'wrong-format.json': demo({ format: 'holdfast-scenario@9' }),
    'no-candidates.json': demo({ candidates: [] }),
    'unknown-estimator.json': demo({
      candidates: [{ id: 'x', estimator: { method: 'crystal-ball' }, objective: { method: 'min-variance' } }],
    }),
    'unknown-objective.json': demo({
      candidates: [{ id: 'x', estimator: { method: 'sample' }, objective: { method: 'maximum-luck' } }],
    }),
    'bad-currency.json': demo({ baseCurrency: 'euro' }),
    'nested-deep.json': '{"a":'.repeat(4500) + '1' + '}'.repeat(4500),
    'nan-literal.json': demo({}).replace('"Broken"', 'NaN'),
    'text.json': 'date,EQ1\n2025-01-02,100\n',
    'bom-garbage.json': '\uFEFF\u0000\u0001{}',
    'null.json': 'null',
    'number.json': '42',
    'candidates-object.json': demo({ candidates: {} }),
    'no-base-currency.json': demo({ baseCurrency: undefined }),
    'name-number.json': demo({ name: 5 }),
    'estimator-string.json': demo({
      candidates: [{ id: 'x', estimator: 'sample', objective: { method: 'min-variance' } }],
    }),
  };
}

/** Household files (holdfast-household@1) broken or tampered with. */
function malformedHouseholds(): Record<string, string> {
  return {
    'household-empty.json': '',
    'household-truncated.json': '{"format": "holdfast-household@1", ',
    'household-array.json': '[1, 2, 3]',
    'household-wrong-format.json': '{"format": "something-else@1"}',
    'household-bad-checksum.json': JSON.stringify({ format: 'holdfast-household@1', checksum: '00' }),
  };
}
