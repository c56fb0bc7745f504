import { parseAmountInput } from '../../households/amount-input.js';

/**
 * The memo form's checks as the advisor types, and the small conversions the section needs.
 * Each check gives the reason shown beside its field, in the same words the service would use
 * if the value reached it.
 */
export type Checked<T> = { ok: true; value: T } | { ok: false; reason: string };

/** Trades in the memo are rounded to multiples of this amount in the base currency. */
export function checkLot(text: string): Checked<number> {
  if (text.trim() === '') return { ok: false, reason: 'enter the lot size, such as 1,000' };
  const parsed = parseAmountInput(text);
  if (!parsed.ok)
    return {
      ok: false,
      reason: parsed.reason === 'an amount cannot be negative' ? 'a lot size cannot be negative' : parsed.reason,
    };
  if (!(parsed.value > 0)) return { ok: false, reason: 'a lot size must be more than zero' };
  if (!Number.isFinite(parsed.value)) return { ok: false, reason: 'a lot size this large is not a number' };
  return { ok: true, value: parsed.value };
}

/** A calendar date written YYYY-MM-DD (what a date field gives, and what the memo prints). */
export function checkMemoDate(text: string): Checked<string> {
  const value = text.trim();
  if (value === '') return { ok: false, reason: 'enter the date the memo carries' };
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
  if (!match) return { ok: false, reason: 'write the date as YYYY-MM-DD' };
  const [y, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const date = new Date(Date.UTC(y, m - 1, d));
  if (date.getUTCFullYear() !== y || date.getUTCMonth() !== m - 1 || date.getUTCDate() !== d)
    return { ok: false, reason: `${value} is not a day of the calendar` };
  return { ok: true, value };
}

/** The revision number a memo was printed from, found by its revision's fingerprint. */
export function revisionNumberOf(
  revisionHash: string,
  revisions: readonly { number: number; hash: string }[],
): number | null {
  return revisions.find((r) => r.hash === revisionHash)?.number ?? null;
}

/** A file name for the downloaded memo: household, scenario, date and revision, safe on every system. */
export function memoFileName(parts: { household: string; scenario: string; date: string; revision: number | null }) {
  const slug = (s: string) => {
    const whole = s
      .normalize('NFKD')
      .replace(/[\u0300-\u036f]/g, '')
      .replace(/[^A-Za-z0-9]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .toLowerCase();
    // Long names are cut after a whole word where there is one.
    const head = whole.slice(0, 41);
    const cut = whole.length <= 40 ? whole : head.includes('-') ? head.replace(/-[^-]*$/, '') : head.slice(0, 40);
    return cut || 'memo';
  };
  const revision = parts.revision !== null ? `-rev${parts.revision}` : '';
  return `${slug(parts.household)}-${slug(parts.scenario)}-${parts.date}${revision}.pdf`;
}

/** Base64 (as `memos.get` carries the PDF) to its bytes. */
export function base64Bytes(base64: string): Uint8Array<ArrayBuffer> {
  const text = atob(base64);
  const bytes = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i);
  return bytes;
}
