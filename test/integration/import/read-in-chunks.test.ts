import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { InputError } from '../../../shared-core/errors.js';
import {
  parsePriceText,
  readPriceFile,
  readPriceFileSync,
  type ParsedPriceFile,
} from '../../../src-main/io/read-price-file.js';
import { isoFromDay } from '../../../src-main/store/days.js';
import { useTempDir } from '../store/temp-dir.js';

/**
 * The file readers take the file a megabyte at a time and hand the reader whole lines: the bytes
 * after a chunk's last line break open the next chunk. Wherever the chunks end, in whatever
 * encoding, a file must read as its text read in one piece (parsePriceText), and bytes that are
 * no text must be placed at their own line and column.
 */
const tempDir = useTempDir();

// Park-Miller generator (Park and Miller 1988), seeded so a failure can be replayed.
function lcg(seed: number) {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

/**
 * A wide file of about `bytes` bytes: lines of uneven length (prices of 0 to 8 decimals, empty
 * cells, quoted cells), so that the chunks end at every kind of place in a line.
 */
function wideText(options: { bytes: number; header: string[]; sep?: string; comma?: boolean; seed: number }): string {
  const sep = options.sep ?? ',';
  const rnd = lcg(options.seed);
  const lines = [['date', ...options.header].join(sep)];
  let size = lines[0].length;
  for (let d = 0; size < options.bytes; d++) {
    const cells = options.header.map(() => {
      const u = rnd();
      if (u < 0.05) return '';
      const price = (1 + rnd() * 5000).toFixed(Math.floor(rnd() * 9));
      const written = options.comma ? price.replace('.', ',') : price;
      return u < 0.08 ? `"${written}"` : written;
    });
    const line = [isoFromDay(9000 + d), ...cells].join(sep);
    lines.push(line);
    size += line.length + 1;
  }
  return lines.join('\n') + '\n';
}

/** What a reading found, without where the bytes came from. */
function found(p: ParsedPriceFile) {
  return {
    form: p.form,
    delimiter: p.delimiter,
    decimal: p.decimal,
    dateOrder: p.dateOrder,
    dataRows: p.dataRows,
    days: Array.from(p.days),
    assets: p.assets.map((a) => ({ ...a, closes: Array.from(a.closes, (v) => (Number.isNaN(v) ? 'NaN' : v)) })),
    lines: Array.from(p.days, (_, i) => p.lineOf(0, i)),
    problems: p.problems.listed,
  };
}

async function readsAsText(bytes: Buffer, text: string, rows = 100): Promise<void> {
  const path = join(tempDir(), 'prices.csv');
  writeFileSync(path, bytes);
  const expected = found(parsePriceText(text));
  expect(expected.dataRows).toBeGreaterThanOrEqual(rows);
  expect(found(readPriceFileSync(path))).toEqual(expected);
  expect(found(await readPriceFile(path))).toEqual(expected);
}

function refusal(path: string): InputError {
  try {
    readPriceFileSync(path);
  } catch (error) {
    if (error instanceof InputError) return error;
    throw error;
  }
  throw new Error('expected an InputError');
}

describe('a price file read in chunks reads as its text in one piece', () => {
  const header = Array.from({ length: 40 }, (_, k) => `Fonds_É${k}`);

  it('UTF-8, 3 MB, comma-separated with quoted cells', async () => {
    const text = wideText({ bytes: 3e6, header, seed: 11 });
    await readsAsText(Buffer.from(text, 'utf8'), text);
  });

  it('semicolon-separated with decimal commas (the mark is decided from the first rows)', async () => {
    const text = wideText({ bytes: 2.2e6, header, sep: ';', comma: true, seed: 12 });
    const parsed = parsePriceText(text);
    expect(parsed.decimal).toBe('comma');
    await readsAsText(Buffer.from(text, 'utf8'), text);
  });

  it('Windows-1252 and UTF-16 with byte order marks', async () => {
    const text = wideText({ bytes: 1.5e6, header, seed: 13 });
    await readsAsText(Buffer.from(text, 'latin1'), text);
    await readsAsText(Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(text, 'utf16le')]), text);
    const be = Buffer.from(text, 'utf16le');
    be.swap16();
    await readsAsText(Buffer.concat([Buffer.from([0xfe, 0xff]), be]), text);
    await readsAsText(Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text, 'utf8')]), text);
  });

  it('ASCII throughout (read from its bytes): CRLF, blank lines, a quoted cell over two lines, no final line break', async () => {
    const lines = wideText({ bytes: 2.5e6, header: ['A', 'B', 'C', 'D', 'E', 'F'], seed: 15 }).split('\n');
    for (const at of [3, Math.floor(lines.length * 0.3), Math.floor(lines.length * 0.7)]) {
      lines.splice(at, 0, '  \t ');
      lines[at + 2] = lines[at + 2].replace(/,([^,]*)$/, ',"1\n$1"'); // a line break inside quotes
    }
    const text = lines.join('\r\n').replace(/(\r\n)+$/, '');
    const parsed = parsePriceText(text);
    expect(parsed.problems.listed.some((p) => p.kind === 'unparseable')).toBe(true);
    await readsAsText(Buffer.from(text, 'latin1'), text);
  });

  it('a header longer than a chunk, a two-byte character cut by the chunk end', async () => {
    // Ids of two-byte letters only (À to É for the digits of k); the first id grows by one ASCII
    // letter until the chunk's last byte is the first half of a letter.
    const letters = 'ÀÁÂÃÄÅÆÇÈÉ';
    const ids = Array.from({ length: 60_000 }, (_, k) => `ÜÖÄÜÖÄ${[...String(k)].map((d) => letters[+d]).join('')}`);
    const text = () => {
      const rows = Array.from({ length: 5 }, (_, d) =>
        [isoFromDay(9000 + d), ...ids.map((_, k) => (k % 1000 === 7 ? `${100 + d}.5` : ''))].join(','),
      );
      return [['date', ...ids].join(','), ...rows].join('\n') + '\n';
    };
    expect(Buffer.byteLength(ids.join(','))).toBeGreaterThan(1 << 20);
    while ((Buffer.from(text(), 'utf8')[(1 << 20) - 1] & 0xe0) !== 0xc0) ids[0] = `a${ids[0]}`;
    await readsAsText(Buffer.from(text(), 'utf8'), text(), 5);
  });
});

describe('bytes that are no text, after the first chunk', () => {
  it('are placed at their own line and column', () => {
    const text = wideText({ bytes: 2.5e6, header: ['A', 'B', 'C', 'D', 'E', 'F'], seed: 14 });
    const lines = text.split('\n');
    for (const at of [Math.floor(lines.length * 0.55), Math.floor(lines.length * 0.9)]) {
      const column = lines[at].split(',').slice(0, 4).join(',').length + 2; // where the fifth cell starts
      const bytes = Buffer.from(text, 'utf8');
      const offset = Buffer.byteLength(lines.slice(0, at).join('\n') + '\n') + column - 1;
      bytes[offset] = 0xff;
      const path = join(tempDir(), 'bad.csv');
      writeFileSync(path, bytes);
      const error = refusal(path);
      expect(error.message).toMatch(/not UTF-8/);
      expect(error.location).toEqual({ file: path, line: at + 1, column });
    }
  });
});
