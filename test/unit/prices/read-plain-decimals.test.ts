import { describe, expect, it } from 'vitest';
import { InputError, formatInputError } from '../../../shared-core/errors.js';
import { COMMA, POINT, readDecimal, readPlainDecimals } from '../../../shared-core/prices/plain-decimal.js';
import { priceTableFromText } from '../../../src-main/io/read-price-table.js';

// Park-Miller generator (Park and Miller 1988), seeded so a failure can be replayed.
function lcg(seed: number) {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

/** Cells of the in-place reader's grammar, and prices it leaves to the cell-by-cell reading. */
const PLAIN = ['5.', '.5', '+2.5', '+.5', '007.25', '0.000001', '123456789012345'];
const OTHER = ['1e3', '2.5E-2', '12345678901234567', '0.1234567890123456789'];

/**
 * A wide file of `rows` lines and `assets` columns: plain prices, some empty cells, some PLAIN
 * ones; every fourth line also has OTHER ones, so it is read cell by cell.
 */
function wideFile(rows: number, assets: number, seed: number, newline: string): string {
  const rnd = lcg(seed);
  const lines = [['date', ...Array.from({ length: assets }, (_, k) => `A${k}`)].join(',')];
  const day = Date.UTC(2023, 0, 2);
  for (let r = 0; r < rows; r++) {
    const cells = Array.from({ length: assets }, () => {
      const u = rnd();
      if (u < 0.1) return '';
      if (u < 0.2) return PLAIN[Math.floor(rnd() * PLAIN.length)];
      if (u < 0.25 && r % 4 === 3) return OTHER[Math.floor(rnd() * OTHER.length)];
      return (1 + rnd() * 999).toFixed(Math.floor(rnd() * 9));
    });
    lines.push([new Date(day + r * 86_400_000).toISOString().slice(0, 10), ...cells].join(','));
  }
  return lines.join(newline) + newline;
}

/** The same file with every cell of the data lines quoted, which only the cell-by-cell reading accepts. */
const quoted = (text: string) =>
  text
    .split('\n')
    .map((line, i) => (i === 0 || line === '' ? line : line.replace(/[^,\r]*/g, (cell) => (cell ? `"${cell}"` : ''))))
    .join('\n');

function failure(text: string): string {
  try {
    priceTableFromText(text, { file: 'p.csv' });
  } catch (error) {
    if (error instanceof InputError) return formatInputError(error);
    throw error;
  }
  throw new Error('expected an InputError');
}

describe('the price reader: the in-place reading of common lines and the cell-by-cell reading agree', () => {
  it('on a file with empty cells, signs, exponents and long digit strings, LF and CRLF (every value as Number() reads it, ECMA-262 section 7.1.4.1.1)', () => {
    for (const [seed, newline] of [
      [3, '\n'],
      [4, '\r\n'],
    ] as const) {
      const text = wideFile(60, 37, seed, newline);
      const fast = priceTableFromText(text).table;
      const general = priceTableFromText(quoted(text)).table;
      expect(general.dates).toEqual(fast.dates);
      expect(general.assets).toEqual(fast.assets);
      const lines = text.split(newline).slice(1);
      fast.closes.forEach((column, k) =>
        column.forEach((value, r) => {
          const cell = lines[r].split(',')[k + 1];
          expect(Object.is(value, cell === '' ? NaN : Number(cell)), `${cell} at ${r}, ${k}`).toBe(true);
          expect(Object.is(general.closes[k][r], value), `${cell} at ${r}, ${k}`).toBe(true);
        }),
      );
    }
  });

  it('a line the in-place reading declines is read again and each bad cell named', () => {
    const text = wideFile(30, 25, 5, '\n').split('\n');
    const cells = text[20].split(',');
    cells[17] = '-4.5';
    cells[21] = 'x';
    text[20] = cells.join(',');
    expect(failure(text.join('\n'))).toBe(
      "p.csv:21:18: A16: a price must be above zero\n  p.csv:21:22: A20: 'x' is not a number (like 101.25)",
    );
    const short = wideFile(5, 25, 6, '\n').split('\n');
    short[3] = short[3].split(',').slice(0, 20).join(',');
    expect(failure(short.join('\n'))).toBe('p.csv:4:21: expected 26 cells as in the header, found 20');
    const long = wideFile(5, 25, 7, '\n').split('\n');
    long[2] += ',1.5';
    expect(failure(long.join('\n'))).toBe('p.csv:3:27: expected 26 cells as in the header, found 27');
  });
});

describe('readPlainDecimals: a line of plain decimals read in place', () => {
  it('gives the same double as ECMAScript Number() (ECMA-262 StringToNumber, correctly rounded) up to 15 digits', () => {
    const rnd = lcg(12345);
    const one = [new Float64Array(1)];
    for (let k = 0; k < 100_000; k++) {
      const magnitude = 10 ** Math.floor(rnd() * 12 - 4);
      const text = (rnd() * magnitude * (rnd() < 0.1 ? -1 : 1)).toFixed(Math.floor(rnd() * 11));
      const least = readPlainDecimals(`${text}\n`, 0, text.length, COMMA, POINT, one, 0);
      // Beyond 15 significant digits it declines (NaN) and the general path uses Number().
      if (!Number.isNaN(least)) expect(Object.is(one[0][0], Number(text)), text).toBe(true);
      const comma = text.replace('.', ',');
      const c = readPlainDecimals(`${comma}\n`, 0, comma.length, 59, COMMA, one, 0);
      if (!Number.isNaN(c)) expect(Object.is(one[0][0], Number(text)), comma).toBe(true);
    }
  });

  const columns = (n: number) => Array.from({ length: n }, () => new Float64Array(2));

  it('writes each cell to its column (NaN when empty) and returns the least value', () => {
    const out = columns(4);
    const line = 'x,12.5,,0.25,+3';
    expect(readPlainDecimals(line, 2, line.length, COMMA, POINT, out, 1)).toBe(0.25);
    expect(out.map((c) => c[1])).toEqual([12.5, NaN, 0.25, 3]);
    expect(readPlainDecimals(',,,', 0, 3, COMMA, POINT, out, 0)).toBe(Infinity);
    expect(readPlainDecimals('1;-2,5;3', 0, 8, 59, COMMA, columns(3), 0)).toBe(-2.5);
  });

  it('returns NaN for too few or too many cells, or a cell that is not a plain decimal of at most 15 digits', () => {
    for (const line of [
      '1,2,3',
      '1,2,3,4,5',
      '1,2,,3,',
      '1,2,3,1e3',
      '1,2,3, 4',
      '1,2,3,"4"',
      '1,2,3,1234567890123456',
    ])
      expect(readPlainDecimals(line, 0, line.length, COMMA, POINT, columns(4), 0), line).toBeNaN();
  });

  it('one grammar: every cell it reads, readDecimal reads to the same double; what readDecimal refuses, it refuses', () => {
    const rnd = lcg(41);
    const pieces = ['', '+', '-', '0', '7', '12', '003', '.', ',', '5', '99', 'e', ' ', '123456789', '"'];
    const one = [new Float64Array(1)];
    for (let c = 0; c < 20_000; c++) {
      let cell = '';
      for (let p = Math.floor(rnd() * 5); p >= 0; p--) cell += pieces[Math.floor(rnd() * pieces.length)];
      for (const [mark, code, separator] of [
        ['point', POINT, COMMA],
        ['comma', COMMA, 59],
      ] as const) {
        if (cell.includes(String.fromCharCode(separator))) continue;
        const least = readPlainDecimals(`${cell}\n`, 0, cell.length, separator, code, one, 0);
        const general = readDecimal(cell, mark);
        if (cell === '')
          expect(one[0][0]).toBeNaN(); // an empty cell: no price
        else if (!Number.isNaN(least)) expect(Object.is(one[0][0], general), `${mark} "${cell}"`).toBe(true);
        if (Number.isNaN(general) && cell !== '') expect(least, `${mark} "${cell}"`).toBeNaN();
      }
    }
  });
});
