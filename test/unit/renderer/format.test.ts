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
    expect(formatCurrency(1234567.4, 'EUR', 'en-GB')).toBe('EUR 1,234,567');
    expect(formatCurrency(-98765.5, 'CHF', 'en-GB')).toBe('\u2212CHF 98,766');
    expect(formatCurrency(1234567, 'EUR', 'de-DE')).toBe('EUR 1.234.567');
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
