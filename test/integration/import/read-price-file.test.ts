import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readPriceFile, type ParsedPriceFile } from '../../../src-main/io/read-price-file.js';
import { validatePrices } from '../../../src-main/io/validate-prices.js';
import { isoFromDay } from '../../../src-main/store/days.js';
import { useTempDir } from '../store/temp-dir.js';

const tempDir = useTempDir();

function file(text: string): string {
  const path = join(tempDir(), 'prices.csv');
  writeFileSync(path, text);
  return path;
}

/** The dates on which asset k has a price, and those prices. */
const dates = (p: ParsedPriceFile, k: number) =>
  Array.from(p.days, isoFromDay).filter((_, i) => !Number.isNaN(p.assets[k].closes[i]));
const closes = (p: ParsedPriceFile, k: number) => Array.from(p.assets[k].closes).filter((v) => !Number.isNaN(v));

describe('price file detection', () => {
  it('reads a wide comma file with ISO dates', async () => {
    const p = await readPriceFile(file('date,EQ1,BD1\n2025-01-02,100.5,50\n2025-01-03,101,\n'));
    expect([p.form, p.delimiter, p.decimal, p.dateOrder]).toEqual(['wide', ',', 'point', 'iso']);
    expect(p.assets.map((a) => a.id)).toEqual(['EQ1', 'BD1']);
    expect(Array.from(p.assets[0].closes)).toEqual([100.5, 101]);
    expect(validatePrices(p).assets[1].emptyCells).toBe(1);
  });

  it('reads a long semicolon file with decimal commas and day-first dates (a day above 12 shows the order)', async () => {
    const p = await readPriceFile(
      file('date;asset;close\r\n02/01/2025;EQ1;100,5\r\n13/01/2025;EQ1;101,25\r\n02/01/2025;BD1;50\r\n'),
    );
    expect([p.form, p.delimiter, p.decimal, p.dateOrder]).toEqual(['long', ';', 'comma', 'day-first']);
    expect(dates(p, 0)).toEqual(['2025-01-02', '2025-01-13']);
    expect(closes(p, 0)).toEqual([100.5, 101.25]);
  });

  it('reads month-first dates when a second part above 12 shows it, tab separated, with long columns in any order', async () => {
    const p = await readPriceFile(file('asset\tclose\tdate\nEQ1\t7\t01/02/2025\nEQ1\t8\t01/31/2025\n'));
    expect([p.form, p.delimiter, p.dateOrder]).toEqual(['long', '\t', 'month-first']);
    expect(dates(p, 0)).toEqual(['2025-01-02', '2025-01-31']);
  });

  it('flags a file whose dates read both ways as ambiguous, and reads it once the user chooses', async () => {
    const text = 'date,EQ1\n03/04/2025,1\n04/04/2025,2\n';
    const p = await readPriceFile(file(text));
    expect(p.dateOrder).toBe('ambiguous');
    const report = validatePrices(p);
    expect(report.ok).toBe(false);
    expect(report.problems[0].message).toMatch(/both day-first and month-first.*--date-order/);
    const chosen = await readPriceFile(file(text), { dateOrder: 'month-first' });
    expect(dates(chosen, 0)).toEqual(['2025-03-04', '2025-04-04']);
    expect(validatePrices(chosen).ok).toBe(true);
  });

  it('keeps quoted cells whole: a decimal comma inside quotes in a comma-separated file', async () => {
    const p = await readPriceFile(file('date,"EQ1",BD1\n2025-01-02,"100,5","50,25"\n'));
    expect(p.decimal).toBe('comma');
    expect(Array.from(p.assets[0].closes)).toEqual([100.5]);
    expect(Array.from(p.assets[1].closes)).toEqual([50.25]);
  });

  it('reads a row scanned in place exactly as the same row split with quotes', async () => {
    const rows = ['2025-01-02,100.125,,7', '2025-01-03,1e2, 3.5 ,x', '2025-01-06,-0,12345678901234567,0.1'];
    const plain = await readPriceFile(file(['date,A,B,C', ...rows].join('\n')));
    const quoted = await readPriceFile(
      file(['date,A,B,C', ...rows.map((r) => r.replace(/^([^,]*),/, '"$1",'))].join('\n')),
    );
    expect(plain.assets).toEqual(quoted.assets);
    expect(closes(plain, 1)).toEqual([3.5, Number('12345678901234567')]);
    const report = validatePrices(plain);
    expect(report.assets[2].unparseable.map((c) => [c.line, c.column, c.message])).toEqual([
      [3, 4, "'x' is not a number (like 101.25)"],
    ]);
    expect(report.assets[0].nonPositive.map((c) => [c.line, c.column])).toEqual([[4, 2]]);
  });

  it('refuses a header that is neither form, naming line 1 and the column', async () => {
    await expect(readPriceFile(file('day,EQ1\n2025-01-02,1\n'), { file: 'p.csv' })).rejects.toMatchObject({
      location: { file: 'p.csv', line: 1, column: 1 },
    });
    await expect(readPriceFile(file('date,EQ1,EQ1\n'), { file: 'p.csv' })).rejects.toMatchObject({
      location: { line: 1, column: 3 },
      message: "asset 'EQ1' appears twice in the header",
    });
  });
});

describe('validation report per asset', () => {
  it('counts rows, first and last date, missing weekdays, and lists bad cells with line and column', async () => {
    const text = [
      'date,EQ1,BD1',
      '2025-01-02,100,10', // Thursday
      '2025-01-03,n/a,10', // line 3: not a number
      '2025-01-08,102,0', // line 4: Monday 6th and Tuesday 7th missing; non-positive
      '2025-01-08,103,11', // line 5: repeated date (the row is not kept)
      '2025-01-09,140,11', // +37.3% after 102: suspicious
    ].join('\n');
    const r = validatePrices(await readPriceFile(file(text), { file: 'p.csv' }));
    const [eq, bd] = r.assets;
    expect(eq).toMatchObject({ asset: 'EQ1', rowsRead: 3, firstDate: '2025-01-02', lastDate: '2025-01-09', ok: false });
    expect(eq.unparseable).toEqual([{ line: 3, column: 2, message: "'n/a' is not a number (like 101.25)" }]);
    expect(r.problems).toEqual([{ line: 5, column: 1, message: 'date 2025-01-08 repeats the date of line 4' }]);
    // Weekdays 2..9 Jan: 2,3,6,7,8,9 = 6; EQ1 has 2, 8, 9 (3 is unreadable): 3 missing.
    expect(eq.missingDays).toBe(3);
    expect(eq.suspiciousMoves.map((m) => [m.date, m.line, m.column])).toEqual([['2025-01-09', 6, 2]]);
    expect(bd.nonPositive).toEqual([{ line: 4, column: 3, message: 'a price must be above zero' }]);
    expect(r.ok).toBe(false);
    expect(r.problemCount).toBe(3);
  });

  it('reports a row with the wrong number of cells and an unreadable date with their line', async () => {
    const r = validatePrices(await readPriceFile(file('date,EQ1\n2025-01-02,1,2\n2025-02-30,1\nsoon,1\n')));
    expect(r.problems).toEqual([
      { line: 2, column: 3, message: 'expected 2 cells as in the header, found 3' },
      { line: 3, column: 1, message: 'no such calendar date' },
      { line: 4, column: 1, message: "'soon' is not a date (expected YYYY-MM-DD, DD/MM/YYYY or MM/DD/YYYY)" },
    ]);
  });

  it('streams a file larger than one read chunk and reports progress up to the whole size', async () => {
    const lines = ['date,A,B'];
    for (let d = 0; d < 60000; d++) lines.push(`${isoFromDay(10000 + d)},${100 + (d % 7)}.125,${50 + (d % 3)}.5`);
    const path = file(lines.join('\n') + '\n');
    const seen: number[] = [];
    const p = await readPriceFile(path, { onProgress: (x) => seen.push(x.bytesRead / x.totalBytes) });
    expect(p.dataRows).toBe(60000);
    expect(p.assets[1].closes[59999]).toBe(50 + (59999 % 3) + 0.5);
    expect(p.days.length).toBe(60000);
    expect(seen.length).toBeGreaterThan(1);
    expect(seen.at(-1)).toBe(1);
  });

  it('stops reading when cancelled', async () => {
    const lines = ['date,A'];
    for (let d = 0; d < 200000; d++) lines.push(`${isoFromDay(d)},1`);
    const path = file(lines.join('\n'));
    const controller = new AbortController();
    await expect(
      readPriceFile(path, { signal: controller.signal, onProgress: () => controller.abort() }),
    ).rejects.toThrow(/cancelled/);
  });
});
