import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { priceTableFromText } from '../../../src-main/io/read-price-table.js';
import { openStore } from '../../../src-main/store/store.js';
import { useTempDir } from '../store/temp-dir.js';
import { priceTextFailure } from '../../support/price-text-failure.js';
import { holdfast } from './cli-io.js';

/**
 * One reader and one validation for `holdfast import` and the file forms of the commands
 * (issue 15, "Two CSV readers"): each case below was read differently by the two before.
 */
const tempDir = useTempDir();

// Park-Miller generator (Park and Miller 1988), seeded so a failure can be replayed.
function lcg(seed: number) {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

/** 80 weekday rows of four invented assets from 2024-01-01, prices with four decimals. */
function rows(): { date: string; prices: string[] }[] {
  const rnd = lcg(7);
  const level = [100, 50, 80, 20];
  const out: { date: string; prices: string[] }[] = [];
  for (let day = Date.UTC(2024, 0, 1); out.length < 80; day += 86_400_000) {
    const d = new Date(day);
    if (d.getUTCDay() === 0 || d.getUTCDay() === 6) continue;
    for (let k = 0; k < 4; k++) level[k] *= 1 + 0.02 * (rnd() - 0.5);
    out.push({ date: d.toISOString().slice(0, 10), prices: level.map((v) => v.toFixed(4)) });
  }
  return out;
}

function csv(options: { sep?: string; comma?: boolean; header?: string[]; cell?: [number, number, string] } = {}) {
  const sep = options.sep ?? ',';
  const lines = [['date', ...(options.header ?? ['A', 'B', 'C', 'D'])].join(sep)];
  rows().forEach((r, i) => {
    const prices = r.prices.map((p) => (options.comma ? p.replace('.', ',') : p));
    if (options.cell && options.cell[0] === i) prices[options.cell[1]] = options.cell[2];
    lines.push([r.date, ...prices].join(sep));
  });
  return lines.join('\n') + '\n';
}

function workspace(files: Record<string, string | Buffer>): string {
  const dir = tempDir();
  for (const [name, content] of Object.entries(files)) writeFileSync(join(dir, name), content);
  return dir;
}

const estimate = (dir: string, file: string) => holdfast(dir, 'estimate', '--prices', file, '--json');
const importInto = (dir: string, file: string) =>
  holdfast(dir, 'import', '--store', 's.hfstore', '--prices', file, '--universe', 'U');

describe('the import and the commands read a price file the same way', () => {
  it('a semicolon-separated file with decimal commas: estimate reads it as import does (it refused its header)', async () => {
    const dir = workspace({ 'semi.csv': csv({ sep: ';', comma: true }), 'plain.csv': csv() });
    const semi = await estimate(dir, 'semi.csv');
    expect(semi.stderr).toBe('');
    expect(semi.code).toBe(0);
    expect(semi.stdout).toBe((await estimate(dir, 'plain.csv')).stdout);
    const imported = await importInto(dir, 'semi.csv');
    expect(imported.code).toBe(0);
    const store = openStore(join(dir, 's.hfstore'), { create: false });
    const table = store.priceTable({ universe: 'U' });
    store.close();
    const read = priceTableFromText(csv()).table;
    expect(table.dates).toEqual(read.dates);
    expect(table.closes.map((c) => Array.from(c))).toEqual(read.closes.map((c) => Array.from(c)));
  });

  it('a 1e308 cell is refused by both at its line and column (estimate took it: 39,615 % volatility)', async () => {
    const dir = workspace({ 'big.csv': csv({ cell: [40, 2, '1e308'] }) });
    const message =
      'big.csv:42:4: C: a price must lie between 1e-150 and 1e150 (so that every ratio of two prices is a finite number)';
    const e = await estimate(dir, 'big.csv');
    expect([e.code, e.stdout, e.stderr]).toEqual([2, '', `holdfast estimate: ${message}\n`]);
    const i = await importInto(dir, 'big.csv');
    expect(i.code).toBe(2);
    expect(i.stderr).toContain(`  ${message}\n`);
  });

  it("a 1e-320 cell is refused at its own line and column by both (estimate's error said :1:1)", async () => {
    const dir = workspace({ 'tiny.csv': csv({ cell: [40, 2, '1e-320'] }) });
    const e = await estimate(dir, 'tiny.csv');
    expect(e.code).toBe(2);
    expect(e.stderr).toMatch(/^holdfast estimate: tiny\.csv:42:4: C: a price must lie between 1e-150 and 1e150/);
    const i = await importInto(dir, 'tiny.csv');
    expect(i.code).toBe(2);
    expect(i.stderr).toMatch(/ {2}tiny\.csv:42:4: C: a price must lie between/);
  });

  it('a Windows-1252 header is read, not refused (import) nor mangled (estimate)', async () => {
    const text = csv({ sep: ';', comma: true, header: ['Actions_Été', 'B', 'C', 'D'] });
    const dir = workspace({ 'cp1252.csv': Buffer.from(text, 'latin1') });
    expect(Buffer.from(text, 'latin1').includes(Buffer.from('Été', 'utf8'))).toBe(false); // É is one byte, 0xC9
    const e = await estimate(dir, 'cp1252.csv');
    expect(e.code).toBe(0);
    expect(JSON.parse(e.stdout).assets).toEqual(['Actions_Été', 'B', 'C', 'D']);
    const i = await importInto(dir, 'cp1252.csv');
    expect(i.stderr).toBe('');
    expect(i.code).toBe(0);
    const store = openStore(join(dir, 's.hfstore'), { create: false });
    expect(store.priceTable({ universe: 'U' }).assets).toEqual(['Actions_Été', 'B', 'C', 'D']);
    store.close();
  });

  it('UTF-8 with a byte order mark and UTF-16 (little and big endian, with their marks) read as plain UTF-8', async () => {
    const text = csv({ header: ['Ünï', 'B', 'C', 'D'] });
    const be = Buffer.from(text, 'utf16le');
    be.swap16();
    const dir = workspace({
      'utf8.csv': text,
      'bom.csv': Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text)]),
      'le.csv': Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]),
      'be.csv': Buffer.concat([Buffer.from([0xfe, 0xff]), be]),
    });
    const expected = (await estimate(dir, 'utf8.csv')).stdout;
    expect(JSON.parse(expected).assets[0]).toBe('Ünï');
    for (const f of ['bom.csv', 'le.csv', 'be.csv']) expect((await estimate(dir, f)).stdout, f).toBe(expected);
  });

  it('a one-day move above 25 % is flagged by both, at the same line and column, and kept', async () => {
    const r = rows();
    const doubled = (Number(r[50].prices[1]) * 2).toFixed(4);
    const dir = workspace({ 'jump.csv': csv({ cell: [50, 1, doubled] }) });
    const e = await estimate(dir, 'jump.csv');
    expect(e.code).toBe(0);
    const flags = e.stderr.split('\n').filter((l) => l.includes('one-day move'));
    expect(flags).toHaveLength(2); // up on line 52, down again on line 53
    expect(flags[0]).toMatch(
      /^holdfast estimate: warning: jump\.csv:52:3: B: one-day move of 10\d\.\d% on 2024-03-11 \(flagged, kept\)$/,
    );
    const i = await importInto(dir, 'jump.csv');
    expect(i.code).toBe(0);
    expect(i.stdout).toContain(`  warning: ${flags[0].replace('holdfast estimate: warning: ', '')}\n`);
  });
});

describe('located, bounded problems', () => {
  const where = priceTextFailure;

  it('names file, line and column for each kind of bad input', () => {
    expect(where('')).toBe('p.csv: the file is empty');
    expect(where('day,A\n')).toMatch(/^p\.csv:1:1: the first header cell is 'day'/);
    expect(where('date\n')).toMatch(/^p\.csv:1: the header has one column only/);
    expect(where('date,A,A\n')).toBe("p.csv:1:3: asset 'A' appears twice in the header");
    expect(where('date,A,\n')).toBe("p.csv:1:3: asset id '': expected letters, digits, dot, dash or underscore");
    expect(where('date,A\n2024-01-02,0\n')).toBe('p.csv:2:2: A: a price must be above zero');
    expect(where('date,A,B\n2024-01-02,1,abc\n')).toBe("p.csv:2:3: B: 'abc' is not a number (like 101.25)");
    expect(where('date,A\n2024-01-02,1,000\n')).toBe('p.csv:2:3: expected 2 cells as in the header, found 3');
    expect(where('date,A\n2024-13-02,1\n')).toBe('p.csv:2:1: no such calendar date');
    expect(where('date,A\n2024-01-03,1\n2024-01-03,1\n')).toBe('p.csv:3:1: date 2024-01-03 repeats the date of line 2');
    expect(where('date,"A\n')).toBe('p.csv:1: a quoted cell is never closed');
    expect(where('date,A\n')).toBe('p.csv:1: the file has a header but no rows of prices');
  });

  it('lists the first 20 problems in file order and counts the rest', () => {
    const lines = ['date,A,B'];
    for (let i = 0; i < 1000; i++)
      lines.push(`${new Date(Date.UTC(2000, 0, 1) + i * 86_400_000).toISOString().slice(0, 10)},x${i},1`);
    const message = where(lines.join('\n'));
    const listed = message.split('\n');
    expect(listed).toHaveLength(21);
    expect(listed[0]).toBe("p.csv:2:2: A: 'x0' is not a number (like 101.25)");
    expect(listed[19]).toBe("  p.csv:21:2: A: 'x19' is not a number (like 101.25)");
    expect(listed[20]).toBe('  p.csv: 980 more problems not listed');
  });

  it('a file of one line repeated: the first 20 repeats listed, the rest counted, by the import and the commands alike', async () => {
    const dir = workspace({ 'rep.csv': 'date,A,B\n' + '2024-01-02,100.5,50.25\n'.repeat(5000) });
    const e = await estimate(dir, 'rep.csv');
    const i = await importInto(dir, 'rep.csv');
    expect([e.code, i.code]).toEqual([2, 2]);
    const listedBy = (text: string) =>
      text.split('\n').filter((l) => /rep\.csv:\d+:1: date 2024-01-02 repeats/.test(l));
    expect(listedBy(e.stderr)).toHaveLength(20);
    expect(listedBy(i.stderr)).toHaveLength(20);
    expect(e.stderr).toContain('rep.csv: 4979 more problems not listed');
    expect(i.stderr).toContain('rep.csv: 4979 more problems not listed');
  });

  it('echoes at most 80 characters of a 5 MB cell', async () => {
    const dir = workspace({ 'wide.csv': `date,A\n2024-01-02,1\n2024-01-03,${'9'.repeat(5_000_000)}x\n` });
    const e = await estimate(dir, 'wide.csv');
    expect(e.code).toBe(2);
    expect(e.stderr.length).toBeLessThan(300);
    expect(e.stderr).toMatch(/^holdfast estimate: wide\.csv:3:2: A: '9{79}…' is not a number/);
  });
});
