import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { generateBook } from '../../shared-core/demo/book.js';
import { reviewColumns } from '../../shared-core/review/columns.js';
import { reviewBook } from '../../src-main/app/review-book.js';
import { createBookStore } from '../../src-main/demo/create-book-store.js';
import { describeInBrowser, launchApp, type AppSession } from './harness.js';

const column = (key: string) => reviewColumns.find((c) => c.key === key)!;

describeInBrowser('the book review screen on an invented book of 12 households', () => {
  let app: AppSession;
  let dir: string;
  const book = generateBook();
  let expected: ReturnType<typeof reviewBook>['rows'];

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'holdfast-book-e2e-'));
    const storePath = join(dir, 'book.hfstore');
    const { store } = createBookStore(storePath);
    expected = reviewBook(store).rows;
    store.close();
    app = await launchApp({ storePath, demo: false });
  }, 120_000);

  afterAll(async () => {
    await app?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('lists every household with the figures the review gives, the ones needing attention first', async () => {
    const { page } = app;
    const started = Date.now();
    await page.goto(app.url);
    await page.getByRole('link', { name: 'Book review' }).click();
    const table = page.locator('table.book-table');
    await table.waitFor();
    expect(Date.now() - started).toBeLessThan(60_000);
    const rows = table.locator('tbody > tr:not(.book-review-line)');
    expect(await rows.count()).toBe(book.households.length);
    // Sorted by status: cannot be computed, then needs attention, then in order.
    const statuses = await rows.locator('td:nth-child(2) > span').allInnerTexts();
    const rank = { 'cannot be computed': 0, 'needs attention': 1, 'in order': 2 } as Record<string, number>;
    expect(statuses.map((s) => rank[s])).toEqual([...statuses.map((s) => rank[s])].sort());
    // Each household's drift cell reads as the command line prints it (one column definition).
    for (const r of expected.filter((x) => x.figures)) {
      const row = rows.filter({ has: page.getByRole('link', { name: r.household, exact: true }) });
      const [drift, largest] = (await row.locator('td').nth(1).innerText()).split('\n');
      expect(drift).toBe(column('drift').text(r));
      expect(largest).toBe(`largest ${column('largestGap').text(r)}`);
    }
    await app.screenshot('book-review');
    expect(app.consoleErrors).toEqual([]);
    expect(app.foreignRequests).toEqual([]);
  });

  it('filters to the households that need attention, sorts by drift, and opens a household', async () => {
    const { page } = app;
    await page.getByLabel('Only households that need attention').check();
    const rows = page.locator('table.book-table tbody > tr:not(.book-review-line)');
    expect(await rows.count()).toBe(expected.filter((r) => r.status !== 'ok').length);
    await page.getByRole('button', { name: /^Drift/ }).click();
    const header = page.locator('th', { has: page.getByRole('button', { name: /^Drift/ }) });
    expect(await header.getAttribute('aria-sort')).toBe('ascending');
    const first = expected
      .filter((r) => r.status !== 'ok' && r.figures)
      .sort((a, b) => a.figures!.drift.total - b.figures!.drift.total)[0];
    expect(await rows.first().locator('th a').innerText()).toBe(first.household);
    await rows.first().getByRole('link').click();
    await page.waitForURL(/#\/households\/\d+$/);
    await page.goBack();
    await page.locator('table.book-table').waitFor();
  });

  it('keeps a tolerance and marks a household reviewed; a field error is worded in per cent', async () => {
    const { page } = app;
    await page.getByLabel('Only households that need attention').uncheck();
    const row = page.locator('table.book-table tbody > tr').filter({ hasText: book.households[4].name });
    await row.getByRole('button', { name: 'Review…' }).click();
    const field = page.getByLabel('Drift tolerance, %');
    await field.fill('0');
    await expect
      .poll(() => page.locator('.book-review-form .field-error').innerText())
      .toBe('the drift tolerance must be above 0 %');
    await field.fill('150');
    await page.getByRole('button', { name: 'Mark as reviewed' }).click();
    await expect.poll(() => page.locator('.book-review-form .muted').innerText()).toMatch(/^Last reviewed /);
    await expect.poll(() => row.locator('td').nth(1).innerText()).toMatch(/of 150\.0%\n/);
    await app.screenshot('book-review-marked');
    expect(app.consoleErrors).toEqual([]);
  });
});
