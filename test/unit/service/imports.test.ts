import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { ImportJob } from '../../../shared-core/contract/service-api.js';
import { useService, type Harness } from './service-fixture.js';

const service = useService();

async function settled(h: Harness, job: ImportJob): Promise<ImportJob> {
  return JSON.parse(JSON.stringify(await h.service.importSettled(job.jobId)));
}

const WIDE = ['date,AAA,BBB', '2025-01-06,100,50', '2025-01-07,101,51', '2025-01-08,102,', '2025-01-09,103,53'].join(
  '\n',
);

describe('service: price imports as jobs', () => {
  it('checks uploaded text without writing, reports per asset, then writes on confirmation', async () => {
    const h = service();
    const versionBefore = h.store.dataVersion();
    const started = await h.call('imports.start', {
      source: { kind: 'text', fileName: 'invented.csv', text: WIDE },
      universe: 'Invented core',
      currency: 'EUR',
    });
    expect(started.state).toBe('checking');
    const checked = await settled(h, started);
    expect(checked.state).toBe('ready');
    expect(checked.progress).toEqual({ rows: 4, percent: 100 });
    expect(checked.report).toMatchObject({ fileName: 'invented.csv', layout: 'wide', delimiter: 'comma', rows: 4 });
    const bbb = checked.report!.assets.find((a) => a.asset === 'BBB')!;
    expect(bbb).toMatchObject({
      rows: 3,
      firstDate: '2025-01-06',
      lastDate: '2025-01-09',
      isNewAsset: true,
      newDates: 3,
    });
    // Nothing is written by the check.
    expect(h.store.dataVersion()).toBe(versionBefore);
    expect(h.store.listAssets()).toEqual([]);

    await h.call('imports.confirm', { jobId: started.jobId });
    const applied = await settled(h, started);
    expect(applied.state).toBe('applied');
    expect(applied.applied).toEqual({ assetsAdded: 2, pricesAdded: 7, pricesChanged: 0 });
    expect(h.store.dataVersion()).toBeGreaterThan(versionBefore);
    expect(h.store.getAsset('AAA')?.currency).toBe('EUR');
    const universes = await h.call('universes.list', {});
    expect(universes).toMatchObject([{ name: 'Invented core', assetCount: 2 }]);
    const history = await h.call('imports.history', {});
    expect(history[0]).toMatchObject({ source: 'invented.csv', added: 7, assets: 2 });
  });

  it('reports a bad cell with its line and column and writes nothing', async () => {
    const h = service();
    const text = ['date,AAA', '2025-01-06,100', '2025-01-07,-4', '2025-01-08,102'].join('\n');
    const job = await settled(
      h,
      await h.call('imports.start', { source: { kind: 'text', fileName: 'bad.csv', text }, universe: 'Invented core' }),
    );
    expect(job.state).toBe('invalid');
    expect(job.message).toMatch(/cannot be imported/);
    expect(job.report!.assets[0].nonPositive).toEqual([{ line: 3, column: 2, message: 'a price must be above zero' }]);
    const refused = await h.reply('imports.confirm', { jobId: job.jobId });
    expect(refused).toMatchObject({ ok: false, error: { code: 'conflict' } });
    expect(h.store.listAssets()).toEqual([]);
  });

  it('asks for the date order of a file whose dates read both ways, and never guesses', async () => {
    const h = service();
    const text = ['date;AAA', '03/04/2025;100,5', '04/04/2025;101,5', '07/04/2025;102,5'].join('\n');
    const first = await settled(
      h,
      await h.call('imports.start', { source: { kind: 'text', fileName: 'eu.csv', text }, universe: 'Invented core' }),
    );
    expect(first.state).toBe('needs-date-order');
    expect(first.report).toMatchObject({
      dateOrderAmbiguous: true,
      dateOrder: null,
      delimiter: 'semicolon',
      decimal: 'comma',
    });
    const unanswered = await h.reply('imports.confirm', { jobId: first.jobId });
    expect(unanswered).toMatchObject({ ok: false, error: { code: 'bad-request', where: 'dateOrder' } });
    await h.call('imports.confirm', { jobId: first.jobId, dateOrder: 'day-first' });
    const done = await settled(h, first);
    expect(done.state).toBe('applied');
    // Day-first: 03/04/2025 is the 3rd of April (and 07/04 a Monday, 7 April 2025).
    const series = await h.call('prices.series', { assetId: 'AAA' });
    expect(series.dates).toEqual(['2025-04-03', '2025-04-04', '2025-04-07']);
    expect(series.closes).toEqual([100.5, 101.5, 102.5]);
  });

  it('shows changed closes on re-import and replaces them only when asked', async () => {
    const h = service();
    const run = async (text: string, applyChanges: boolean) => {
      const job = await settled(
        h,
        await h.call('imports.start', { source: { kind: 'text', fileName: 'r.csv', text }, universe: 'Invented core' }),
      );
      if (job.state !== 'ready') return job;
      await h.call('imports.confirm', { jobId: job.jobId, applyChanges });
      return { checked: job, done: await settled(h, job) };
    };
    await run(['date,AAA', '2025-01-06,100', '2025-01-07,101'].join('\n'), false);
    const second = ['date,AAA', '2025-01-06,100', '2025-01-07,111', '2025-01-08,112'].join('\n');
    const kept = (await run(second, false)) as { checked: ImportJob; done: ImportJob };
    expect(kept.checked.report!.assets[0]).toMatchObject({
      newDates: 1,
      changedValues: 1,
      changes: [{ date: '2025-01-07', stored: 101, incoming: 111 }],
      isNewAsset: false,
    });
    expect(kept.done.applied).toMatchObject({ pricesAdded: 1, pricesChanged: 0 });
    expect((await h.call('prices.series', { assetId: 'AAA' })).closes).toEqual([100, 101, 112]);
    const replaced = (await run(second, true)) as { checked: ImportJob; done: ImportJob };
    expect(replaced.done.applied).toMatchObject({ pricesAdded: 0, pricesChanged: 1 });
    expect((await h.call('prices.series', { assetId: 'AAA' })).closes).toEqual([100, 111, 112]);
  });

  it('cancels a checked import and leaves the store as it was', async () => {
    const h = service();
    const job = await settled(
      h,
      await h.call('imports.start', {
        source: { kind: 'text', fileName: 'c.csv', text: WIDE },
        universe: 'Invented core',
      }),
    );
    const cancelled = await h.call('imports.cancel', { jobId: job.jobId });
    expect(cancelled).toMatchObject({ state: 'cancelled', message: 'Cancelled; nothing was written.' });
    expect(await h.reply('imports.confirm', { jobId: job.jobId })).toMatchObject({
      ok: false,
      error: { code: 'conflict' },
    });
    expect(h.store.listAssets()).toEqual([]);
  });

  it('cancels while the file is still being read', async () => {
    const h = service();
    const rows = ['date,AAA'];
    const d = new Date(Date.UTC(1990, 0, 1));
    for (let i = 0; i < 60_000; i++) {
      rows.push(`${d.toISOString().slice(0, 10)},${100 + (i % 7)}`);
      d.setUTCDate(d.getUTCDate() + 1);
    }
    const path = join(h.dir, 'long.csv');
    writeFileSync(path, rows.join('\n'));
    const started = await h.call('imports.start', { source: { kind: 'path', path }, universe: 'Invented core' });
    expect(started.state).toBe('checking');
    const cancelled = await h.call('imports.cancel', { jobId: started.jobId });
    expect(cancelled.state).toBe('cancelled');
    // Stopped part-way: the reading pass never reached its end.
    expect(cancelled.progress.percent).toBeLessThan(100);
    expect(cancelled.report).toBeNull();
    expect(h.store.listAssets()).toEqual([]);
  });

  it('refuses a path with no file, naming the field', async () => {
    const h = service();
    const reply = await h.reply('imports.start', {
      source: { kind: 'path', path: join(h.dir, 'missing.csv') },
      universe: 'Invented core',
    });
    expect(reply).toMatchObject({ ok: false, error: { code: 'bad-request', where: 'source.path' } });
    expect(await h.reply('imports.status', { jobId: 'import-77' })).toMatchObject({
      ok: false,
      error: { code: 'not-found' },
    });
  });
});
