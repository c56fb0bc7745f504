import { describe, expect, it } from 'vitest';
import { readDecimal } from '../../../shared-core/prices/plain-decimal.js';
import { NO_DATE, dateKey, dayOfKey, readPrice, shownCell } from '../../../src-main/io/cells.js';
import { dayFromIso } from '../../../src-main/store/days.js';

describe('one grammar for numbers (shared-core/prices/plain-decimal.ts)', () => {
  it('refuses what Number() accepts but a price file never means', () => {
    for (const text of [
      '',
      '   ',
      '0x10',
      '0b1',
      '0o7',
      'Infinity',
      '-Infinity',
      '1,5',
      '1 000',
      '1.2.3',
      '.',
      '-',
      'e5',
    ])
      expect(readDecimal(text, 'point'), text).toBeNaN();
    expect(readDecimal('1.234,5', 'comma')).toBeNaN();
    expect(readDecimal('1234.5', 'comma')).toBeNaN();
  });

  it('reads signs, either mark, an exponent and blanks around the number, as Number() converts them', () => {
    expect(readDecimal(' 1e3 ', 'point')).toBe(1000);
    expect(readDecimal('1234,5', 'comma')).toBe(1234.5);
    expect(readDecimal('5.', 'point')).toBe(5);
    expect(readDecimal('+.5', 'point')).toBe(0.5);
    expect(readDecimal('2,5E-2', 'comma')).toBe(0.025);
    expect(readDecimal('-3', 'point')).toBe(-3);
  });
});

describe('a price cell (src-main/io/cells.ts)', () => {
  it('is a number above zero within 1e-150 and 1e150, so that every ratio of two prices is finite (IEEE 754 doubles end near 1.8e308)', () => {
    expect(readPrice('101.25', 'point')).toBe(101.25);
    expect(readPrice('1e150', 'point')).toBe(1e150);
    for (const text of ['1e308', '1e-320', '2e150', '1e-151'])
      expect(readPrice(text, 'point'), text).toMatchObject({ kind: 'unparseable', why: /between 1e-150 and 1e150/ });
    expect(readPrice('0', 'point')).toEqual({ kind: 'non-positive', why: 'a price must be above zero' });
    expect(readPrice('abc', 'comma')).toEqual({
      kind: 'unparseable',
      why: "'abc' is not a number with a decimal comma (like 101,25)",
    });
  });

  it('echoes at most 80 characters of a cell', () => {
    const huge = 'x'.repeat(5_000_000);
    const read = readPrice(huge, 'point') as { why: string };
    expect(read.why.length).toBeLessThan(130);
    expect(shownCell(huge)).toHaveLength(80);
    expect(shownCell('short')).toBe('short');
  });
});

describe('a date cell', () => {
  it('reads ISO dates in place and day/month dates in either order once the order is known', () => {
    expect(dayOfKey(dateKey('2024-02-29'), 'iso')).toBe(dayFromIso('2024-02-29'));
    expect(dayOfKey(dateKey('x2024-02-29y', 1, 11), 'iso')).toBe(dayFromIso('2024-02-29'));
    expect(dayOfKey(dateKey(' 2024-02-29 '), 'iso')).toBe(dayFromIso('2024-02-29'));
    expect(dayOfKey(dateKey('2023-02-29'), 'iso')).toBeUndefined();
    expect(dayOfKey(dateKey('03/04/2025'), 'day-first')).toBe(dayFromIso('2025-04-03'));
    expect(dayOfKey(dateKey('03.04.2025'), 'month-first')).toBe(dayFromIso('2025-03-04'));
    for (const text of ['2024-1-02', '2024/01/02', 'soon', '', '03/04-2025']) expect(dateKey(text), text).toBe(NO_DATE);
  });
});
