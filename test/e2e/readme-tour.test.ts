import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { Locator, Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { ARTIFACTS, describeInBrowser, launchApp, type AppSession } from './harness.js';
import { printMemo } from './memo-steps.js';

/**
 * The README's five-minute tour, walked on the demonstration store as `npm start` opens it. Each
 * picture goes to test/artifacts/ on every run, and to docs/images/ (committed, named by the
 * README) whenever the words on that part of the screen changed: a picture is kept while only
 * its figures and times differ (timings, today's date), so a test run does not rewrite committed
 * files for nothing. test/docs/examples.test.ts fails when the README names a picture that is not
 * there.
 */
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
const IMAGES = join(root, 'docs', 'images');
/**
 * The page's words with every figure, duration, month and hexadecimal hash (a memo's, which
 * covers its date and figures) masked: what decides whether a picture is stale.
 */
const wordsOf = (text: string) =>
  `${text
    .replace(/\b(?=[0-9a-f]*\d)[0-9a-f]{8,}\b/g, '#')
    .replace(/\b(Jan|Feb|Mar|Apr|May|Jun|Jul|Aug|Sep|Oct|Nov|Dec)\b|\b[AP]M\b/g, '~')
    .replace(/[−+]?\d+(?:[.,:]\d+)*(?:\s*(?:ms|s)\b)?/g, '#')
    .replace(/[ \t]+/g, ' ')
    .trim()}\n`;

describeInBrowser('the README tour, on the demonstration store', () => {
  let app: AppSession;
  let page: Page;
  /** The viewport with `what` at its top, as a reader scrolls to it. */
  const picture = async (name: string, what: Locator) => {
    // Below the page's sticky status line, which would cover the heading.
    await what.evaluate((el) => {
      el.scrollIntoView({ block: 'start' });
      window.scrollBy(0, -72);
    });
    await page.evaluate(() => document.fonts.ready);
    const png = await page.screenshot({ path: join(ARTIFACTS, `${name}.png`) });
    // The page's words, without the status lines that change with timing (the draft's autosave).
    const words = wordsOf(
      await page.evaluate(() => {
        let text = document.body.innerText;
        for (const id of ['draft-status', 'recompute-status'])
          for (const el of Array.from(document.querySelectorAll<HTMLElement>(`[data-testid=${id}]`)))
            text = text.replace(el.innerText, '');
        return text;
      }),
    );
    const wordsFile = join(IMAGES, `${name}.words.txt`);
    const image = join(IMAGES, `${name}.png`);
    if (!existsSync(image) || !existsSync(wordsFile) || readFileSync(wordsFile, 'utf8') !== words) {
      writeFileSync(image, png);
      writeFileSync(wordsFile, words);
    }
  };

  beforeAll(async () => {
    mkdirSync(IMAGES, { recursive: true });
    mkdirSync(ARTIFACTS, { recursive: true });
    app = await launchApp({ demo: true });
    page = app.page;
    page.setDefaultTimeout(30_000);
    await page.setViewportSize({ width: 1280, height: 800 });
    // The adviser's initials, as the settings page keeps them (the memo prints them as preparer).
    await app.served.service['settings.set']({ preparedBy: 'AD' });
    await page.goto(app.url);
    await page.getByTestId('comparison-table').waitFor({ timeout: 60_000 });
    await page.waitForFunction(
      () => document.querySelector('[data-testid=recompute-status]')?.getAttribute('data-state') === 'fresh',
      undefined,
      { timeout: 60_000 },
    );
  }, 120_000);
  afterAll(async () => {
    await app?.close();
  });

  it('1. the demo scenario opens with its candidates side by side', async () => {
    expect(await page.locator('[data-testid=comparison-table] th[data-candidate]').count()).toBeGreaterThan(1);
    await picture('tour-1-candidates', page.locator('#answer-title'));
  });

  it('2. the reasons: why each asset is in or out, and what each limit costs', async () => {
    const reasons = page.getByTestId('reasons');
    await reasons.waitFor();
    expect(await reasons.innerText()).toMatch(/\S/);
    await picture('tour-2-reasons', page.locator('#reasons-title'));
  });

  it('3. the walk-forward test and the stress views, on request', async () => {
    await page.getByRole('button', { name: 'Run the walk-forward test' }).click();
    await page.getByTestId('walkforward-view').waitFor({ timeout: 240_000 });
    expect(await page.getByTestId('stress-table').locator('tbody tr').count()).toBeGreaterThan(0);
    await picture('tour-3-walk-forward', page.locator('#walkforward-title'));
  }, 300_000);

  it('4. the memo printed from the saved revision, listed for the file', async () => {
    expect(await printMemo(page)).toMatch(/^Printed the memo of revision \d+; it is listed below\.$/);
    await picture('tour-4-memo', page.getByRole('heading', { name: '4. The memo for the file' }));
  }, 240_000);

  it('the tour logged no console error and asked no other origin', () => {
    expect(app.consoleErrors).toEqual([]);
    expect(app.foreignRequests).toEqual([]);
  });
});
