import { describe, expect, it } from 'vitest';
import { seriesCoverage, weekdaysBetween } from '../../../src-main/service/coverage.js';
import { dayFromIso, weekday } from '../../../src-main/store/days.js';

// Calendar facts used below (the proleptic Gregorian calendar of ISO 8601): 2024-01-01 was a
// Monday, 2024 is a leap year, and 2023-12-31 was a Sunday.
describe('coverage of a price series', () => {
  it('counts weekdays the way a day-by-day walk does', () => {
    const walk = (a: number, b: number) => {
      let n = 0;
      for (let d = a + 1; d <= b; d++) if (weekday(d) < 5) n++;
      return n;
    };
    const start = dayFromIso('2023-12-31');
    for (let a = start; a < start + 30; a++)
      for (let len = 0; len < 40; len++) expect(weekdaysBetween(a, a + len)).toBe(walk(a, a + len));
    expect(weekday(dayFromIso('2024-01-01'))).toBe(0);
    // 2024 has 366 days: 52 weeks and two days (Monday 1 January and Tuesday 31 December).
    expect(weekdaysBetween(dayFromIso('2023-12-31'), dayFromIso('2024-12-31'))).toBe(262);
  });

  it('finds no gap over a weekend and one over a missing fortnight', () => {
    const c = seriesCoverage(['2024-01-05', '2024-01-08', '2024-01-09', '2024-01-26', '2024-01-29'], 5);
    expect(c.gaps).toEqual([{ after: '2024-01-09', before: '2024-01-26', missingWeekdays: 12 }]);
    expect(c).toMatchObject({ observations: 5, firstDate: '2024-01-05', lastDate: '2024-01-29', typicalSpacing: 1 });
  });

  it('treats an empty series as having no dates', () => {
    expect(seriesCoverage([], 5)).toEqual({
      observations: 0,
      firstDate: null,
      lastDate: null,
      typicalSpacing: null,
      gaps: [],
    });
  });
});
