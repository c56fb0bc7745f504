import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { CAUTIONS as MEMO_CAUTIONS_ON_SCREEN } from '../../src-renderer/app/Cautions.js';
import { ARTIFACTS, describeInBrowser, launchApp, type AppSession } from './harness.js';

/**
 * The memo part of the scenario page in Chromium on the demonstration store: a refusal without
 * initials and a bad lot size are explained in place and print nothing; after saving a revision
 * the memo is printed, listed, downloaded as a PDF whose text (read back with poppler's
 * pdftotext, an independent PDF reader) names the household and carries the caution.
 */
function scenarioIdOf(page: Page): string {
  const match = /scenarios\/([^/?#]+)/.exec(page.url());
  if (!match) throw new Error(`not on a scenario page: ${page.url()}`);
  return decodeURIComponent(match[1]);
}

/** pdftotext's text with its line breaks and hyphen-free wrapping folded to single spaces. */
function pdfText(file: string): string {
  return execFileSync('pdftotext', ['-enc', 'UTF-8', file, '-'], { encoding: 'utf8' }).replace(/\s+/g, ' ');
}

describeInBrowser('memo section of the scenario page in Chromium', () => {
  let app: AppSession;
  let page: Page;
  let scenarioId: string;
  let householdName: string;
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-memo-e2e-'));

  beforeAll(async () => {
    app = await launchApp({ demo: true });
    page = app.page;
    await page.goto(app.url);
    await page.getByTestId('memo-section').waitFor({ timeout: 60_000 });
    scenarioId = scenarioIdOf(page);
    const households = await app.served.service['households.list']({});
    householdName = households[0].name;
    // A fresh store has no initials in its settings; the first print must say so.
    expect((await app.served.service['settings.get']({})).preparedBy).toBeNull();
  });
  afterAll(async () => {
    await app?.close();
    rmSync(dir, { recursive: true, force: true });
  });

  const section = () => page.getByTestId('memo-section');
  const printButton = () => section().getByRole('button', { name: 'Print memo' });
  const memoCount = async () => (await app.served.service['memos.list']({ scenarioId })).length;

  it('says the memo comes from the latest saved revision, with the cautions beside the print action', async () => {
    await expect.poll(() => section().getByTestId('memo-source').textContent()).toMatch(/^Printed from revision \d+,/);
    expect(await section().getByTestId('memo-source').textContent()).toContain('The draft in the editor is not used.');
    const caution = (await section().getByTestId('memo-caution').textContent()) ?? '';
    for (const c of MEMO_CAUTIONS_ON_SCREEN) expect(caution).toContain(c);
    expect(await printButton().getAttribute('aria-describedby')).toContain(
      await section().getByTestId('memo-caution').getAttribute('id'),
    );
    // The date defaults to today on this machine's calendar.
    const now = new Date();
    const pad = (n: number) => String(n).padStart(2, '0');
    expect(await section().getByLabel('Date on the memo').inputValue()).toBe(
      `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`,
    );
    expect(await section().getByTestId('memo-list-empty').textContent()).toContain('No memo printed yet');
  });

  it('a bad lot size shows its reason beside the field and prints nothing', async () => {
    const lot = section().getByLabel('Round trades to lots of');
    const reason = section().getByTestId('memo-lot-reason');
    for (const [typed, why] of [
      ['0', 'a lot size must be more than zero'],
      ['-250', 'a lot size cannot be negative'],
      ['ten thousand', 'only digits and separators, such as 1,250,000'],
      ['', 'enter the lot size, such as 1,000'],
    ] as const) {
      await lot.fill(typed);
      await expect.poll(() => reason.textContent()).toBe(why);
      expect(await lot.getAttribute('aria-invalid')).toBe('true');
      expect(await printButton().isDisabled()).toBe(true);
    }
    await printButton()
      .click({ force: true })
      .catch(() => undefined);
    await lot.press('Enter');
    expect(await memoCount()).toBe(0);
    await section().screenshot({ path: join(ARTIFACTS, 'memo-section-bad-lot.png') });
    await lot.fill('2,500');
    await expect.poll(() => reason.textContent()).toBe('');
    expect(await lot.getAttribute('aria-invalid')).toBeNull();
  });

  it('without initials in the settings, Print memo is disabled with the reason beside it', async () => {
    await expect.poll(() => printButton().isDisabled()).toBe(true);
    const why = section().getByTestId('memo-print-why');
    await expect.poll(() => why.textContent()).toContain('Cannot print yet: no initials in the settings');
    expect(await printButton().getAttribute('aria-describedby')).toContain(await why.getAttribute('id'));
    expect(await why.getByRole('link', { name: 'set them in the settings' }).getAttribute('href')).toBe('#/settings');
    expect(await memoCount()).toBe(0);
  });

  it('after saving a revision, prints its memo from the page and lists it', async () => {
    await app.served.service['settings.set']({ preparedBy: 'EM' });
    const before = await app.served.service['scenarios.revisions']({ scenarioId });
    // An edit, so the saved revision differs from the one the memo section showed so far.
    const cap = page.getByLabel('Default cap per asset');
    await cap.fill((await cap.inputValue()) === '20' ? '25' : '20');
    await expect
      .poll(() => section().getByTestId('memo-unsaved').textContent(), { timeout: 20_000 })
      .toContain(`The editor holds changes that are not in revision ${before[0].number}`);
    await page.getByRole('button', { name: 'Save as revision…' }).click();
    await page.getByLabel('Note for the file (what changed and why)').fill('Before the memo for the file');
    await page.locator('#revision-initials').fill('EM');
    await page.getByRole('button', { name: 'Save revision', exact: true }).click();
    await expect
      .poll(() => page.getByTestId('revision-saved').textContent(), { timeout: 20_000 })
      .toBe(`Saved as revision ${before[0].number + 1}.`);
    const newest = before[0].number + 1;
    await expect.poll(() => section().getByTestId('memo-unsaved').count()).toBe(0);
    await expect
      .poll(() => section().getByTestId('memo-source').textContent())
      .toMatch(new RegExp(`^Printed from revision ${newest},`));

    // The recommended candidate defaults to the one the revision marks.
    const revision = await app.served.service['scenarios.revision']({ scenarioId, revision: newest });
    const doc = revision.document as { recommended?: string; candidates: { id: string }[] };
    const select = section().getByLabel('Candidate the memo recommends');
    await expect.poll(() => select.locator('option').count()).toBeGreaterThanOrEqual(doc.candidates.length);
    if (doc.recommended) expect(await select.inputValue()).toBe(doc.recommended);
    const chosen = doc.candidates[doc.candidates.length - 1].id;
    await select.selectOption(chosen);
    await section()
      .getByLabel('Your reasons, printed before the figures (optional)')
      .fill('Keeps the household within its drawdown comfort while lowering turnover.');

    await printButton().click();
    await expect
      .poll(() => printButton().textContent(), { timeout: 5_000 })
      .toMatch(/^(Printing the memo…|Print memo)$/);
    await expect
      .poll(() => section().getByTestId('memo-outcome').textContent(), { timeout: 120_000 })
      .toBe(`Printed the memo of revision ${newest}; it is listed below.`);
    await expect.poll(() => section().textContent()).toContain('Prepared by EM (from the settings).');
    const memos = await app.served.service['memos.list']({ scenarioId });
    expect(memos).toHaveLength(1);
    expect(memos[0].revisionHash).toBe(revision.revision.hash);
    const rows = section().getByTestId('memo-list').locator('tbody tr');
    await expect.poll(() => rows.count()).toBe(1);
    const cells = await rows.first().locator('td').allTextContents();
    expect(cells[1]).toBe(String(newest));
    expect(cells[2]).toBe('EM');
    expect(memos[0].preparedBy).toBe('EM');
    // The memo hash the footer prints, so the list and the paper can be matched.
    expect(memos[0].memoHash).toMatch(/^[0-9a-f]{64}$/);
    expect(cells[3]).toBe(memos[0].memoHash!.slice(0, 12));
  }, 180_000);

  it('downloads the printed PDF: %PDF bytes naming the household and carrying the caution', async () => {
    const button = section().getByRole('button', { name: /^Download the PDF of the memo printed/ });
    await button.focus();
    const [download] = await Promise.all([
      page.waitForEvent('download', { timeout: 30_000 }),
      page.keyboard.press('Enter'),
    ]);
    expect(download.suggestedFilename()).toMatch(/-rev\d+\.pdf$/);
    const file = join(dir, download.suggestedFilename());
    await download.saveAs(file);
    const bytes = readFileSync(file);
    expect(bytes.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // The same bytes the store keeps (its SHA-256 is the fingerprint in the list).
    const memo = (await app.served.service['memos.list']({ scenarioId }))[0];
    expect(bytes.length).toBe(memo.bytes);
    const { createHash } = await import('node:crypto');
    expect(createHash('sha256').update(bytes).digest('hex')).toBe(memo.hash);
    const text = pdfText(file);
    expect(text).toContain(householdName);
    expect(text.replace(/\s+/g, '')).toContain(memo.memoHash!);
    expect(text).toContain('Past performance does not guarantee future results.');
    expect(text).toContain('Keeps the household within its drawdown comfort while lowering turnover.');
    writeFileSync(join(ARTIFACTS, 'memo-section-download.txt'), text);
    await expect
      .poll(() => section().getByRole('status').last().textContent())
      .toBe(`Offered as ${download.suggestedFilename()}.`);
    // Saved as a revision and not edited since: no draft stands for changes the memo lacks.
    expect(await section().getByTestId('memo-unsaved').count()).toBe(0);
    await section().scrollIntoViewIfNeeded();
    await section().screenshot({ path: join(ARTIFACTS, 'memo-section.png') });
  }, 60_000);

  it('menu commands from a desktop-style preload reach the page; a shortcut seen twice acts once', async () => {
    // A stand-in for the generated preload: calls go to the same local host, menu commands are sent by the test.
    const desk = await app.newPage();
    await desk.addInitScript(() => {
      const listeners: ((action: string) => void)[] = [];
      (window as unknown as { sendMenu: (a: string) => void }).sendMenu = (a) => listeners.forEach((l) => l(a));
      (window as unknown as { holdfast: unknown }).holdfast = {
        async call(method: string, request: unknown) {
          const token = sessionStorage.getItem('holdfast.token');
          const reply = await fetch(`api/${encodeURIComponent(method)}`, {
            method: 'POST',
            headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${token}` },
            body: JSON.stringify(request ?? {}),
          });
          return reply.json();
        },
        onMenu(listener: (action: string) => void) {
          listeners.push(listener);
          return () => listeners.splice(listeners.indexOf(listener), 1);
        },
        async openMemo(memoId: string) {
          ((window as unknown as { opened: string[] }).opened ??= []).push(memoId);
          return { ok: true, path: `/invented/holdfast-memo-${memoId}.pdf` };
        },
      };
    });
    const send = (action: string) =>
      desk.evaluate((a) => (window as unknown as { sendMenu: (a: string) => void }).sendMenu(a), action);
    await desk.goto(app.url);
    const cap = desk.getByLabel('Default cap per asset');
    await cap.waitFor({ timeout: 60_000 });
    const start = await cap.inputValue();
    const [a, b] = start === '30' ? ['31', '32'] : ['30', '31'];
    await cap.fill(a);
    await desk.waitForTimeout(1000); // past the time in which edits of one field fold into one undo step
    await cap.fill(b);
    await desk.locator('body').click({ position: { x: 5, y: 5 } });

    // The key press and the menu's echo of it: one undo, not two.
    await desk.keyboard.press('Control+z');
    await send('undo');
    await expect.poll(() => cap.inputValue()).toBe(a);
    await desk.waitForTimeout(500);
    await send('undo');
    await expect.poll(() => cap.inputValue()).toBe(start);
    await desk.waitForTimeout(500);
    await send('redo');
    await expect.poll(() => cap.inputValue()).toBe(a);

    await send('save-revision');
    await desk.getByRole('dialog', { name: 'Save as revision' }).waitFor({ timeout: 5_000 });
    await expect.poll(() => desk.evaluate(() => document.activeElement?.id)).toBe('revision-note');
    await desk.keyboard.press('Escape');

    await send('print-memo');
    await expect
      .poll(() => desk.evaluate(() => document.activeElement?.closest('[data-testid=memo-section]') !== null))
      .toBe(true);
    expect(await desk.getByLabel('Date on the memo').evaluate((el) => el === document.activeElement)).toBe(true);

    // In the desktop window a printed memo also opens in the system's PDF viewer, to read or print.
    const row = desk.locator('[data-testid=memo-list] tr[data-memo-id]').first();
    const memoId = await row.getAttribute('data-memo-id');
    await row.getByRole('button', { name: /in the PDF viewer/ }).click();
    await expect
      .poll(() => row.getByRole('status').textContent())
      .toBe(`Opened in the PDF viewer from /invented/holdfast-memo-${memoId}.pdf.`);
    expect(await desk.evaluate(() => (window as unknown as { opened: string[] }).opened)).toEqual([memoId]);

    // "New scenario" on a scenario page opens its household's form for one, focus in the name.
    const householdId = (await app.served.service['households.list']({}))[0].id;
    await send('new-scenario');
    await expect.poll(() => new URL(desk.url()).hash).toBe(`#/households/${householdId}`);
    await desk.getByRole('form', { name: 'New scenario' }).waitFor({ timeout: 10_000 });
    await expect
      .poll(() => desk.evaluate(() => (document.activeElement as HTMLElement | null)?.id))
      .toBe(await desk.getByLabel('Scenario name').getAttribute('id'));

    await send('import-prices');
    await expect.poll(() => new URL(desk.url()).hash).toBe('#/library/import');
    await send('not-a-command');
    await desk.close();
  }, 120_000);

  it('the page logged no console error (a print that cannot run is never sent) and asked no other origin', () => {
    expect(app.consoleErrors).toEqual([]);
    expect(app.foreignRequests).toEqual([]);
  });
});
