import { z } from 'zod';

/** A calendar date `YYYY-MM-DD` that exists (2023-02-30 is refused). */
export function isIsoDate(text: string): boolean {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(text)) return false;
  const [y, m, d] = text.split('-').map(Number);
  const t = new Date(Date.UTC(y, m - 1, d));
  return t.getUTCFullYear() === y && t.getUTCMonth() === m - 1 && t.getUTCDate() === d;
}

export const isoDate = z.string().refine(isIsoDate, { message: 'expected a date YYYY-MM-DD' });
