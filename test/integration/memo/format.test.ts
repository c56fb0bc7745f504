import { describe, expect, it } from 'vitest';
import { formatPercent } from '../../../src-renderer/scenario/format.js';
import {
  decimalsForLot,
  formatAmount,
  formatPercent1,
  formatRatio2,
  formatTrade,
  formatWeightChange,
  MINUS,
} from '../../../shared-core/present/format.js';

describe('memo number formatting', () => {
  it("rounds weights exactly as the app's screens do (Intl.NumberFormat percent, ICU half-expand) for 20,000 seeded weights and every tie", () => {
    // The app formats with Intl.NumberFormat (src-renderer/scenario/format.ts); ICU rounds the
    // shortest decimal form half away from zero. The memo must print the same digits.
    let s = 7;
    const next = () => ((s = (s * 48271) % 2147483647), s / 2147483647);
    const values: number[] = [];
    for (let i = 0; i < 20000; i++) values.push(next() * (i % 3 === 0 ? 1 : 0.3));
    for (let k = 0; k <= 2000; k++) values.push((k + 0.5) / 1000); // ties: 0.0005, 0.0015, ...
    for (const v of values) expect(formatPercent1(v) + '%', String(v)).toBe(formatPercent(v, 'en-US'));
  });

  it('rounds half away from zero on the printed digits: 0.1235 -> 12.4, 1.0005 -> 100.1, -0.0004 -> 0.0 with no sign', () => {
    expect(formatPercent1(0.1235)).toBe('12.4');
    expect(formatPercent1(0.12349)).toBe('12.3');
    expect(formatPercent1(1.0005)).toBe('100.1');
    expect(formatPercent1(-0.1235)).toBe(`${MINUS}12.4`);
    expect(formatPercent1(-0.0004)).toBe('0.0');
    expect(formatPercent1(3e-7)).toBe('0.0');
    expect(formatPercent1(5e-4)).toBe('0.1');
  });

  it('changes are differences of the printed weights, signed', () => {
    expect(formatWeightChange(0.08, 0.0765)).toBe(`${MINUS}0.3`); // 8.0 -> 7.7, though the exact gap rounds to -0.4
    expect(formatWeightChange(0.1, 0.1)).toBe('0.0');
    expect(formatWeightChange(0, 0.1123)).toBe('+11.2');
  });

  it('amounts group thousands, keep large amounts exact and sign trades', () => {
    expect(formatAmount(4837250.5)).toBe('4,837,251');
    expect(formatAmount(-1234567.891, 2)).toBe(`${MINUS}1,234,567.89`);
    expect(formatAmount(123456789012345)).toBe('123,456,789,012,345');
    expect(formatTrade(12000)).toBe('+12,000');
    expect(formatTrade(-3000)).toBe(`${MINUS}3,000`);
    expect(formatTrade(0)).toBe('0');
    expect(formatRatio2(1.715)).toBe('1.72');
    expect([decimalsForLot(1000), decimalsForLot(0.5), decimalsForLot(0.01)]).toEqual([0, 1, 2]);
  });
});
