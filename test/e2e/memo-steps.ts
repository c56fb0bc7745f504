import type { Page } from 'playwright-core';
import { expect } from 'vitest';

/**
 * Presses "Print memo" in the scenario page's memo part, as an adviser does, once it is enabled,
 * and waits for the outcome line; returns that line ("Printed the memo of revision N; ...").
 */
export async function printMemo(page: Page): Promise<string> {
  const section = page.getByTestId('memo-section');
  await section.scrollIntoViewIfNeeded();
  const print = section.getByRole('button', { name: 'Print memo' });
  await expect.poll(() => print.isDisabled(), { timeout: 20_000 }).toBe(false);
  await print.click();
  const outcome = section.getByTestId('memo-outcome');
  await expect.poll(() => outcome.textContent(), { timeout: 180_000 }).toMatch(/^Printed the memo of revision \d+/);
  return (await outcome.textContent()) ?? '';
}
