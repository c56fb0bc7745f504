import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { formatPct, formatPercent1, formatRatio2 } from '../../shared-core/present/format.js';
import type { BacktestJson } from '../../shared-core/walkforward/backtest-json.js';
import { SECTION_TITLES } from '../../src-main/memo/render-memo.js';
import { openStore } from '../../src-main/store/store.js';
import { ARTIFACTS, describeInBrowser, launchApp, type AppSession } from './harness.js';
import { printMemo } from './memo-steps.js';

/**
 * The whole job as a new advisor does it, on an empty store and the tool's own defaults: import
 * a price file of their own (daily series and one fund priced at month-ends), create a household
 * and its holdings, create a scenario and see a computed comparison without touching a setting,
 * run the walk-forward on its defaults, save with initials (asked once), print the memo, and
 * check the PDF's weights, read back with poppler's pdftotext (an independent PDF reader),
 * against `holdfast solve` on the same store. Screenshots of every screen go to test/artifacts/.
 */
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const HOUSEHOLD = 'Invented Ferreira-Okonkwo household';
const UNIVERSE = 'My own funds (invented)';
const SCENARIO = 'First review on the defaults';
const DAILY = ['OWN-EQ-1', 'OWN-EQ-2', 'OWN-BD-1', 'OWN-BD-2', 'OWN-GLD'];
const MONTHLY = 'OWN-FND';

/** A seeded price file: weekday closes 2016-2025, and month-end closes only for the fund (mulberry32, Box-Muller). */
function ownPriceFile(): string {
  let seed = 20260105;
  const uniform = () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const normal = () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform());
  const dates: string[] = [];
  for (let d = Date.UTC(2016, 0, 1); d <= Date.UTC(2025, 11, 31); d += 86_400_000) {
    const day = new Date(d).getUTCDay();
    if (day !== 0 && day !== 6) dates.push(new Date(d).toISOString().slice(0, 10));
  }
  const monthEnd = new Set(dates.filter((d, i) => dates[i + 1]?.slice(0, 7) !== d.slice(0, 7)));
  const vols = [0.18, 0.22, 0.05, 0.07, 0.15, 0.1];
  const level = [100, 50, 100, 80, 120, 10];
  const lines = [['date', ...DAILY, MONTHLY].join(',')];
  for (const date of dates) {
    const market = normal();
    const cells = level.map((p, j) => {
      const beta = j < 2 ? 0.8 : j === 5 ? 0.5 : 0.1;
      const shock = (vols[j] / Math.sqrt(252)) * (beta * market + Math.sqrt(1 - beta * beta) * normal());
      level[j] = p * Math.exp(0.0002 + shock);
      return level[j].toFixed(4);
    });
    if (!monthEnd.has(date)) cells[5] = '';
    lines.push([date, ...cells].join(','));
  }
  return `${lines.join('\n')}\n`;
}

describeInBrowser('a new user, from an empty store to a printed memo, on the defaults', () => {
  let app: AppSession;
  let page: Page;
  let dir: string;
  let storePath: string;
  let csvPath: string;
  const shot = (name: string) => app.screenshot(`new-user-${name}`);
  const scenarioId = () => /scenarios\/(\d+)$/.exec(page.url())![1];
  /** A command of the built command line on the same stored scenario, its JSON read back. */
  const onStore = (command: 'solve' | 'backtest'): unknown => {
    const args = ['--store', storePath, '--household', HOUSEHOLD, '--scenario', SCENARIO, '--json'];
    const run = spawnSync(process.execPath, [join(root, 'dist/src-main/cli/main.js'), command, ...args], {
      encoding: 'utf8',
    });
    expect(run.status, run.stderr).toBe(0);
    return JSON.parse(run.stdout);
  };

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'holdfast-new-user-'));
    storePath = join(dir, 'store.sqlite');
    openStore(storePath).close();
    csvPath = join(dir, 'my-prices.csv');
    writeFileSync(csvPath, ownPriceFile());
    app = await launchApp({ demo: false, storePath });
    page = app.page;
    page.setDefaultTimeout(20_000);
  });
  afterAll(async () => {
    await app?.close();
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('1. imports a price file of their own', async () => {
    await page.goto(app.url);
    await page.getByText('No household yet.').waitFor();
    await shot('01-households-empty');
    await page.getByRole('link', { name: 'Price library' }).first().click();
    await page.getByRole('link', { name: 'Import a price file' }).first().click();
    await page.getByLabel('Price file', { exact: true }).setInputFiles(csvPath);
    await page.getByLabel('Add the assets to universe').fill(UNIVERSE);
    await page.getByLabel('Price currency of new assets').fill('EUR');
    await page.getByRole('button', { name: 'Check the file' }).click();
    await page.getByText('Checked; nothing written yet').waitFor({ timeout: 60_000 });
    await shot('02-import-report');
    await page.getByRole('button', { name: 'Write to the store' }).click();
    await page.getByText(/^Written: /).waitFor({ timeout: 60_000 });
    await shot('03-import-written');
    await page.getByRole('link', { name: `See ${UNIVERSE}` }).click();
    await page.getByTestId('coverage-picture').waitFor();
    await shot('04-library-coverage');
  }, 120_000);

  it('2. creates a household and its holdings', async () => {
    await page.getByRole('link', { name: 'Households' }).first().click();
    await page.getByRole('link', { name: 'New household' }).first().click();
    await page.getByLabel('Name', { exact: true }).fill(HOUSEHOLD);
    await page.getByLabel('Base currency').fill('EUR');
    await shot('05-household-new');
    await page.getByRole('button', { name: 'Create household' }).click();
    await page.getByRole('heading', { name: HOUSEHOLD, level: 1 }).waitFor();
    await page.getByRole('button', { name: 'Enter holdings' }).click();
    await page.getByLabel('Valued as of').fill('2025-12-31');
    const positions = [
      ['OWN-EQ-1', '400,000'],
      ['OWN-BD-1', '350,000'],
      [MONTHLY, '250,000'],
    ];
    for (const [k, [asset, amount]] of positions.entries()) {
      if (k > 0) await page.getByRole('button', { name: 'Add a position' }).click();
      await page.getByLabel(`Asset of row ${k + 1}`).fill(asset);
      await page.getByLabel(`Market value of row ${k + 1}`).fill(amount);
      await page.getByLabel(`Currency of row ${k + 1}`).fill('EUR');
    }
    await page.getByRole('button', { name: 'Save holdings' }).click();
    const table = page.getByRole('table').filter({ hasText: 'Market values as of' });
    await table.waitFor();
    expect(await table.locator('tfoot td').first().innerText()).toBe('1,000,000 EUR');
    await shot('06-household-holdings');
  });

  it('3. creates a scenario on its defaults and sees a computed comparison', async () => {
    await page.getByRole('button', { name: 'New scenario' }).click();
    await page.getByLabel('Scenario name').fill(SCENARIO);
    // Initials are asked here once, the settings being empty, and kept there.
    await page.getByLabel('Your initials').fill('nu');
    await shot('07-scenario-new');
    await page.getByRole('button', { name: 'Create scenario' }).click();
    await page.waitForURL(/#\/households\/\d+\/scenarios\/\d+$/);
    expect((await app.served.service['settings.get']({})).preparedBy).toBe('NU');
    const status = page.getByTestId('recompute-status');
    const table = page.getByTestId('comparison-table');
    await table.waitFor({ timeout: 60_000 });
    await expect.poll(() => status.getAttribute('data-state'), { timeout: 60_000 }).toBe('fresh');
    // The frequency followed the fund priced at month-ends; the page says where the limits came from.
    expect(await page.getByLabel('Return frequency').inputValue()).toBe('monthly');
    const started = await page.getByTestId('starting-note').innerText();
    expect(started).toContain('stated defaults');
    expect(started).toContain(`Monthly returns, because ${MONTHLY} is priced monthly`);
    // Every asset shows (no inner scroll box), and the current column has its figures.
    const weights = table.locator('tbody.weights tr');
    expect(await weights.count()).toBe(DAILY.length + 1);
    for (const row of await weights.all()) expect(await row.isVisible()).toBe(true);
    const currentVol = await table.locator('td[data-candidate=current][data-metric=Volatility]').innerText();
    expect(currentVol).toMatch(/^\d+\.\d%$/);
    const currentDr = await table
      .locator('td[data-candidate=current][data-metric="Diversification ratio"]')
      .innerText();
    expect(currentDr).toMatch(/^\d\.\d\d$/);
    expect(
      await table.locator('th[data-candidate]').evaluateAll((ths) => ths.map((t) => t.getAttribute('data-candidate'))),
    ).toEqual(['lw-maxdiv']);
    // No JSON path and no fraction anywhere on the page.
    const text = await page.locator('body').innerText();
    expect(text).not.toMatch(/constraints\.|backtest\.|returns\.frequency|weightBounds/);
    await shot('08-scenario-computed');
  }, 120_000);

  it("a cap of 150 % is refused in the field's words, and the comparison stays", async () => {
    const cap = page.getByLabel('Default cap per asset');
    await cap.fill('150');
    const note = page.getByText('must be at most 100 %').first();
    await note.waitFor();
    expect(await page.getByTestId('input-problems').innerText()).toContain('Default cap per asset');
    await shot('09-scenario-cap-refused');
    await cap.fill('');
    await expect
      .poll(() => page.getByTestId('recompute-status').getAttribute('data-state'), { timeout: 60_000 })
      .toBe('fresh');
  }, 90_000);

  it('4. runs the walk-forward on its defaults', async () => {
    await page.getByRole('button', { name: 'Run the walk-forward test' }).click();
    const bar = page.getByRole('progressbar', { name: 'Walk-forward progress' });
    if (await bar.isVisible().catch(() => false)) {
      const box = await bar.locator('.progress-track').boundingBox();
      expect(box?.width ?? 0).toBeGreaterThan(100);
    }
    await page.getByText(/^Finished in /).waitFor({ timeout: 180_000 });
    const section = page.locator('.walkforward-section');
    expect(await section.getByText('did not run').count()).toBe(0);
    expect(await section.innerText()).toContain('trailing 36-period window (chosen from the history');
    await section.scrollIntoViewIfNeeded();
    await shot('10-walk-forward');
    // The run keeps its settings in the draft, so the revision saved next carries them (and its memo
    // the walk-forward), and keeping them does not date the figures just shown.
    await expect
      .poll(async () => (await app.served.service['scenarios.get']({ scenarioId: scenarioId() })).draft?.document, {
        timeout: 20_000,
      })
      .toMatchObject({ backtest: { rebalance: 'monthly', costBps: 10 } });
    expect(await section.getByText('before your latest edits').count()).toBe(0);
  }, 240_000);

  it('5. saves with the initials kept in the settings (not asked again)', async () => {
    await page.getByRole('button', { name: 'Save as revision…' }).click();
    await page.getByLabel('Note for the file (what changed and why)').fill('Defaults reviewed; walk-forward run.');
    await page.getByTestId('revision-signed').waitFor();
    expect(await page.locator('#revision-initials').count()).toBe(0);
    await shot('11-save-dialog');
    await page.getByRole('button', { name: 'Save revision', exact: true }).click();
    await expect
      .poll(() => page.getByTestId('revision-saved').textContent(), { timeout: 20_000 })
      .toBe('Saved as revision 2.');
  });

  it('6-7. prints the memo, and its weights are those of holdfast solve on the same store', async () => {
    expect(await printMemo(page)).toBe('Printed the memo of revision 2; it is listed below.');
    const section = page.getByTestId('memo-section');
    await shot('12-memo-printed');
    const [download] = await Promise.all([
      page.waitForEvent('download', { timeout: 30_000 }),
      section.getByRole('button', { name: /^Download the PDF of the memo printed/ }).click(),
    ]);
    const pdf = join(dir, 'memo.pdf');
    await download.saveAs(pdf);
    const text = execFileSync('pdftotext', ['-layout', '-enc', 'UTF-8', pdf, '-'], { encoding: 'utf8' });
    writeFileSync(join(ARTIFACTS, 'new-user-memo.txt'), text);
    // PNGs of every memo page for a reviewer.
    for (const f of readdirSync(ARTIFACTS)) if (/^new-user-memo-\d+\.png$/.test(f)) rmSync(join(ARTIFACTS, f));
    execFileSync('pdftoppm', ['-png', '-r', '60', pdf, join(dir, 'page')]);
    for (const f of readdirSync(dir).filter((f) => /^page-\d+\.png$/.test(f)))
      renameSync(join(dir, f), join(ARTIFACTS, `new-user-memo-${Number(/\d+/.exec(f)![0])}.png`));

    const solved = onStore('solve') as {
      candidates: { id: string; status: string; weights: Record<string, number> }[];
    };
    const recommended = solved.candidates.find((c) => c.id === 'lw-maxdiv')!;
    expect(recommended.status).toBe('optimal');
    const lines = text.split('\n');
    let checked = 0;
    for (const [asset, w] of Object.entries(recommended.weights)) {
      if (w < 0.0005) continue;
      // The allocation table prints weights in per cent without the sign, one column each.
      const printed = formatPercent1(w);
      const row = lines.find((l) => l.split(/\s+/).includes(asset) && l.split(/\s+/).includes(printed));
      expect(row, `${asset} at ${printed} in the memo`).toBeDefined();
      checked++;
    }
    expect(checked).toBeGreaterThan(1);

    // The walk-forward the page ran is in the memo, with the figures of `holdfast backtest` on the
    // same stored scenario (the same use case, shared-core/run/walk-forward.ts).
    expect(text).toContain(SECTION_TITLES.walkForward);
    const walked = onStore('backtest') as BacktestJson;
    // Lines wrap where the page is narrow: read the text as one run of words.
    const flat = text.replace(/\s+/g, ' ');
    expect(flat).toContain(`from ${walked.settings.startDate} to ${walked.settings.endDate}`);
    expect(flat).toContain(`a ${walked.settings.estimationWindow}-period trailing window`);
    for (const c of walked.candidates) {
      const m = c.metrics;
      const figures = [
        formatPct(m.annualisedReturn),
        formatPct(m.volatility),
        formatRatio2(m.sharpeRatio),
        formatPct(-Math.abs(m.maxDrawdown.depth)),
        formatPct(m.turnoverPerYear),
      ];
      // One row of the table: the figures side by side, in its columns' order.
      expect(flat, `${c.id} in the walk-forward table`).toContain(figures.join(' '));
    }
    expect(text).toContain(HOUSEHOLD);
    expect(text).toContain('Past performance does not guarantee future results.');
  }, 300_000);

  it("8. sets the household's mandate, refused above 100 % in the field's words, and a new scenario starts from it", async () => {
    await page.getByRole('link', { name: 'Households' }).first().click();
    await page.getByRole('link', { name: HOUSEHOLD }).click();
    expect(await page.getByTestId('household-mandate').innerText()).toContain('No mandate on file');
    await page.getByRole('button', { name: 'Edit details' }).click();
    const cap = page.getByLabel('Cap per asset');
    await cap.fill('150');
    await page.getByText('the cap per asset must be at most 100 %').waitFor();
    await shot('14-household-mandate-refused');
    await cap.fill('30');
    await page.getByLabel('Cap on illiquid assets together').fill('5');
    await page.getByRole('button', { name: 'Save details' }).click();
    await expect
      .poll(() => page.getByTestId('household-mandate').innerText())
      .toBe('Mandate: no asset above 30.0 %, illiquid assets at most 5.0 % together.');
    await page.getByRole('button', { name: 'New scenario' }).click();
    await page.getByLabel('Scenario name').fill('Second, on the mandate');
    await shot('15-scenario-new-on-mandate');
    await page.getByRole('button', { name: 'Create scenario' }).click();
    await page.waitForURL(/#\/households\/\d+\/scenarios\/\d+$/);
    const started = await page.getByTestId('starting-note').innerText();
    expect(started).toContain(
      "Limits from the household's mandate: long-only, no asset above 30.0 %, illiquid assets at most 5.0 % together.",
    );
    expect(started).not.toContain('stated default');
    expect(await page.getByLabel('Default cap per asset').inputValue()).toBe('30');
    expect(await page.getByLabel('Cap on illiquid assets together').inputValue()).toBe('5');
    await page.getByTestId('comparison-table').waitFor({ timeout: 60_000 });
    await shot('16-scenario-on-mandate');
  }, 120_000);

  it('logged no error, asked no other origin (no favicon 404), and the settings keep the initials', async () => {
    await page.getByRole('link', { name: 'Settings' }).click();
    await expect.poll(() => page.getByLabel('Your initials').inputValue()).toBe('NU');
    await shot('13-settings');
    expect(app.consoleErrors).toEqual([]);
    expect(app.foreignRequests).toEqual([]);
  });
});
