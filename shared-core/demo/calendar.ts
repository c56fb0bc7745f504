/**
 * Trading calendars for the invented demonstration data: weekdays minus a set of closing days.
 * The euro calendar closes on New Year, Good Friday, Easter Monday, 1 May, 25 and 26 December
 * (the usual euro-area settlement holidays, common practice); the US-style calendar, used by the
 * family's former company, closes on its own days, so the two series have different gaps.
 */
export type CalendarName = 'euro' | 'us';

/** ISO date of a UTC day number (days since 1970-01-01). */
export function isoOfDay(day: number): string {
  return new Date(day * 86_400_000).toISOString().slice(0, 10);
}

export function dayOfIso(iso: string): number {
  return Math.round(Date.parse(`${iso}T00:00:00Z`) / 86_400_000);
}

function dayOf(y: number, m: number, d: number): number {
  return Math.round(Date.UTC(y, m - 1, d) / 86_400_000);
}

/** Easter Sunday (Gregorian), the anonymous algorithm given by Meeus (1991), Astronomical Algorithms. */
export function easterSunday(year: number): number {
  const a = year % 19;
  const b = Math.floor(year / 100);
  const c = year % 100;
  const d = Math.floor(b / 4);
  const e = b % 4;
  const f = Math.floor((b + 8) / 25);
  const g = Math.floor((b - f + 1) / 3);
  const h = (19 * a + b - d - g + 15) % 30;
  const i = Math.floor(c / 4);
  const k = c % 4;
  const l = (32 + 2 * e + 2 * i - h - k) % 7;
  const m = Math.floor((a + 11 * h + 22 * l) / 451);
  const month = Math.floor((h + l - 7 * m + 114) / 31);
  const day = ((h + l - 7 * m + 114) % 31) + 1;
  return dayOf(year, month, day);
}

/** The n-th given weekday (0 Sunday .. 6 Saturday) of a month; n = -1 for the last one. */
function nthWeekday(year: number, month: number, weekday: number, n: number): number {
  if (n > 0) {
    const first = dayOf(year, month, 1);
    const offset = (weekday - weekdayOf(first) + 7) % 7;
    return first + offset + 7 * (n - 1);
  }
  const last = dayOf(year, month + 1, 1) - 1;
  return last - ((weekdayOf(last) - weekday + 7) % 7);
}

export function weekdayOf(day: number): number {
  return (((day + 4) % 7) + 7) % 7; // 1970-01-01 was a Thursday
}

/** A weekend closing day moves to the nearest weekday (common US practice). */
function observed(day: number): number {
  const w = weekdayOf(day);
  return w === 6 ? day - 1 : w === 0 ? day + 1 : day;
}

export function closingDays(calendar: CalendarName, year: number): Set<number> {
  const easter = easterSunday(year);
  if (calendar === 'euro')
    return new Set([
      dayOf(year, 1, 1),
      easter - 2,
      easter + 1,
      dayOf(year, 5, 1),
      dayOf(year, 12, 25),
      dayOf(year, 12, 26),
    ]);
  return new Set([
    observed(dayOf(year, 1, 1)),
    nthWeekday(year, 1, 1, 3),
    nthWeekday(year, 2, 1, 3),
    easter - 2,
    nthWeekday(year, 5, 1, -1),
    observed(dayOf(year, 7, 4)),
    nthWeekday(year, 9, 1, 1),
    nthWeekday(year, 11, 4, 4),
    observed(dayOf(year, 12, 25)),
  ]);
}

/** True when the calendar trades on that day. */
export function isTradingDay(calendar: CalendarName, day: number, cache: Map<string, Set<number>>): boolean {
  const w = weekdayOf(day);
  if (w === 0 || w === 6) return false;
  const year = new Date(day * 86_400_000).getUTCFullYear();
  const key = `${calendar}:${year}`;
  let closed = cache.get(key);
  if (!closed) {
    closed = closingDays(calendar, year);
    cache.set(key, closed);
  }
  return !closed.has(day);
}
