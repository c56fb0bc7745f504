import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { DEMO_FILE_NAMES, DEMO_UNIVERSE_NAME, demoFiles, generateDemo } from '../../shared-core/demo/index.js';
import { openStore } from '../../src-main/store/store.js';
import { describeInBrowser, launchApp, type AppSession } from './harness.js';

/**
 * The households and price-library screens in a real browser, on a fresh empty store: a
 * household is created with the keyboard and the form, the demo price file is imported through
 * the page (progress and validation report seen), the coverage picture and a price chart are
 * checked against the file itself, holdings are entered, a scenario is started, and the page is
 * reloaded with everything still there. Screenshots of each screen go to test/artifacts/.
 */

/** What the demo price file holds, read from its text (not from Holdfast): the outside check. */
function readWideCsv(text: string) {
  const lines = text.trim().split('\n');
  const assets = lines[0].split(',').slice(1);
  const perAsset = new Map(assets.map((a) => [a, { count: 0, first: '', last: '' }]));
  for (const line of lines.slice(1)) {
    const cells = line.split(',');
    assets.forEach((a, i) => {
      if (cells[i + 1] === '' || cells[i + 1] === undefined) return;
      const s = perAsset.get(a)!;
      s.count++;
      if (!s.first) s.first = cells[0];
      s.last = cells[0];
    });
  }
  return { assets, rows: lines.length - 1, perAsset, cells: [...perAsset.values()].reduce((n, s) => n + s.count, 0) };
}

describeInBrowser('households and price library in Chromium', () => {
  let app: AppSession;
  let dir: string;
  let csvPath: string;
  const demo = generateDemo();
  const csvText = demoFiles(demo).find((f) => f.name === DEMO_FILE_NAMES.prices)!.text;
  const csv = readWideCsv(csvText);
  const lateStarter = [...csv.perAsset.entries()].find(([, s]) => s.first > demo.prices.dates[0])!;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'holdfast-app-e2e-'));
    const storePath = join(dir, 'empty.sqlite');
    openStore(storePath).close();
    csvPath = join(dir, DEMO_FILE_NAMES.prices);
    writeFileSync(csvPath, csvText);
    app = await launchApp({ demo: false, storePath });
  });
  afterAll(async () => {
    await app?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('opens on the household list of an empty store, with the cautions on screen', async () => {
    const { page } = app;
    await page.goto(app.url);
    await page.getByRole('heading', { name: 'Households', level: 1 }).waitFor();
    await page.getByText('No household yet.').waitFor();
    const footer = await page.getByRole('contentinfo', { name: 'Cautions' }).innerText();
    expect(footer).toContain('estimate from past data');
    expect(footer).toContain('Past performance does not guarantee future results');
    expect(footer).toContain('licensed adviser');
    await app.screenshot('app-households-empty');
  });

  it('reaches "New household" with the keyboard alone and explains a bad currency beside the field', async () => {
    const { page } = app;
    await page.locator('body').focus();
    let focused = '';
    for (let i = 0; i < 20 && focused !== 'New household'; i++) {
      await page.keyboard.press('Tab');
      focused = await page.evaluate(() => (document.activeElement as HTMLElement | null)?.innerText ?? '');
    }
    expect(focused).toBe('New household');
    await page.keyboard.press('Enter');
    await page.getByRole('heading', { name: 'New household', level: 1 }).waitFor();
    await page.getByLabel('Name', { exact: true }).fill('Invented Aalto-Berg household');
    const currency = page.getByLabel('Base currency');
    await currency.fill('eu');
    await page.getByText('expected an ISO 4217 code such as EUR').waitFor();
    expect(await currency.getAttribute('aria-invalid')).toBe('true');
    await currency.fill('eur');
    expect(await currency.inputValue()).toBe('EUR');
    await page.getByLabel('Client reference').fill('INV-042');
    await app.screenshot('app-household-new');
    await page.getByRole('button', { name: 'Create household' }).click();
    await page.getByRole('heading', { name: 'Invented Aalto-Berg household', level: 1 }).waitFor();
    await page.getByText('No holdings on file.').waitFor();
  });

  it('imports the demo price file through the page: progress, report per asset, then written', async () => {
    const { page } = app;
    await page.getByRole('link', { name: 'Price library' }).click();
    await page.getByText('The store holds no prices yet.').waitFor();
    await page.getByRole('link', { name: 'Import a price file' }).first().click();
    await page.getByRole('heading', { name: 'Import a price file', level: 1 }).waitFor();
    await page.getByLabel('Price file', { exact: true }).setInputFiles(csvPath);
    await page.getByLabel('Add the assets to universe').fill(DEMO_UNIVERSE_NAME);
    await page.getByRole('button', { name: 'Check the file' }).click();
    const bar = page.getByRole('progressbar', { name: 'Checking progress' });
    await bar.waitFor();
    await expect.poll(() => bar.getAttribute('aria-valuenow'), { timeout: 30_000 }).toBe('100');
    expect(await page.getByTestId('import-progress').innerText()).toBe(
      `Checking: 100% · ${csv.rows.toLocaleString('en-US')} rows`,
    );
    await page.getByText('Checked; nothing written yet').waitFor();
    const report = page.getByRole('table', { name: 'Per asset' });
    expect(await report.locator('tbody tr').count()).toBe(csv.assets.length);
    const lateRow = report.locator('tbody tr', { hasText: lateStarter[0] }).first();
    expect(await lateRow.locator('td').nth(1).innerText()).toBe(lateStarter[1].count.toLocaleString('en-US'));
    await app.screenshot('app-import-report');
    await page.getByRole('button', { name: 'Write to the store' }).click();
    const written = page.getByText(/^Written: /);
    await written.waitFor({ timeout: 30_000 });
    expect(await written.innerText()).toContain(
      `Written: ${csv.cells.toLocaleString('en-US')} closes added, 0 replaced`,
    );
    expect(await written.innerText()).toContain(`${csv.assets.length} new assets`);
    await page.getByRole('table').filter({ hasText: 'Closes added' }).getByText(DEMO_FILE_NAMES.prices).waitFor();
  });

  it('shows the coverage picture: one row per asset, the late starts named, figures as in the file', async () => {
    const { page } = app;
    await page.getByRole('link', { name: `See ${DEMO_UNIVERSE_NAME}` }).click();
    const picture = page.getByTestId('coverage-picture');
    await picture.waitFor();
    const labels = await picture.locator('text[text-anchor="end"][font-size="12"]').allTextContents();
    expect(labels).toEqual(csv.assets);
    const finding = await page.locator('.chart-title').first().innerText();
    expect(finding).toContain('start late');
    expect(finding).toContain(lateStarter[0]);
    await page.getByText('The figures behind the picture').click();
    const row = page.locator('table.grid tbody tr', { hasText: lateStarter[0] }).first();
    expect(await row.locator('td').nth(1).innerText()).toBe(lateStarter[1].count.toLocaleString('en-US'));
    await app.screenshot('app-library-coverage');
  });

  it('charts one asset: its closes counted as in the file, on a canvas', async () => {
    const { page } = app;
    const [asset, stats] = lateStarter;
    await page.getByRole('link', { name: `Chart ${asset}` }).click();
    const title = page.locator('figure[aria-label^="Price chart"] .chart-title');
    await expect.poll(() => title.innerText()).toMatch(new RegExp(`^${asset}: `));
    expect(await title.innerText()).toContain(`${stats.count.toLocaleString('en-US')} closes`);
    expect(await page.getByTestId('price-chart').locator('canvas').count()).toBeGreaterThan(0);
    await page.getByRole('button', { name: 'Logarithmic' }).click();
    expect(await page.getByRole('button', { name: 'Logarithmic' }).getAttribute('aria-pressed')).toBe('true');
    await page.getByTestId('price-chart').scrollIntoViewIfNeeded();
    await app.screenshot('app-library-chart');
  });

  it('keeps holdings as amounts with thousands separators and ISO codes, weights with one decimal', async () => {
    const { page } = app;
    const [first, second] = csv.assets;
    await page.getByRole('link', { name: 'Households' }).first().click();
    await page.getByRole('link', { name: 'Invented Aalto-Berg household' }).click();
    await page.getByRole('button', { name: 'Enter holdings' }).click();
    await page.getByLabel('Valued as of').fill('2025-12-31');
    await page.getByLabel('Asset of row 1').fill(first);
    await page.getByLabel('Market value of row 1').fill('1,250,000');
    await page.getByLabel('Currency of row 1').fill('EUR');
    await page.getByRole('button', { name: 'Add a position' }).click();
    await page.getByLabel('Asset of row 2').fill('NO-SUCH-ASSET');
    await page.getByText("no asset 'NO-SUCH-ASSET' in the store").waitFor();
    expect(await page.getByRole('button', { name: 'Save holdings' }).isDisabled()).toBe(true);
    await page.getByLabel('Asset of row 2').fill(second);
    await page.getByLabel('Market value of row 2').fill('750000');
    await page.getByLabel('Currency of row 2').fill('EUR');
    await page.getByRole('button', { name: 'Save holdings' }).click();
    const table = page.getByRole('table').filter({ hasText: 'Market values as of' });
    await table.waitFor();
    const firstRow = table.locator('tbody tr', { hasText: first });
    expect(await firstRow.locator('td').nth(2).innerText()).toBe('1,250,000 EUR');
    expect(await firstRow.locator('td').nth(4).innerText()).toBe('62.5%');
    expect(await table.locator('tfoot td').first().innerText()).toBe('2,000,000 EUR');
  });

  it('signs the work with the initials from settings and starts a scenario at revision 1', async () => {
    const { page } = app;
    await page.getByRole('link', { name: 'Settings' }).click();
    await page.getByLabel('Your initials').fill('q');
    await page.getByText('two to four letters, such as JD').waitFor();
    await page.getByLabel('Your initials').fill('qa');
    await page.getByRole('button', { name: 'Save' }).click();
    await page.getByText('Saved.').waitFor();
    await app.screenshot('app-settings');
    await page.getByRole('link', { name: 'Households' }).first().click();
    await page.getByRole('link', { name: 'Invented Aalto-Berg household' }).click();
    await page.getByRole('button', { name: 'New scenario' }).click();
    await page.getByLabel('Scenario name').fill('Invented first review');
    // Initials are asked once: the settings' are used, not asked again.
    await page.getByText('Signed as').waitFor();
    await page.getByRole('button', { name: 'Create scenario' }).click();
    await page.waitForURL(/#\/households\/\d+\/scenarios\/\d+$/);
    await page
      .getByRole('navigation', { name: 'You are here' })
      .getByRole('link', { name: 'Invented Aalto-Berg household' })
      .click();
    const card = page.getByRole('article', { name: 'Scenario Invented first review' });
    await card.waitFor();
    expect(await card.innerText()).toContain('Revision 1');
    expect(await card.innerText()).toContain('by QA');
    await card.getByRole('button', { name: /Show the 1 revision/ }).click();
    await card
      .getByRole('table')
      .getByText(/^Started: /)
      .waitFor();
    await app.screenshot('app-household');
  });

  it('after a reload everything is still there, and the page logged no error and asked no other origin', async () => {
    const { page } = app;
    await page.reload();
    await page.getByRole('heading', { name: 'Invented Aalto-Berg household', level: 1 }).waitFor();
    await page.getByRole('article', { name: 'Scenario Invented first review' }).waitFor();
    await page.getByRole('table').filter({ hasText: 'Market values as of' }).waitFor();
    await page.getByRole('link', { name: 'Households', exact: true }).first().click();
    const row = page.locator('table.grid tbody tr', { hasText: 'Invented Aalto-Berg household' });
    expect(await row.locator('td').nth(2).innerText()).toBe('2,000,000 EUR');
    await app.screenshot('app-households');
    expect(app.consoleErrors).toEqual([]);
    expect(app.foreignRequests).toEqual([]);
  });
});

describeInBrowser('the demonstration store on the household screens in Chromium', () => {
  let app: AppSession;
  const demo = generateDemo();

  beforeAll(async () => {
    app = await launchApp({ demo: true });
  });
  afterAll(async () => {
    await app?.close();
  });

  it('opens on the demo scenario, and its household shows holdings in their own currencies valued in EUR', async () => {
    const { page } = app;
    await page.goto(app.url);
    await page.waitForURL(/#\/households\/\d+\/scenarios\/\d+$/, { timeout: 30_000 });
    await page.getByRole('link', { name: 'Households' }).first().click();
    await page.getByRole('link', { name: demo.household.name }).click();
    const table = page.getByRole('table').filter({ hasText: 'Market values as of' });
    await table.waitFor();
    const usd = demo.holdings.find((h) => h.currency === 'USD')!;
    const usdRow = table.locator('tbody tr', { hasText: usd.asset });
    expect(await usdRow.locator('td').nth(2).innerText()).toBe(`${usd.amount.toLocaleString('en-US')} USD`);
    // Valued at the stored USD/EUR series (the demo's FX file), so not the dollar figure again.
    const inEur = await usdRow.locator('td').nth(3).innerText();
    expect(inEur).toMatch(/^[\d,]+ EUR$/);
    expect(inEur).not.toBe(`${usd.amount.toLocaleString('en-US')} EUR`);
    expect(await page.getByText(/^Exchange rates: USD to EUR /).count()).toBe(1);
    expect(await table.locator('tbody tr').count()).toBe(demo.holdings.length);
    await page.getByRole('article').first().waitFor();
    await app.screenshot('app-demo-household');
    expect(app.consoleErrors).toEqual([]);
  });
});
