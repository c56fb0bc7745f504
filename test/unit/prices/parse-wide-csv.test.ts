import { describe, expect, it } from 'vitest';
import { InputError, formatInputError } from '../../../shared-core/errors.js';
import { parseWidePriceCsv, wideCsvLocator } from '../../../shared-core/prices/parse-wide-csv.js';

function failure(text: string): InputError {
  try {
    parseWidePriceCsv(text);
  } catch (error) {
    if (error instanceof InputError) return error.inFile('p.csv');
    throw error;
  }
  throw new Error('expected an InputError');
}

const where = (text: string) => formatInputError(failure(text));

describe('parseWidePriceCsv: the wide price file of the estimators issue', () => {
  it('reads dates, asset ids in file order and prices; an empty cell is no price (NaN)', () => {
    const table = parseWidePriceCsv('date,B,A\r\n2024-01-02,10,20.5\n2024-01-03,,21\n2024-01-04,11,1e1\n');
    expect(table.assets).toEqual(['B', 'A']);
    expect(table.dates).toEqual(['2024-01-02', '2024-01-03', '2024-01-04']);
    expect(Array.from(table.closes[0])).toEqual([10, NaN, 11]);
    expect(Array.from(table.closes[1])).toEqual([20.5, 21, 10]);
  });

  it('accepts RFC 4180 quoted cells and a byte-order mark', () => {
    const table = parseWidePriceCsv('\uFEFFdate,"x,1","y""2"\n"2024-01-02",1,2\n');
    expect(table.assets).toEqual(['x,1', 'y"2']);
    expect(table.dates).toEqual(['2024-01-02']);
  });

  it('maps an asset and date back to the line and column of its cell', () => {
    const table = parseWidePriceCsv('date,A,B\n2024-01-02,1,2\n2024-01-03,1,2\n');
    const locate = wideCsvLocator(table);
    expect(locate('B', '2024-01-03')).toEqual({ line: 3, column: 3 });
    expect(locate('A', undefined)).toEqual({ line: 1, column: 2 });
  });

  it('names file, line and column for each kind of bad input', () => {
    expect(where('')).toMatch(/^p\.csv:1:1: empty price file/);
    expect(where('day,A\n')).toMatch(/^p\.csv:1:1: the first header cell must be "date"/);
    expect(where('date\n')).toMatch(/^p\.csv:1:2: the header names no asset/);
    expect(where('date,A,A\n')).toMatch(/^p\.csv:1:3: asset id "A" repeats the id of column 2/);
    expect(where('date,A,\n')).toMatch(/^p\.csv:1:3: empty asset id/);
    expect(where('date,A\n2024-01-02,0\n')).toMatch(/^p\.csv:2:2: price 0 for A is not positive/);
    expect(where('date,A\n2024-01-02,-3\n')).toMatch(/^p\.csv:2:2: price -3 for A is not positive/);
    expect(where('date,A,B\n2024-01-02,1,abc\n')).toMatch(/^p\.csv:2:3: price "abc" for B is not a number/);
    expect(where('date,A\n2024-01-02,1,000\n')).toMatch(/^p\.csv:2:3: expected 2 cells/);
    expect(where('date,A,B\n2024-01-02,1\n')).toMatch(/^p\.csv:2:3: expected 3 cells/);
    expect(where('date,A\n2024-13-02,1\n')).toMatch(/^p\.csv:2:1: "2024-13-02" is not a date: month 13/);
    expect(where('date,A\n2023-02-29,1\n')).toMatch(/^p\.csv:2:1: .*day 29 does not exist/);
    expect(where('date,A\n02/01/2024,1\n')).toMatch(/^p\.csv:2:1: .*expected YYYY-MM-DD/);
    expect(where('date,A\n2024-01-03,1\n2024-01-02,1\n')).toMatch(/^p\.csv:3:1: date 2024-01-02 is out of order/);
    expect(where('date,A\n2024-01-03,1\n2024-01-03,1\n')).toMatch(/^p\.csv:3:1: date 2024-01-03 repeats/);
    expect(where('date,A\n2024-01-02,1\n\n2024-01-03,1\n')).toMatch(/^p\.csv:3:1: empty line/);
    expect(where('date,"A\n')).toMatch(/^p\.csv:1:2: unterminated quoted cell/);
  });

  it('accepts a leap day and trailing blank lines', () => {
    const table = parseWidePriceCsv('date,A\n2024-02-29,1\n\n\n');
    expect(table.dates).toEqual(['2024-02-29']);
  });

  it('reads every price exactly as Number() does, on the quick path and off it (ECMA-262 section 7.1.4.1.1: the conversion is correctly rounded)', () => {
    let seed = 17;
    const next = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
    const cells = [
      '5.',
      '.5',
      '0.5',
      '007.25',
      '1e3',
      '2.5E-2',
      '+3',
      '123456789012345',
      '1234567890123456',
      '0.1234567890123456789',
    ];
    for (let c = 0; c < 2000; c++) {
      const digits = 1 + Math.floor(next() * 18);
      let body = String(1 + Math.floor(next() * 9));
      for (let d = 1; d < digits; d++) body += Math.floor(next() * 10);
      const point = Math.floor(next() * (digits + 1));
      cells.push(point === digits ? body : `${body.slice(0, point)}.${body.slice(point)}`);
    }
    const header = cells.map((_, k) => `A${k}`).join(',');
    const table = parseWidePriceCsv(
      `date,${header}\n2024-01-02,${cells.join(',')}\n2024-01-03,${cells.map((_, k) => (k % 3 === 0 ? '' : cells[k])).join(',')}\n`,
    );
    cells.forEach((cell, k) => {
      expect(Object.is(table.closes[k][0], Number(cell)), cell).toBe(true);
      expect(Object.is(table.closes[k][1], k % 3 === 0 ? NaN : Number(cell)), cell).toBe(true);
    });
  });
});
