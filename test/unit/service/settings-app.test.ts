import { createHash } from 'node:crypto';
import { readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { formatInputError, type InputError } from '../../../shared-core/errors.js';
import { createService } from '../../../src-main/service/index.js';
import { seedPrices, useService, weekdays } from './service-fixture.js';

const service = useService((dir) => ({ settingsPath: join(dir, 'settings.json'), version: '9.9.9-test' }));
const demoService = useService(() => ({ demo: true }));

describe('service: settings, app info and memos', () => {
  it('keeps the prepared-by initials in an owner-only file that a new service reads back', async () => {
    const h = service();
    expect(await h.call('settings.get', {})).toEqual({ preparedBy: null });
    expect(await h.call('settings.set', { preparedBy: ' jd ' })).toEqual({ preparedBy: 'JD' });
    const path = join(h.dir, 'settings.json');
    expect(JSON.parse(readFileSync(path, 'utf8'))).toEqual({ preparedBy: 'JD' });
    expect(statSync(path).mode & 0o777).toBe(0o600);
    const again = createService(h.store, { settingsPath: path });
    expect(await again['settings.get']({})).toEqual({ preparedBy: 'JD' });
    expect(await h.reply('settings.set', { preparedBy: 'J' })).toMatchObject({
      ok: false,
      error: { code: 'bad-request', where: 'preparedBy' },
    });
  });

  it('names a damaged settings file instead of starting with wrong settings', () => {
    const h = service();
    const path = join(h.dir, 'broken.json');
    writeFileSync(path, '{"preparedBy": 12}');
    let message = '';
    try {
      createService(h.store, { settingsPath: path });
    } catch (error) {
      message = formatInputError(error as InputError);
    }
    expect(message).toBe(`${path}: preparedBy: Invalid input: expected string, received number`);
  });

  it('tells the version, store, data version, and for a demo store the scenario to open first', async () => {
    const h = service();
    const info = await h.call('app.info', {});
    expect(info).toMatchObject({
      version: '9.9.9-test',
      storePath: join(h.dir, 'store.sqlite'),
      demo: false,
      startAt: null,
      readOnly: null,
    });
    const d = demoService();
    seedPrices(d.store, 'Invented core', { AAA: { dates: weekdays('2025-01-06', 3) } });
    const hh = await d.call('households.create', { name: 'Invented demo family', baseCurrency: 'EUR' });
    expect((await d.call('app.info', {})).startAt).toBeNull();
    const { scenario } = await d.call('scenarios.create', {
      householdId: hh.id,
      document: {
        format: 'holdfast-scenario@1',
        name: 'Invented demo',
        baseCurrency: 'EUR',
        candidates: [{ id: 'c', estimator: { method: 'sample' }, objective: { method: 'equal-weight' } }],
      },
      author: 'DM',
    });
    expect((await d.call('app.info', {})).startAt).toEqual({ householdId: hh.id, scenarioId: scenario.id });
  });

  it('returns a printed memo byte for byte, with the SHA-256 of its bytes', async () => {
    const h = service();
    seedPrices(h.store, 'Invented core', { AAA: { dates: weekdays('2025-01-06', 3) } });
    const hh = await h.call('households.create', { name: 'Invented memo family', baseCurrency: 'EUR' });
    const { scenario } = await h.call('scenarios.create', {
      householdId: hh.id,
      document: {
        format: 'holdfast-scenario@1',
        name: 'Invented memo',
        baseCurrency: 'EUR',
        candidates: [{ id: 'c', estimator: { method: 'sample' }, objective: { method: 'equal-weight' } }],
      },
      author: 'DM',
    });
    const pdf = new TextEncoder().encode('%PDF-1.7 invented bytes for the test\n%%EOF\n');
    const saved = h.store.saveMemo({
      scenarioId: Number(scenario.id),
      revisionHash: scenario.latestRevision!.hash,
      dataVersion: h.store.dataVersion(),
      pdf,
      title: 'Invented memo',
    });
    const list = await h.call('memos.list', { scenarioId: scenario.id });
    expect(list).toHaveLength(1);
    expect(list[0]).toMatchObject({ id: String(saved.id), title: 'Invented memo', bytes: pdf.length });
    const got = await h.call('memos.get', { memoId: String(saved.id) });
    expect(Buffer.from(got.pdfBase64, 'base64')).toEqual(Buffer.from(pdf));
    expect(got.memo.hash).toBe(createHash('sha256').update(pdf).digest('hex'));
    expect(await h.reply('memos.get', { memoId: '77' })).toMatchObject({ ok: false, error: { code: 'not-found' } });
  });
});
