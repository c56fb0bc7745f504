import { describe, expect, it } from 'vitest';
import { readNumber, scanPlainDecimal } from '../../../src-main/io/cells.js';

// Park-Miller generator (Park and Miller 1988), seeded so a failure can be replayed.
function lcg(seed: number) {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

describe('reading numbers', () => {
  it('the in-place decimal scan gives the same double as ECMAScript Number() (ECMA-262 StringToNumber)', () => {
    const rnd = lcg(12345);
    for (let k = 0; k < 100_000; k++) {
      const magnitude = 10 ** Math.floor(rnd() * 12 - 4);
      const text = (rnd() * magnitude * (rnd() < 0.1 ? -1 : 1)).toFixed(Math.floor(rnd() * 11));
      const v = scanPlainDecimal(text, 0, text.length, 'point');
      // Beyond 15 significant digits the scan declines (NaN) and the caller uses Number().
      if (!Number.isNaN(v)) expect(Object.is(v, Number(text))).toBe(true);
      const comma = text.replace('.', ',');
      const c = scanPlainDecimal(comma, 0, comma.length, 'comma');
      if (!Number.isNaN(c)) expect(Object.is(c, Number(text))).toBe(true);
    }
  });

  it('declines everything but a plain decimal, so the general path decides', () => {
    for (const text of ['', ' 1', '1e5', '0x10', '.', '-', '1.2.3', '1,5', 'Infinity', '1234567890123456'])
      expect(scanPlainDecimal(text, 0, text.length, 'point')).toBeNaN();
    expect(scanPlainDecimal('x12.5y', 1, 5, 'point')).toBe(12.5);
  });

  it('the general path refuses what Number() accepts but a price file never means', () => {
    for (const text of ['', '   ', '0x10', '0b1', '0o7', 'Infinity', '-Infinity', '1,5'])
      expect(readNumber(text, 'point')).toBeNaN();
    expect(readNumber(' 1e3 ', 'point')).toBe(1000);
    expect(readNumber('1.234,5', 'comma')).toBeNaN();
    expect(readNumber('1234,5', 'comma')).toBe(1234.5);
  });
});
