/** A stored instant in the user's locale and time zone: "1 Dec 2026, 14:02". */
export function formatInstant(iso: string | null | undefined, locale?: string): string {
  if (!iso) return '\u2013';
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return iso;
  return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeStyle: 'short' }).format(date);
}

/** Today's date as ISO `YYYY-MM-DD` in the user's own time zone. */
export function todayIso(now = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}
