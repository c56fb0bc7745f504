import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { runCliInProcess } from '../support/run-cli-in-process.js';
import { docSteps } from '../docs/doc-blocks.js';
import { describeInBrowser, launchApp, type AppSession } from './harness.js';
import { printMemo } from './memo-steps.js';

/**
 * The user's guide, "Through the app", followed as written: the guide's own price file
 * (docs/guide.md's my-prices.csv) imported with the guide's command, the app served on that
 * store, then the guide's steps by the labels the guide names, to a printed memo whose PDF, read
 * back with poppler's pdftotext, names the household and carries the caution.
 */
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const guide = readFileSync(join(root, 'docs', 'guide.md'), 'utf8');
const files = new Map(docSteps(guide).flatMap((s) => (s.kind === 'file' ? [[s.name, s.text] as const] : [])));
const IMPORT = [
  'import',
  '--store',
  'my-book.sqlite',
  '--prices',
  'my-prices.csv',
  '--universe',
  'My funds',
  '--currency',
  'EUR',
];
const HOUSEHOLD = 'My first household (invented)';

describeInBrowser("the user's guide, through the app, on its own price file", () => {
  let app: AppSession;
  let page: Page;
  let dir: string;

  beforeAll(async () => {
    expect(guide).toContain(`npx holdfast ${IMPORT.slice(0, 6).join(' ')} "My funds" --currency EUR`);
    dir = mkdtempSync(join(tmpdir(), 'holdfast-guide-'));
    writeFileSync(join(dir, 'my-prices.csv'), files.get('my-prices.csv')!);
    const imported = await runCliInProcess(IMPORT, dir);
    expect(imported.code, imported.stderr).toBe(0);
    app = await launchApp({ demo: false, storePath: join(dir, 'my-book.sqlite') });
    page = app.page;
    page.setDefaultTimeout(30_000);
    await page.goto(app.url);
  }, 120_000);
  afterAll(async () => {
    await app?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('2-3. a household with the holdings of my-holdings.json', async () => {
    await page.getByRole('link', { name: 'Households' }).first().click();
    await page.getByRole('link', { name: 'New household' }).first().click();
    await page.getByLabel('Name', { exact: true }).fill(HOUSEHOLD);
    await page.getByLabel('Base currency').fill('EUR');
    await page.getByRole('button', { name: 'Create household' }).click();
    await page.getByRole('heading', { name: HOUSEHOLD, level: 1 }).waitFor();
    await page.getByRole('button', { name: 'Enter holdings' }).click();
    const holdings = JSON.parse(files.get('my-holdings.json')!) as {
      asOf: string;
      positions: { asset: string; amount: number }[];
    };
    await page.getByLabel('Valued as of').fill(holdings.asOf);
    for (const [k, p] of holdings.positions.entries()) {
      if (k > 0) await page.getByRole('button', { name: 'Add a position' }).click();
      await page.getByLabel(`Asset of row ${k + 1}`).fill(p.asset);
      await page.getByLabel(`Market value of row ${k + 1}`).fill(String(p.amount));
      await page.getByLabel(`Currency of row ${k + 1}`).fill('EUR');
    }
    await page.getByRole('button', { name: 'Save holdings' }).click();
    await page.getByRole('table').filter({ hasText: 'Market values as of' }).waitFor();
  });

  it('4. a new scenario computes its comparison on monthly returns at once', async () => {
    await page.getByRole('button', { name: 'New scenario' }).click();
    await page.getByLabel('Scenario name').fill('First review of my own funds');
    await page.getByLabel('Your initials').fill('AD');
    await page.getByRole('button', { name: 'Create scenario' }).click();
    await page.getByTestId('comparison-table').waitFor({ timeout: 60_000 });
    await expect
      .poll(() => page.getByTestId('recompute-status').getAttribute('data-state'), { timeout: 60_000 })
      .toBe('fresh');
    expect(await page.getByLabel('Return frequency').inputValue()).toBe('monthly');
    expect(await page.getByTestId('starting-note').innerText()).toContain('stated defaults');
  }, 120_000);

  it('5-7. walk-forward, a revision with a note, and the printed memo', async () => {
    await page.getByRole('button', { name: 'Run the walk-forward test' }).click();
    await page.getByText(/^Finished in /).waitFor({ timeout: 180_000 });
    await page.getByRole('button', { name: 'Save as revision…' }).click();
    await page.getByLabel('Note for the file (what changed and why)').fill('First review, walk-forward run.');
    await page.getByRole('button', { name: 'Save revision', exact: true }).click();
    await expect.poll(() => page.getByTestId('revision-saved').textContent(), { timeout: 20_000 }).toMatch(/^Saved/);
    expect(await printMemo(page)).toMatch(/^Printed the memo of revision \d+; it is listed below\.$/);
    const [download] = await Promise.all([
      page.waitForEvent('download', { timeout: 30_000 }),
      page
        .getByTestId('memo-section')
        .getByRole('button', { name: /^Download the PDF of the memo printed/ })
        .click(),
    ]);
    const pdf = join(dir, 'memo.pdf');
    await download.saveAs(pdf);
    const text = execFileSync('pdftotext', ['-layout', '-enc', 'UTF-8', pdf, '-'], { encoding: 'utf8' });
    expect(text).toContain(HOUSEHOLD);
    for (const asset of ['MY-EQ', 'MY-BOND', 'MY-GOLD', 'MY-CASH']) expect(text).toContain(asset);
    expect(text).toContain('Past performance does not guarantee future results.');
  }, 300_000);

  it('logged no console error and asked no other origin', () => {
    expect(app.consoleErrors).toEqual([]);
    expect(app.foreignRequests).toEqual([]);
  });
});
