import { InputError } from '../../shared-core/errors.js';

export type Delimiter = ',' | ';' | '\t';

/**
 * Records of a delimited text pushed in chunks (RFC 4180 quoting: a quoted cell may hold the
 * delimiter, doubled quotes and line breaks), never holding more than a chunk and a line. Each
 * record is handed over as a span `text[start, end)` without its line break; blank lines are
 * skipped. `line` is the 1-based line of the record's start. `inPlace` says that the span may be
 * scanned where it lies: it holds no quote, and `text` is a chunk as decoded (a flat string; a
 * line joined across chunks is not, and a scan that met both kinds would be compiled by V8 for
 * both, slower). A character (the line break) always follows the span, so a scan may read one
 * past it without going out of bounds (which would cost the optimised scan a deoptimisation).
 * Text pushed as ASCII bytes (`pushAscii`) is handed over as bytes, `source` then being the
 * chunk's bytes (valid only during the call), a line break after the span as well.
 */
export type OnRecord = (source: string | Buffer, start: number, end: number, line: number, inPlace: boolean) => void;

/** The text of `bytes[from, to)`, ASCII. */
export function asciiText(bytes: Buffer, from: number, to: number): string {
  return bytes.toString('latin1', from, to);
}

export class CsvLines {
  /** Lines consumed so far (the line of the last record, or of the text being read). */
  line = 0;
  private rest = '';
  private pending: { line: number; text: string } | undefined; // a record whose quoted cell spans lines
  private nextQuote = -1;

  constructor(
    private readonly onRecord: OnRecord,
    private readonly file: string,
  ) {}

  push(chunk: string): void {
    let start = 0;
    if (this.rest !== '') {
      // The line cut by the previous chunk's end is joined on its own: the chunk itself stays the
      // flat string it was decoded into, which the in-place scans read fastest.
      const newline = chunk.indexOf('\n');
      if (newline === -1) {
        this.rest += chunk;
        return;
      }
      const line = this.rest + chunk.slice(0, newline + 1);
      this.rest = '';
      this.nextQuote = line.indexOf('"');
      this.take(line, 0, line.length - 1, false);
      start = newline + 1;
    }
    this.nextQuote = chunk.indexOf('"', start);
    for (;;) {
      const newline = chunk.indexOf('\n', start);
      if (newline === -1) break;
      this.take(chunk, start, newline, true);
      start = newline + 1;
    }
    this.rest = chunk.slice(start);
  }

  /**
   * Text that is ASCII, as its bytes (no text made of it): each line without a quote is handed
   * over where it lies, as bytes; a line with a quote or inside a quoted cell, and a line cut by
   * the chunk's end, go as text, read as `push` reads them. (A Buffer: its indexOf is a memchr,
   * a Uint8Array's a loop over elements, 10 times slower.)
   */
  pushAscii(bytes: Buffer): void {
    if (this.rest !== '' || this.pending) return this.push(asciiText(bytes, 0, bytes.length)); // rare
    let start = 0;
    let quote = bytes.indexOf(34);
    for (;;) {
      const newline = bytes.indexOf(10, start);
      if (newline === -1) break;
      if (quote !== -1 && quote < start) quote = bytes.indexOf(34, start);
      if (this.pending || (quote !== -1 && quote < newline)) {
        const line = asciiText(bytes, start, newline + 1);
        this.nextQuote = line.indexOf('"');
        this.take(line, 0, line.length - 1, false);
      } else {
        this.line++;
        let end = newline;
        if (end > start && bytes[end - 1] === 13) end--;
        if (!blankBytes(bytes, start, end)) this.onRecord(bytes, start, end, this.line, true);
      }
      start = newline + 1;
    }
    this.rest = asciiText(bytes, start, bytes.length);
  }

  /** The text after the last line break, then the check that every quote was closed. */
  end(): void {
    if (this.rest !== '') {
      const text = this.rest + '\n';
      this.rest = '';
      this.nextQuote = text.indexOf('"');
      this.take(text, 0, text.length - 1, false);
    }
    if (this.pending)
      throw new InputError('a quoted cell is never closed', { file: this.file, line: this.pending.line });
  }

  /** Characters of the line being read when the text stopped (for locating undecodable bytes). */
  get column(): number {
    return this.rest.length - this.rest.lastIndexOf('\n');
  }

  private take(text: string, start: number, end: number, chunk: boolean): void {
    this.line++;
    if (end > start && text.charCodeAt(end - 1) === 13) end--;
    if (this.nextQuote !== -1 && this.nextQuote < start) this.nextQuote = text.indexOf('"', start);
    const quoted = this.nextQuote !== -1 && this.nextQuote < end;
    if (this.pending) {
      this.pending.text += '\n' + text.slice(start, end);
      if (!quotesBalanced(this.pending.text)) return;
      const { line, text: record } = this.pending;
      this.pending = undefined;
      this.onRecord(record + '\n', 0, record.length, line, false);
      return;
    }
    if (quoted && !quotesBalanced(text.slice(start, end))) {
      this.pending = { line: this.line, text: text.slice(start, end) };
      return;
    }
    if (start === end || (text.charCodeAt(start) <= 32 && text.slice(start, end).trim() === '')) return;
    this.onRecord(text, start, end, this.line, chunk && !quoted);
  }
}

/** ASCII blanks only (what trim() removes of ASCII), or nothing. */
function blankBytes(bytes: Buffer, from: number, to: number): boolean {
  for (let i = from; i < to; i++) {
    const b = bytes[i];
    if (b !== 32 && (b < 9 || b > 13)) return false;
  }
  return true;
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
