import { createReadStream, statSync } from 'node:fs';
import { InputError } from '../../shared-core/errors.js';
import { CancelledError } from '../store/errors.js';

export type Delimiter = ',' | ';' | '\t';

export interface CsvRecord {
  /** 1-based line of the record's first character. */
  line: number;
  /** The record's cells, split on first use. */
  readonly cells: string[];
  /** The record's text when it holds no quote (so a reader may scan it without splitting). */
  raw?: string;
}

function record(line: number, raw: string, delimiter: Delimiter, file: string): CsvRecord & { delimiter: Delimiter } {
  let cells: string[] | undefined;
  return {
    line,
    delimiter,
    ...(raw.includes('"') ? {} : { raw }),
    get cells() {
      return (cells ??= splitRecord(raw, delimiter, line, file));
    },
  };
}

export interface ReadProgress {
  bytesRead: number;
  totalBytes: number;
  rows: number;
}

/**
 * Streams a delimited text file as records (RFC 4180 quoting: a quoted cell may hold the
 * delimiter, doubled quotes and line breaks), without ever holding the whole file as one string.
 * The delimiter is chosen from the first line by `chooseDelimiter`.
 */
export async function* csvRecords(
  path: string,
  options: { signal?: AbortSignal; onChunk?: (p: ReadProgress) => void; file?: string } = {},
): AsyncGenerator<CsvRecord & { delimiter: Delimiter }> {
  const file = options.file ?? path;
  const totalBytes = statSync(path).size;
  const stream = createReadStream(path, { encoding: 'utf8', highWaterMark: 1 << 20 });
  let bytesRead: number;
  let rest = '';
  let lineNo = 0;
  let rows = 0;
  let delimiter: Delimiter | undefined;
  let pending: { line: number; text: string } | undefined; // a record whose quoted cell spans lines
  try {
    for await (const chunk of stream as AsyncIterable<string>) {
      if (options.signal?.aborted) throw new CancelledError();
      bytesRead = stream.bytesRead;
      const text = rest + chunk;
      const lines = text.split('\n');
      rest = lines.pop()!;
      for (let raw of lines) {
        lineNo++;
        if (raw.endsWith('\r')) raw = raw.slice(0, -1);
        if (lineNo === 1) raw = raw.replace(/^\uFEFF/, '');
        if (pending) {
          pending.text += '\n' + raw;
          if (!quotesBalanced(pending.text)) continue;
          raw = pending.text;
        } else if (raw.includes('"') && !quotesBalanced(raw)) {
          pending = { line: lineNo, text: raw };
          continue;
        }
        const start = pending?.line ?? lineNo;
        pending = undefined;
        if (raw.trim() === '') continue;
        delimiter ??= chooseDelimiter(raw, file);
        rows++;
        yield record(start, raw, delimiter, file);
      }
      options.onChunk?.({ bytesRead, totalBytes, rows });
    }
    if (rest !== '' || pending) {
      lineNo++;
      let raw = rest.endsWith('\r') ? rest.slice(0, -1) : rest;
      if (lineNo === 1) raw = raw.replace(/^\uFEFF/, '');
      const start = pending?.line ?? lineNo;
      if (pending) raw = pending.text + '\n' + raw;
      if (!quotesBalanced(raw)) throw new InputError('a quoted cell is never closed', { file, line: start });
      if (raw.trim() !== '') {
        delimiter ??= chooseDelimiter(raw, file);
        rows++;
        yield record(start, raw, delimiter, file);
      }
    }
    options.onChunk?.({ bytesRead: totalBytes, totalBytes, rows });
  } finally {
    stream.destroy();
  }
}

function quotesBalanced(text: string): boolean {
  let n = 0;
  for (let i = text.indexOf('"'); i !== -1; i = text.indexOf('"', i + 1)) n++;
  return n % 2 === 0;
}

/** The delimiter of a header line: tab, semicolon or comma, whichever occurs (outside quotes). */
export function chooseDelimiter(header: string, file: string): Delimiter {
  const bare = header.replace(/"[^"]*"/g, '');
  const counts = (['\t', ';', ','] as const).map((d) => [d, bare.split(d).length - 1] as const);
  const used = counts.filter(([, n]) => n > 0);
  if (used.length === 0)
    throw new InputError(
      'the header has one column only; expected a date column and prices, separated by comma, semicolon or tab',
      {
        file,
        line: 1,
      },
    );
  if (used.length > 1) {
    // A semicolon or tab file may carry commas inside names; the most frequent separator wins
    // only when it clearly dominates.
    const [best, second] = [...used].sort((a, b) => b[1] - a[1]);
    if (best[1] === second[1])
      throw new InputError(
        `the header mixes separators (${used.map(([d, n]) => `${n} ${name(d)}`).join(', ')}); use one of comma, semicolon or tab`,
        { file, line: 1 },
      );
    return best[0];
  }
  return used[0][0];
}

function name(d: Delimiter): string {
  return d === '\t' ? 'tabs' : d === ';' ? 'semicolons' : 'commas';
}

export function splitRecord(raw: string, delimiter: Delimiter, line: number, file: string): string[] {
  if (!raw.includes('"')) return raw.split(delimiter);
  const cells: string[] = [];
  let i = 0;
  for (;;) {
    if (raw[i] === '"') {
      let value = '';
      let j = i + 1;
      for (;;) {
        const q = raw.indexOf('"', j);
        if (q === -1) throw new InputError('a quoted cell is never closed', { file, line, column: cells.length + 1 });
        value += raw.slice(j, q);
        if (raw[q + 1] === '"') {
          value += '"';
          j = q + 2;
        } else {
          j = q + 1;
          break;
        }
      }
      cells.push(value);
      if (j >= raw.length) return cells;
      if (raw[j] !== delimiter)
        throw new InputError('text after a closing quote; expected the separator', {
          file,
          line,
          column: cells.length,
        });
      i = j + 1;
    } else {
      const d = raw.indexOf(delimiter, i);
      if (d === -1) {
        cells.push(raw.slice(i));
        return cells;
      }
      cells.push(raw.slice(i, d));
      i = d + 1;
    }
  }
}
