import { describe, expect, it } from 'vitest';
import { COMMA, POINT, readDecimal, readDecimalCells } from '../../../shared-core/prices/plain-decimal.js';
import { MAX_PRICE, MIN_PRICE } from '../../../shared-core/prices/price-value.js';
import { PriceFileReader } from '../../../src-main/io/read-price-file.js';
import { priceTableFromText, priceTableOf } from '../../../src-main/io/read-price-table.js';
import { isoFromDay } from '../../../src-main/store/days.js';
import { priceTextFailure } from '../../support/price-text-failure.js';

// Park-Miller generator (Park and Miller 1988), seeded so a failure can be replayed.
function lcg(seed: number) {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

/** Cells of the grammar: read on the fast path, and read by Number() from the cell's bytes. */
const PLAIN = ['5.', '.5', '+2.5', '+.5', '007.25', '0.000001', '123456789012345'];
const OTHER = ['1e3', '2.5E-2', '12345678901234567', '0.1234567890123456789'];

/**
 * A wide file of `rows` lines and `assets` columns: plain prices, some empty cells, some PLAIN
 * ones; every fourth line also has OTHER ones.
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
    expect(priceTextFailure(text.join('\n'))).toBe(
      "p.csv:21:18: A16: a price must be above zero\n  p.csv:21:22: A20: 'x' is not a number (like 101.25)",
    );
    const short = wideFile(5, 25, 6, '\n').split('\n');
    short[3] = short[3].split(',').slice(0, 20).join(',');
    expect(priceTextFailure(short.join('\n'))).toBe('p.csv:4:21: expected 26 cells as in the header, found 20');
    const long = wideFile(5, 25, 7, '\n').split('\n');
    long[2] += ',1.5';
    expect(priceTextFailure(long.join('\n'))).toBe('p.csv:3:27: expected 26 cells as in the header, found 27');
  });
});

/** `text` as bytes, one per character (ASCII), and the line break the reader finds after a row. */
const bytesOf = (text: string) => Uint8Array.from(`${text}\n`, (c) => c.charCodeAt(0));

/** One cell read alone: the least value (NaN when declined) and the value written. */
function readOne(cell: string, separator = COMMA, mark = POINT): { least: number; value: number } {
  const one = [new Float64Array(1)];
  const least = readDecimalCells(bytesOf(cell), 0, cell.length, separator, mark, one, 0);
  return { least, value: one[0][0] };
}

/**
 * Whether a cell is on the fast path (Clinger 1990): at most 9 digits before the mark, 9 after it
 * and 15 in all (leading zeros counted), the power of ten of its last digit within 10^±22.
 */
function onFastPath(cell: string): boolean {
  const m = /^[+-]?(\d*)(?:[.,](\d*))?(?:[eE]([+-]?\d+))?$/.exec(cell);
  if (!m) return false;
  const [whole, fraction] = [m[1].length, (m[2] ?? '').length];
  const scale = Number(m[3] ?? 0) - fraction;
  return whole + fraction > 0 && whole <= 9 && fraction <= 9 && whole + fraction <= 15 && Math.abs(scale) <= 22;
}

/**
 * A cell read alone, against JavaScript's Number() as the reference (ECMA-262 StringToNumber,
 * correctly rounded in V8): on the fast path, that double bit for bit, never declined; off it,
 * declined (NaN: the caller's general path reads it with Number()). Returns whether it was read.
 */
function expectAsNumber(cell: string, separator = COMMA, mark = POINT): boolean {
  const { least, value } = readOne(cell, separator, mark);
  const reference = Number(mark === COMMA ? cell.replace(',', '.') : cell);
  if (!onFastPath(cell)) {
    expect(least, cell).toBeNaN();
    return false;
  }
  expect(Object.is(value, reference), `${cell}: ${value} against Number() ${reference}`).toBe(true);
  expect(Object.is(least, reference), cell).toBe(true);
  return true;
}

/** A random decimal string: a sign, leading zeros, 0 to 12 digits each side of the mark, an exponent. */
function randomDecimal(rnd: () => number, mark: string): string {
  const digits = (count: number) => Array.from({ length: count }, () => Math.floor(rnd() * 10)).join('');
  const length = () => (rnd() < 0.8 ? Math.floor(rnd() * 10) : 10 + Math.floor(rnd() * 3));
  const sign = rnd() < 0.1 ? '-' : rnd() < 0.05 ? '+' : '';
  const zeros = rnd() < 0.2 ? '0'.repeat(Math.floor(rnd() * 6)) : '';
  const whole = rnd() < 0.1 ? '' : digits(1 + length());
  const fraction = rnd() < 0.2 ? '' : digits(length() + (whole === '' ? 1 : 0));
  const body = fraction === '' && rnd() < 0.5 ? `${zeros}${whole || '0'}` : `${zeros}${whole}${mark}${fraction}`;
  const exponent =
    rnd() < 0.3
      ? `${rnd() < 0.5 ? 'e' : 'E'}${rnd() < 0.5 ? '-' : rnd() < 0.3 ? '+' : ''}${Math.floor(rnd() ** 2 * 40)}`
      : '';
  return `${sign}${body}${exponent}`;
}

/** Hard cases: halfway and near-halfway digits, 2^53 + 1, the fast path's edges, the price range's edges. */
const HARD = [
  '9007199254740993', // 2^53 + 1: 16 digits, beyond the fast path
  '9007199254740992',
  '900719925474099.3',
  '0.1',
  '0.3',
  '4.35',
  '2.675',
  '1.0000000000000002',
  '1.00000000000000011102230246251565', // just above the halfway point between 1 and its successor
  '123456789.123456', // 9 + 6 digits: the fast path's most
  '1234567890.12345', // 10 digits before the mark: beyond
  '0.123456789', // 9 decimals: the most on the fast path
  '0.1234567891', // 10 decimals: beyond
  '999999999', // 9 nines
  '999999999.999999', // 15 nines
  '9999999999999999', // 16 nines: beyond
  '1e22', // the largest exact power of ten
  '1e23', // not exact: beyond
  '1e-22',
  '1e-23',
  '123456789e-22',
  '123456789.123456e7',
  '1.5e-7',
  '7E+2',
  '00000000000000000001.5', // leading zeros count as digits: beyond
  '0.000000000000000000000000001',
  '8.98846567431158e149',
  '1e150',
  '1.0000000000000001e150', // rounds to 1e150
  '1e151',
  '1e-150',
  '9.99e-151',
  '1.7976931348623157e308',
  '5e-324',
  '2.2250738585072011e-308',
];

describe('readDecimalCells: a line of numbers read from its bytes', () => {
  it('reads 200,000 seeded random decimal strings as JavaScript Number() does, bit for bit, or leaves them to it', () => {
    const rnd = lcg(20_261_205);
    let read = 0;
    for (let k = 0; k < 100_000; k++) {
      const cell = randomDecimal(rnd, '.');
      if (expectAsNumber(cell)) read++;
      expectAsNumber(cell.replace('.', ','), 59, COMMA);
    }
    expect(read).toBeGreaterThan(50_000); // most of them on the fast path
  });

  it('reads prices as toFixed writes them, 0 to 9 decimals, to the double Number() gives', () => {
    const rnd = lcg(12345);
    for (let k = 0; k < 100_000; k++) {
      const magnitude = 10 ** Math.floor(rnd() * 10 - 4);
      expect(expectAsNumber((rnd() * magnitude).toFixed(Math.floor(rnd() * 10)))).toBe(true);
    }
  });

  it('rounds the hard cases as Number() does, or leaves them to it', () => {
    for (const cell of [...HARD, '-0', '0', '0.0', '-2.5', '-1e3']) expectAsNumber(cell);
    expect(readOne('1e22').value).toBe(1e22);
    expect(readOne('1e23').least).toBeNaN();
  });

  it('in a price file, reads every hard case and 20,000 random prices as Number() does, from bytes and from text', () => {
    const rnd = lcg(7);
    const cells = HARD.filter((c) => Number(c) >= MIN_PRICE && Number(c) <= MAX_PRICE);
    while (cells.length < 20_000) {
      const cell = randomDecimal(rnd, '.');
      if (Number(cell) >= MIN_PRICE && Number(cell) <= MAX_PRICE) cells.push(cell);
    }
    const assets = 40;
    const lines = [['date', ...Array.from({ length: assets }, (_, k) => `A${k}`)].join(',')];
    for (let r = 0; r * assets < cells.length; r++)
      lines.push([isoFromDay(9000 + r), ...cells.slice(r * assets, (r + 1) * assets)].join(','));
    const text = lines.join('\n') + '\n';
    const reader = new PriceFileReader('hard.csv');
    reader.pushAscii(Buffer.from(text, 'latin1')); // as a file's ASCII chunk comes
    const fromBytes = priceTableOf(reader.end('utf-8', text.length)).table;
    for (const table of [priceTableFromText(text).table, fromBytes])
      cells.forEach((cell, c) => {
        const value = table.closes[c % assets][Math.floor(c / assets)];
        expect(Object.is(value, Number(cell)), `${cell}: ${value}`).toBe(true);
      });
  });

  const columns = (n: number) => Array.from({ length: n }, () => new Float64Array(2));

  it('writes each cell to its column (NaN when empty) and returns the least value', () => {
    const out = columns(4);
    const line = 'x,12.5,,0.25,+3';
    expect(readDecimalCells(bytesOf(line), 2, line.length, COMMA, POINT, out, 1)).toBe(0.25);
    expect(out.map((c) => c[1])).toEqual([12.5, NaN, 0.25, 3]);
    expect(readDecimalCells(bytesOf(',,,'), 0, 3, COMMA, POINT, out, 0)).toBe(Infinity);
    expect(readDecimalCells(bytesOf('1;-2,5;3'), 0, 8, 59, COMMA, columns(3), 0)).toBe(-2.5);
    expect(readDecimalCells(bytesOf('1e3\t2,5E-1\t30'), 0, 13, 9, COMMA, columns(3), 0)).toBe(0.25);
  });

  it('returns NaN for too few or too many cells, or a cell outside the grammar or the range of a price', () => {
    for (const line of [
      '1,2,3',
      '1,2,3,4,5',
      '1,2,,3,',
      '1,2,3, 4',
      '1,2,3,4 ',
      '1,2,3,"4"',
      '1,2,3,1e',
      '1,2,3,1e+',
      '1,2,3,e5',
      '1,2,3,.',
      '1,2,3,-',
      '1,2,3,1.2.3',
      '1,2,3,1e400',
      '1,2,3,0x10',
      '1,2,3,Infinity',
      `1,2,3,${'1'.repeat(80)}`,
      '1e400,2,3,4',
      '1,1e-400,3,4',
      '1,2,-1e200,4',
    ])
      expect(readDecimalCells(bytesOf(line), 0, line.length, COMMA, POINT, columns(4), 0), line).toBeNaN();
  });

  it('one grammar: every cell it reads, readDecimal reads to the same double; what readDecimal refuses, it refuses', () => {
    const rnd = lcg(41);
    const pieces = ['', '+', '-', '0', '7', '12', '003', '.', ',', '5', '99', 'e', 'E', ' ', '123456789', '"', 'x'];
    for (let c = 0; c < 20_000; c++) {
      let cell = '';
      for (let p = Math.floor(rnd() * 6); p >= 0; p--) cell += pieces[Math.floor(rnd() * pieces.length)];
      for (const [mark, code, separator] of [
        ['point', POINT, COMMA],
        ['comma', COMMA, 59],
      ] as const) {
        if (cell.includes(String.fromCharCode(separator))) continue;
        const { least, value } = readOne(cell, separator, code);
        const general = readDecimal(cell, mark);
        if (cell === '')
          expect(value).toBeNaN(); // an empty cell: no price
        else if (!Number.isNaN(least)) expect(Object.is(value, general), `${mark} "${cell}"`).toBe(true);
        if (Number.isNaN(general) && cell !== '') expect(least, `${mark} "${cell}"`).toBeNaN();
      }
    }
  });
});
