import Database from 'better-sqlite3';
import { existsSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { sha256Hex } from '../../../src-main/store/canonical-json.js';
import { LATEST_SCHEMA_VERSION } from '../../../src-main/store/migrations.js';
import { checkStoreFile, openStore } from '../../../src-main/store/store.js';
import { runCliInProcess } from '../../support/run-cli-in-process.js';
import { useTempDir } from './temp-dir.js';

const tempDir = useTempDir();
const PDF = Buffer.from('%PDF-1.7\n% an invented memo of the store tests\n%%EOF\n');

/** A store with one price series holding 86.05, an exchange-rate series, a revision and a memo, and its backup. */
async function storeWithBackup(): Promise<{ dir: string; store: string; backup: string }> {
  const dir = tempDir();
  const store = openStore(join(dir, 's.hfstore'));
  store.commitPrices({
    source: 'p.csv',
    assets: [
      { id: 'EQ1', currency: 'EUR' },
      { id: 'USDEUR', fx: { base: 'USD', quote: 'EUR' } },
    ],
    prices: [
      { assetId: 'EQ1', dates: ['2025-01-02', '2025-01-03', '2025-01-06'], closes: [85.5, 86.05, 86.4] },
      { assetId: 'USDEUR', dates: ['2025-01-02', '2025-01-03'], closes: [0.9625, 0.9713] },
    ],
    universe: { name: 'Core' },
  });
  const h = store.createHousehold({
    name: 'Invented household',
    baseCurrency: 'EUR',
    notes: 'Prefers low turnover',
  });
  const s = store.createScenario({ householdId: h.id, name: 'Balanced', universe: 'Core' });
  const doc = {
    format: 'holdfast-scenario@1',
    name: 'Balanced',
    baseCurrency: 'EUR',
    candidates: [{ id: 'mv', estimator: { method: 'sample' }, objective: { method: 'min-variance' } }],
  };
  const r = store.saveRevision(s.id, doc, { author: 'AB' });
  store.saveMemo({ scenarioId: s.id, revisionHash: r.hash, dataVersion: store.dataVersion(), pdf: PDF, title: 'Memo' });
  await store.backup(join(dir, 'b.hfstore'));
  store.close();
  return { dir, store: join(dir, 's.hfstore'), backup: join(dir, 'b.hfstore') };
}

/** Overwrites the first occurrence of `needle` in the file with bytes of the same length. */
function damage(file: string, needle: Buffer, replacement: Buffer): void {
  const bytes = readFileSync(file);
  const at = bytes.indexOf(needle);
  expect(at, `${needle.toString('hex')} in ${file}`).toBeGreaterThan(0);
  replacement.copy(bytes, at);
  writeFileSync(file, bytes);
}
const float64 = (x: number) => Buffer.from(new Float64Array([x]).buffer);

describe('checksums: restore and holdfast check name what is damaged (issue 16)', () => {
  it('a sound backup: check says so with what it verified, and restore brings it back', async () => {
    const { dir } = await storeWithBackup();
    const check = await runCliInProcess(['check', '--store', 'b.hfstore'], dir);
    expect(check).toMatchObject({ code: 0, stderr: '' });
    expect(check.stdout).toBe(
      `b.hfstore: sound (store schema ${LATEST_SCHEMA_VERSION}; 2 price series, 1 scenario revisions and 1 memos checked against their checksums)\n`,
    );
    const restore = await runCliInProcess(['restore', '--from', 'b.hfstore', '--store', 's.hfstore'], dir);
    expect(restore.code).toBe(0);
    expect(restore.stdout).toMatch(/2 price series, 1 scenario revisions and 1 memos verified/);
  });

  it('a close changed from 86.05 to -0.0517 in the backup: restore refuses it, naming the asset, and leaves the store as it was', async () => {
    const { dir, store, backup } = await storeWithBackup();
    damage(backup, float64(86.05), float64(-0.0517));
    const before = sha256Hex(readFileSync(store));
    const r = await runCliInProcess(['restore', '--from', 'b.hfstore', '--store', 's.hfstore'], dir);
    expect(r.code).toBe(2);
    expect(r.stderr).toBe(
      "holdfast restore: b.hfstore: is damaged, so it was not restored and the store was left as it was: prices of asset 'EQ1': the stored values do not match their checksum; " +
        'the backup as a whole: its contents do not match the seal it was written with (a record was changed after the backup was made)\n',
    );
    expect(sha256Hex(readFileSync(store))).toBe(before);
    expect(readdirSync(dir).sort()).toEqual(['b.hfstore', 's.hfstore']);
    const check = await runCliInProcess(['check', '--store', 'b.hfstore'], dir);
    expect(check.code).toBe(1);
    expect(check.stderr).toMatch(/^b\.hfstore: damaged; 2 problems:\n {2}prices of asset 'EQ1': the stored values/);
  });

  it('names a damaged exchange-rate series, scenario revision and memo each as the user knows them', async () => {
    const { backup } = await storeWithBackup();
    damage(backup, float64(0.9713), float64(9.713));
    damage(backup, Buffer.from('"min-variance"'), Buffer.from('"max-variance"'));
    damage(backup, Buffer.from('an invented memo'), Buffer.from('an altered  memo'));
    expect(checkStoreFile(backup).problems).toEqual([
      "exchange rates EUR per USD (series 'USDEUR'): the stored values do not match their checksum",
      "revision 1 of scenario 'Balanced' (household 'Invented household'): the document does not match its checksum",
      expect.stringMatching(
        /^memo 1 'Memo' of scenario 'Balanced', printed \d{4}-\d\d-\d\d: the PDF does not match its checksum$/,
      ),
      expect.stringMatching(/^the backup as a whole: /),
    ]);
  });

  it('a backup is sealed as a whole: a changed household note is caught too, and the restored store carries no seal', async () => {
    const { dir, backup } = await storeWithBackup();
    const copy = join(dir, 'copy.hfstore');
    writeFileSync(copy, readFileSync(backup));
    damage(backup, Buffer.from('Prefers low turnover'), Buffer.from('Prefers LOW turnover'));
    expect(checkStoreFile(backup).problems).toEqual([
      'the backup as a whole: its contents do not match the seal it was written with (a record was changed after the backup was made)',
    ]);
    expect((await runCliInProcess(['restore', '--from', 'copy.hfstore', '--store', 's.hfstore'], dir)).code).toBe(0);
    expect(checkStoreFile(join(dir, 's.hfstore')).problems).toEqual([]);
    const raw = new Database(join(dir, 's.hfstore'), { readonly: true });
    expect(raw.prepare("SELECT count(*) FROM meta WHERE key = 'backup_digest'").pluck().get()).toBe(0);
    raw.close();
  });

  it('holdfast check reads only: no file is created beside the store or the backup, and the bytes stay the same', async () => {
    const { dir, backup } = await storeWithBackup();
    const before = sha256Hex(readFileSync(backup));
    expect((await runCliInProcess(['check', '--store', 'b.hfstore', '--json'], dir)).code).toBe(0);
    expect(sha256Hex(readFileSync(backup))).toBe(before);
    expect(readdirSync(dir).sort()).toEqual(['b.hfstore', 's.hfstore']);
    const missing = await runCliInProcess(['check', '--store', 'none.hfstore'], dir);
    expect(missing).toMatchObject({ code: 2, stderr: 'holdfast check: none.hfstore: no such store\n' });
    expect(existsSync(join(dir, 'none.hfstore'))).toBe(false);
  });

  it('restore refuses while another Holdfast has the store open, and leaves it as it was', async () => {
    const { dir, store } = await storeWithBackup();
    const open = openStore(store);
    const before = open.listHouseholds();
    const r = await runCliInProcess(['restore', '--from', 'b.hfstore', '--store', 's.hfstore'], dir);
    expect(r.code).toBe(1);
    expect(r.stderr).toMatch(
      /s\.hfstore: the store is open in another Holdfast window or command, so it was not replaced/,
    );
    expect(open.listHouseholds()).toEqual(before);
    open.close();
    expect(readdirSync(dir).filter((f) => f.includes('replaced') || f.includes('restoring'))).toEqual([]);
  }, 20_000);
});
