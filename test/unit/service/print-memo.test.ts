import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dispatch } from '../../../shared-core/contract/dispatch.js';
import { serviceApi } from '../../../shared-core/contract/service-api.js';
import { createDemoStore } from '../../../src-main/demo/create-demo-store.js';
import { createService, type Service } from '../../../src-main/service/index.js';
import { openStore, type Store } from '../../../src-main/store/store.js';
import { flatText } from '../../integration/memo/poppler.js';

// The memo through the service on the invented demonstration store (its own seeded prices,
// household with a US-dollar holding and 3 x 2 candidate scenario).
describe('service: printing the allocation memo', () => {
  let dir: string;
  let store: Store;
  let service: Service;
  let scenarioId: string;
  const call = (name: string, payload: unknown) => dispatch(serviceApi, service, name, payload);

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'holdfast-memo-service-'));
    const demo = await createDemoStore(join(dir, 'demo.sqlite'));
    store = openStore(demo.path, { create: false });
    service = createService(store, { settingsPath: join(dir, 'settings.json'), demo: true });
    scenarioId = String(demo.scenarioId);
  }, 120_000);
  afterAll(() => {
    service?.dispose();
    store?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('refuses to print before the initials are set, naming the setting', async () => {
    expect(await call('memos.print', { scenarioId, date: '2026-01-15' })).toMatchObject({
      ok: false,
      error: { code: 'bad-request', where: 'preparedBy' },
    });
    expect(store.listMemos(Number(scenarioId))).toEqual([]);
  });

  it('prints a PDF kept in the store, and the same request again returns the same memo', async () => {
    await call('settings.set', { preparedBy: 'QA' });
    const first = await call('memos.print', { scenarioId, date: '2026-01-15' });
    if (!first.ok) throw new Error(first.error.message);
    const { memo, reused } = first.result as { memo: { id: string; hash: string; bytes: number }; reused: boolean };
    expect(reused).toBe(false);
    const got = await call('memos.get', { memoId: memo.id });
    if (!got.ok) throw new Error(got.error.message);
    const bytes = Buffer.from((got.result as { pdfBase64: string }).pdfBase64, 'base64');
    // ISO 32000-1: a PDF file begins with the header "%PDF-" and ends with "%%EOF".
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(bytes.subarray(-6).toString('latin1')).toMatch(/%%EOF\s*$/);
    expect(bytes.length).toBe(memo.bytes);
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(memo.hash);
    const again = await call('memos.print', { scenarioId, date: '2026-01-15' });
    expect(again).toMatchObject({ ok: true, result: { reused: true, memo: { id: memo.id, hash: memo.hash } } });
    expect(store.listMemos(Number(scenarioId))).toHaveLength(1);
  }, 120_000);

  it('a revision with walk-forward settings prints its walk-forward and stress sections from the page, as the command line does', async () => {
    await call('settings.set', { preparedBy: 'QA' });
    const detail = await call('scenarios.get', { scenarioId });
    if (!detail.ok) throw new Error(detail.error.message);
    const document = {
      ...((detail.result as { document: Record<string, unknown> }).document as Record<string, unknown>),
      backtest: { estimationWindow: 36, rebalance: 'quarterly', costBps: 10 },
    };
    const saved = await call('scenarios.saveRevision', { scenarioId, document, author: 'QA', note: 'walk-forward' });
    if (!saved.ok) throw new Error(saved.error.message);
    const printed = await call('memos.print', { scenarioId, date: '2026-01-16' });
    if (!printed.ok) throw new Error(printed.error.message);
    const { memo } = printed.result as { memo: { id: string } };
    const got = await call('memos.get', { memoId: memo.id });
    if (!got.ok) throw new Error(got.error.message);
    const text = flatText(Buffer.from((got.result as { pdfBase64: string }).pdfBase64, 'base64'));
    expect(text).toContain('4 Walk-forward test');
    expect(text).toContain('Stress tests');
    // Counts agree with their nouns in the data notes ("(1 asset)", never "(1 assets)").
    expect(text).not.toMatch(/\(1 assets\)/);
  }, 300_000);

  it('refuses a recommended candidate the revision does not have', async () => {
    expect(await call('memos.print', { scenarioId, recommended: 'no-such-candidate' })).toMatchObject({
      ok: false,
      error: { code: 'bad-request', where: 'recommended' },
    });
  });
});
