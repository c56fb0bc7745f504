import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { priceTableFromWire } from '../../shared-core/contract/service-api.js';
import { widePriceCsv } from '../../shared-core/demo/index.js';
import type { CliIO } from '../../src-main/cli/command.js';
import { runCli } from '../../src-main/cli/run-cli.js';
import { ARTIFACTS, describeInBrowser, launchApp, type AppSession } from './harness.js';

/**
 * The scenario page in Chromium on the demonstration store: build a 3 x 2 comparison with a 15%
 * cap in the editor, check its six columns against `holdfast solve` on the same scenario, save a
 * revision, reload, and see bad edits explained while the last good comparison stays.
 */
const EXPECTED = ['lw-maxdiv', 'lw-erc', 'oas-maxdiv', 'oas-erc', 'ewma-maxdiv', 'ewma-erc'];

async function columns(page: Page): Promise<string[]> {
  return page
    .locator('[data-testid=comparison-table] th[data-candidate]')
    .evaluateAll((ths) => ths.map((th) => (th as HTMLElement).dataset.candidate ?? ''));
}

/** Every weight on screen: candidate -> asset -> weight (full precision, from the cell's data). */
async function weightsOnScreen(page: Page): Promise<Record<string, Record<string, number>>> {
  const cells = await page
    .locator('[data-testid=comparison-table] td[data-weight]')
    .evaluateAll((tds) =>
      tds.map((td) => [
        (td as HTMLElement).dataset.candidate,
        (td as HTMLElement).dataset.asset,
        (td as HTMLElement).dataset.weight,
      ]),
    );
  const out: Record<string, Record<string, number>> = {};
  for (const [c, a, w] of cells) (out[c as string] ??= {})[a as string] = Number(w);
  return out;
}

async function settled(page: Page, state: 'fresh' | 'kept' = 'fresh'): Promise<void> {
  await page.waitForFunction(
    (want) => document.querySelector('[data-testid=recompute-status]')?.getAttribute('data-state') === want,
    state,
    { timeout: 60_000 },
  );
}

async function waitForColumns(page: Page, ids: readonly string[]): Promise<void> {
  await expect.poll(() => columns(page), { timeout: 60_000 }).toEqual(ids);
  await settled(page);
}

function scenarioIdOf(page: Page): string {
  const match = /scenarios\/([^/?#]+)/.exec(page.url());
  if (!match) throw new Error(`not on a scenario page: ${page.url()}`);
  return decodeURIComponent(match[1]);
}

describeInBrowser('scenario page in Chromium', () => {
  let app: AppSession;
  let page: Page;
  let scenarioId: string;
  let built: Record<string, Record<string, number>> = {};
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-scenario-e2e-'));
  const shownMs: number[] = [];
  const computeMs: number[] = [];
  const chartsMs: number[] = [];

  beforeAll(async () => {
    app = await launchApp({ demo: true });
    page = app.page;
    await page.goto(app.url);
    await page.locator('[data-testid=comparison-table]').waitFor({ timeout: 60_000 });
    await settled(page);
    scenarioId = scenarioIdOf(page);
  });
  afterAll(async () => {
    if (shownMs.length > 0) {
      const sorted = [...shownMs].sort((a, b) => a - b);
      console.log(
        `scenario recompute, last keystroke to comparison painted (6 candidates, demo store): ${sorted.map((v) => v.toFixed(0)).join(', ')} ms; median ${sorted[sorted.length >> 1].toFixed(0)} ms (target 200 ms; reported, not asserted); the charts below it drawn too ${chartsMs.map((v) => v.toFixed(0)).join(', ')} ms; in the worker ${computeMs.map((v) => v.toFixed(0)).join(', ')} ms`,
      );
    }
    await app?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('opens on the demo scenario with its candidates side by side', async () => {
    expect((await columns(page)).length).toBe(6);
    // The notes about the data say their days in the reader's locale, as the rest of the page.
    const notes = await page.locator('.data-warnings').innerText();
    expect(notes).toContain('HF-MACRO starts on Jan 31, 2018, after the window start Dec 31, 2017');
    expect(notes).not.toMatch(/\d{4}-\d\d-\d\d/);
    await app.screenshot('scenario-page-demo');
  });

  it('builds 3 risk estimates x 2 objectives with a 15% cap in the editor: six columns', async () => {
    await page.getByRole('button', { name: 'Remove Sample' }).click();
    await page.getByRole('button', { name: /^Remove Exponentially weighted/ }).click();
    await page.getByRole('button', { name: 'Remove Minimum variance' }).click();
    await page.getByLabel('Risk estimate to add').selectOption('oas');
    await page.getByRole('button', { name: 'Add risk estimate' }).click();
    await page.getByLabel('Risk estimate to add').selectOption('ewma');
    await page.getByRole('button', { name: 'Add risk estimate' }).click();
    await page.getByLabel('Objective to add').selectOption('equal-risk-contribution');
    await page.getByRole('button', { name: 'Add objective' }).click();
    // `holdfast solve --prices` reads a price file without currencies, so the comparison with it
    // keeps to the assets priced in the base currency: the USD-priced share is left out here.
    await page.locator('input[data-asset="LMI-US"]').uncheck();
    const cap = page.getByLabel('Default cap per asset');
    await cap.fill('');
    await cap.pressSequentially('15');
    await waitForColumns(page, EXPECTED);
    built = await weightsOnScreen(page);
    expect(Object.keys(built).sort()).toEqual([...EXPECTED].sort());
    for (const id of EXPECTED) {
      const w = Object.values(built[id]);
      expect(w.reduce((s, x) => s + x, 0)).toBeCloseTo(1, 6);
      expect(Math.max(...w)).toBeLessThanOrEqual(0.15 + 1e-7);
    }
  });

  it('saves the comparison as a revision with a note', async () => {
    await page.getByRole('button', { name: 'Save as revision…' }).click();
    await page.getByLabel('Note for the file (what changed and why)').fill('Three estimates, two objectives, 15% cap');
    await page.getByLabel('Your initials').fill('EM');
    await page.getByRole('button', { name: 'Save revision' }).click();
    await expect
      .poll(() => page.getByTestId('revision-saved').textContent(), { timeout: 20_000 })
      .toMatch(/^Saved as revision \d+\.$/);
  });

  it("the weights on screen equal `holdfast solve` on the saved scenario and the store's prices", async () => {
    const revisions = await app.served.service['scenarios.revisions']({ scenarioId });
    const latest = await app.served.service['scenarios.revision']({ scenarioId, revision: revisions[0].number });
    expect(revisions[0].note).toBe('Three estimates, two objectives, 15% cap');
    const document = latest.document as { assets: string[]; current?: Record<string, number> };
    // The price file holds every asset the scenario names, the held ones it leaves out (sold) too.
    const held = Object.keys(document.current ?? {}).filter((a) => !document.assets.includes(a));
    const prices = await app.served.service['prices.table']({ assets: [...document.assets, ...held] });
    const pricesFile = join(dir, 'prices.csv');
    const scenarioFile = join(dir, 'scenario.json');
    writeFileSync(pricesFile, widePriceCsv(priceTableFromWire(prices.table), 6));
    writeFileSync(scenarioFile, JSON.stringify(latest.document, null, 2));
    const out: string[] = [];
    const err: string[] = [];
    const io: CliIO = {
      stdout: (t) => out.push(t),
      stderr: (t) => err.push(t),
      cwd: dir,
      env: {},
      signal: new AbortController().signal,
    };
    const code = await runCli(['solve', '--prices', pricesFile, '--scenario', scenarioFile, '--json'], io);
    expect(err.join(''), 'holdfast solve wrote to standard error').toBe('');
    expect(code).toBe(0);
    const solved = JSON.parse(out.join('')) as { candidates: { id: string; weights: Record<string, number> }[] };
    expect(solved.candidates.map((c) => c.id)).toEqual(EXPECTED);
    for (const c of solved.candidates)
      for (const [asset, w] of Object.entries(c.weights)) expect(built[c.id][asset] ?? 0).toBeCloseTo(w, 8);
  });

  it('after a reload the revision, its inputs and its comparison are all still there', async () => {
    await page.reload();
    await waitForColumns(page, EXPECTED);
    expect(await page.getByLabel('Default cap per asset').inputValue()).toBe('15');
    expect(await weightsOnScreen(page)).toEqual(built);
    await expect
      .poll(() => page.getByLabel('Revision to open beside the current one').textContent())
      .toContain('Three estimates, two objectives');
    await app.screenshot('scenario-page-built');
  });

  it('a cap below 1/N long-only is explained beside the field and the last good comparison stays', async () => {
    const cap = page.getByLabel('Default cap per asset');
    await cap.fill('3');
    await settled(page, 'kept');
    const problems = await page.getByTestId('input-problems').textContent();
    expect(problems).toContain('Every asset between: the per-asset upper bounds add to');
    expect(problems).toContain('below the 100% invested; long-only with 24 assets needs caps of at least 1/24 = 4.2%');
    await expect
      .poll(() => page.locator('.bound-pair .field-error').first().textContent())
      .toContain('below the 100% invested');
    expect(await weightsOnScreen(page)).toEqual(built);
    await app.screenshot('scenario-page-bad-cap');
    await cap.fill('15');
    await settled(page);
    expect(await weightsOnScreen(page)).toEqual(built);
  });

  it('a window with no prices is explained and the last good comparison stays', async () => {
    await page.getByLabel('Between dates').check();
    await page.getByLabel('From', { exact: true }).fill('2030-01-01');
    await page.getByLabel('To', { exact: true }).fill('2031-06-30');
    await settled(page, 'kept');
    const problems = await page.getByTestId('input-problems').textContent();
    expect(problems).toMatch(
      // Dates on screen are in the browser's locale (en-US here), never ISO.
      /From \(date\): no prices from Jan 1, 2030 to Jun 30, 2031; the prices of these assets run from [A-Z][a-z]{2} \d{1,2}, \d{4} to [A-Z][a-z]{2} \d{1,2}, \d{4}/,
    );
    expect(problems).not.toMatch(/\d{4}-\d\d-\d\d/);
    expect(await weightsOnScreen(page)).toEqual(built);
    await app.screenshot('scenario-page-bad-window');
    // Undo three times: back to the last years of data, and the comparison is fresh again.
    for (let i = 0; i < 3; i++) await page.keyboard.press('Control+z');
    await settled(page);
    expect(await page.getByLabel('Years', { exact: true }).inputValue()).toBe('8');
    expect(await weightsOnScreen(page)).toEqual(built);
  });

  it('recomputes live as the cap is typed (time to the painted comparison is reported)', async () => {
    const cap = page.getByLabel('Default cap per asset');
    const status = page.getByTestId('recompute-status');
    for (const value of ['14', '13', '12', '14', '15']) {
      // The page counts its measures; wait for the one after this edit, not the last one's.
      const before = Number((await status.getAttribute('data-shown-seq')) ?? 0);
      await cap.fill(value);
      await page.waitForFunction(
        ([v, seq]) => {
          const s = document.querySelector('[data-testid=recompute-status]');
          if (!(Number(s?.getAttribute('data-shown-seq') ?? 0) > seq)) return false;
          const cells = Array.from(document.querySelectorAll('[data-testid=comparison-table] td[data-weight]'));
          const max = Math.max(...cells.map((c) => Number((c as HTMLElement).dataset.weight)));
          return (
            s?.getAttribute('data-state') === 'fresh' &&
            s.getAttribute('data-after-edit') === 'true' &&
            max <= v / 100 + 1e-7
          );
        },
        [Number(value), before] as const,
        { timeout: 60_000 },
      );
      shownMs.push(Number(await status.getAttribute('data-shown-ms')));
      computeMs.push(Number(await status.getAttribute('data-compute-ms')));
      chartsMs.push(Number(await status.getAttribute('data-charts-ms')));
    }
    expect(shownMs.every((v) => Number.isFinite(v) && v > 0)).toBe(true);
    // The charts are drawn from the same result, never before the comparison above them.
    expect(chartsMs.every((v, i) => Number.isFinite(v) && v >= shownMs[i])).toBe(true);
  });

  it('opens the saved revision beside the draft and names what changed', async () => {
    await page.getByLabel('Default cap per asset').fill('12');
    await settled(page);
    await page.getByRole('button', { name: 'Open beside' }).click();
    const panel = page.getByTestId('beside-panel');
    await expect
      .poll(() => panel.textContent(), { timeout: 60_000 })
      .toContain('Every asset between: 0 % to 15 % → 0 % to 12 %');
    await expect.poll(() => panel.locator('tbody tr').count(), { timeout: 60_000 }).toBe(6);
    await app.screenshot('scenario-page-beside');
  });

  it('every action of the page is reachable from the keyboard: undo restores the cap', async () => {
    await page.keyboard.press('Control+z');
    await settled(page);
    expect(await page.getByLabel('Default cap per asset').inputValue()).toBe('15');
    // Tab from the top of the page reaches the save button without the mouse.
    await page.evaluate(() => document.getElementById('main')?.focus());
    let reached = false;
    for (let i = 0; i < 40 && !reached; i++) {
      await page.keyboard.press('Tab');
      reached = await page.evaluate(() => document.activeElement?.textContent === 'Save as revision…');
    }
    expect(reached).toBe(true);
  });

  it('walks every candidate forward on request, with progress, and shows the out-of-sample figures side by side', async () => {
    await page.locator('[data-path="backtest.estimationWindow"]').fill('36');
    await settled(page);
    await page.getByRole('button', { name: 'Run the walk-forward test' }).click();
    const view = page.getByTestId('walkforward-view');
    await view.waitFor({ timeout: 180_000 });
    const heads = await page
      .getByTestId('walkforward-metrics')
      .locator('thead th')
      .evaluateAll((ths) => ths.map((th) => th.textContent ?? ''));
    expect(heads.slice(1).map((h) => h.replace(' (reference)', ''))).toEqual(EXPECTED);
    expect(await page.getByTestId('stress-table').locator('tbody tr').count()).toBeGreaterThan(0);
    await page.getByTestId('walkforward-growth').scrollIntoViewIfNeeded();
    await app.screenshot('scenario-page-walkforward');
  }, 240_000);

  it('a maximum Sharpe ratio objective asks for its annualised risk-free rate in per cent', async () => {
    expect(await page.getByLabel('Risk-free rate, annualised').count()).toBe(0);
    await page.getByLabel('Objective to add').selectOption('max-sharpe');
    await page.getByRole('button', { name: 'Add objective' }).click();
    const rate = page.getByLabel('Risk-free rate, annualised');
    await rate.fill('2');
    const head = page.locator('.objective-head').filter({ has: rate });
    await expect.poll(() => head.locator('.objective-name').innerText()).toMatch(/risk-free rate 2\.00\s?%/);
    await rate.fill('two');
    await head
      .locator('.field-error')
      .getByText("'two' is not a number; type a percentage such as 15 or 12.5")
      .waitFor();
    // The grid alone: the whole page is too tall to read the field in.
    await page
      .locator('fieldset.candidate-grid')
      .screenshot({ path: join(ARTIFACTS, 'scenario-page-risk-free-rate.png') });
    await page.getByRole('button', { name: /^Remove Maximum Sharpe ratio/ }).click();
    expect(await rate.count()).toBe(0);
  });

  it('the page logged no console error and asked no other origin', () => {
    expect(app.consoleErrors).toEqual([]);
    expect(app.foreignRequests).toEqual([]);
  });
});
