import { describe, expect, it } from 'vitest';
import {
  formatCurrency,
  formatDate,
  formatPercent,
  formatRatio,
  formatSignedPercent,
  parsePercentInput,
  percentInputText,
} from '../../../src-renderer/scenario/format.js';
import { formatPct } from '../../../shared-core/present/format.js';

// The rules are the design notes' (weights and volatilities: per cent, one decimal; ratios: two
// decimals; currency: thousands separators and the ISO 4217 code; dates in the user's locale).
describe('screen formatting', () => {
  it('shows weights as per cent with one decimal and never prints -0.0% for solver noise', () => {
    expect(formatPercent(0.1234, 'en-GB')).toBe('12.3%');
    expect(formatPercent(0.15, 'en-GB')).toBe('15.0%');
    expect(formatPercent(-1e-12, 'en-GB')).toBe('0.0%');
    expect(formatPercent(Number.NaN, 'en-GB')).toBe('\u2013');
  });

  it('signs differences with a true minus sign', () => {
    expect(formatSignedPercent(0.021, 'en-GB')).toBe('+2.1%');
    expect(formatSignedPercent(-0.021, 'en-GB')).toBe('\u22122.1%');
    expect(formatSignedPercent(0.00001, 'en-GB')).toBe('0.0%');
  });

  it('shows ratios with two decimals', () => {
    expect(formatRatio(1.4567, 'en-GB')).toBe('1.46');
    expect(formatRatio(2, 'de-DE')).toBe('2,00');
  });

  it('groups currency thousands and names the ISO 4217 code', () => {
    expect(formatCurrency(1234567.4, 'EUR', 'en-GB')).toBe('1,234,567 EUR');
    expect(formatCurrency(-98765.5, 'CHF', 'en-GB')).toBe('\u221298,766 CHF');
    expect(formatCurrency(1234567, 'EUR', 'de-DE')).toBe('1.234.567 EUR');
  });

  it('prints the digits the memo prints (one formatter): half away from zero on the shortest decimal form', () => {
    // 0.1235 is 12.35% exactly as written, so it rounds up, as ICU does; (0.1235 * 100).toFixed(1) gives 12.3.
    expect(formatPercent(0.1235, 'en-GB')).toBe(formatPct(0.1235));
    expect(formatPercent(0.1235, 'en-GB')).toBe('12.4%');
    for (const w of [0.0005, 0.12345, 0.9995, 0.333333, 0.125, 0.0349999])
      expect(formatPercent(w, 'en-GB')).toBe(
        new Intl.NumberFormat('en-GB', { style: 'percent', minimumFractionDigits: 1, maximumFractionDigits: 1 }).format(
          w,
        ),
      );
  });

  it("writes the locale's separators and per cent sign, the same digits", () => {
    expect(formatPercent(0.1234, 'de-DE')).toBe('12,3\u00a0%');
    expect(formatPercent(0.1234, 'fr-FR')).toBe(
      new Intl.NumberFormat('fr-FR', { style: 'percent', minimumFractionDigits: 1 }).format(0.1234),
    );
  });

  it('reads ISO dates in UTC so the day does not shift with the time zone', () => {
    expect(formatDate('2024-03-31', 'en-GB')).toBe('31 Mar 2024');
    expect(formatDate('not a date', 'en-GB')).toBe('not a date');
  });

  it('reads a typed percentage as a fraction and refuses text without a number', () => {
    expect(parsePercentInput('15')).toBe(0.15);
    expect(parsePercentInput(' 12,5 % ')).toBe(0.125);
    expect(parsePercentInput('.5')).toBe(0.005);
    expect(parsePercentInput('abc')).toBeNull();
    expect(parsePercentInput('')).toBeNull();
    expect(parsePercentInput('1e2')).toBeNull();
  });

  it('writes a fraction back as the text of its field without float noise', () => {
    expect(percentInputText(0.07)).toBe('7');
    expect(percentInputText(0.125)).toBe('12.5');
    expect(percentInputText(undefined)).toBe('');
  });
});
