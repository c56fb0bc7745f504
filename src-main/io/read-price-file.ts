import { closeSync, openSync, readSync, statSync } from 'node:fs';
import { open } from 'node:fs/promises';
import { InputError } from '../../shared-core/errors.js';
import { ASSET_ID, ASSET_ID_RULE } from '../../shared-core/prices/asset-id.js';
import { COMMA, POINT, readDecimalCells } from '../../shared-core/prices/plain-decimal.js';
import { isoFromDay } from '../store/days.js';
import { CancelledError } from '../store/errors.js';
import {
  DATE_FORMS,
  NO_DATE,
  dateKey,
  dayOfKey,
  decimalEvidence,
  isBlank,
  isDayMonthKey,
  keyParts,
  readPrice,
  shownCell,
  type DateKey,
  type DateOrder,
  type DecimalMark,
} from './cells.js';
import { ChunkDecoder, UndecodableBytes, type TextEncodingName } from './decode-text.js';
import { CsvLines, asciiText, chooseDelimiter, splitRecord, type Delimiter } from './csv-records.js';
import { GrowableFloat64, GrowableInt32 } from './growable.js';
import { ProblemList } from './problem-list.js';

/**
 * The one reader of price files, for the import and for every command. Either form, detected from
 * the header:
 *   wide: `date,<asset>,<asset>,...`, one row per date;
 *   long: `date,asset,close` (in any column order), one row per price.
 * Comma, semicolon or tab separators; decimal point or decimal comma (decided from the first
 * rows' numbers, or given); UTF-8 (with or without BOM), UTF-16 with BOM or Windows-1252
 * (decode-text.ts); ISO dates or day-first / month-first dates. The date order is read from the
 * dates themselves (a first part above 12 means day-first); when every date reads both ways the
 * file is marked `ambiguous` and the caller must choose, never guessed.
 *
 * The file is read in chunks and each line scanned where it lies; a row whose date repeats an
 * earlier one is not kept, and problems are listed up to 20 and then only counted
 * (problem-list.ts), so a huge malformed file takes the memory of its distinct dates. A header
 * that cannot be read is thrown at once as an InputError; every later problem is collected.
 */
export interface ParsedAsset {
  id: string;
  /** 1-based column of the asset's prices (a wide file's asset column, a long file's close column). */
  column: number;
  /** The closes on the file's `days`; NaN where the asset has no price (or an unreadable one). */
  closes: Float64Array;
  /** Blank close cells of a long file; undefined in a wide file, where every NaN that is not a bad cell is one. */
  blankCells?: number;
  unparseableCount: number;
  nonPositiveCount: number;
}

export interface ParsedPriceFile {
  file: string;
  form: 'wide' | 'long';
  delimiter: Delimiter;
  decimal: DecimalMark;
  encoding: TextEncodingName;
  dateOrder: DateOrder | 'ambiguous';
  /** Records after the header. */
  dataRows: number;
  /** Ascending distinct day numbers (days since 1970-01-01) of the rows kept. */
  days: Int32Array;
  assets: ParsedAsset[];
  /** The line of asset k's price on day index i (a wide file: the row's line). */
  lineOf(k: number, i: number): number;
  /** What the reading found (validate-prices.ts adds what it finds). */
  problems: ProblemList;
  bytes: number;
}

export interface ReadProgress {
  bytesRead: number;
  totalBytes: number;
  rows: number;
}

export interface ReadPriceFileOptions {
  /** Name shown in messages (default: the path). */
  file?: string;
  /** The user's choice for a file whose dates read both ways. */
  dateOrder?: 'day-first' | 'month-first';
  decimal?: DecimalMark;
  signal?: AbortSignal;
  onProgress?: (p: ReadProgress) => void;
}

const SAMPLE_ROWS = 200;
/** Cells enough to tell the decimal mark (a wide file's first rows hold thousands). */
const SAMPLE_CELLS = 4000;
const CHUNK_BYTES = 1 << 20;
/**
 * A wide file's prices are kept in blocks of rows, so that growth never copies: the first sized
 * for the whole file as its size and first row suggest (then the table's columns are views of
 * it, no copy), none above 4 M numbers (32 MB), so a huge file costs memory only as it is read.
 */
const BLOCK_NUMBERS = 1 << 22;

interface LongAsset {
  id: string;
  keys: GrowableInt32;
  lines: GrowableInt32;
  closes: GrowableFloat64;
  lastKey: DateKey;
  lastLine: number;
  emptyCells: number;
  unparseableCount: number;
  nonPositiveCount: number;
}

/** A record as CsvLines hands it over (csv-records.ts), its bytes copied out of the read buffer. */
interface SampleRow {
  source: string | Buffer;
  start: number;
  end: number;
  line: number;
  inPlace: boolean;
}

/** The reader as a sink of decoded text: push chunks, then `end()`. */
export class PriceFileReader {
  readonly problems = new ProblemList();
  dataRows = 0;
  private readonly lines: CsvLines;
  private header = false;
  private form: 'wide' | 'long' = 'wide';
  private delimiter: Delimiter = ',';
  private separatorCode = 44;
  private markCode = POINT;
  private decimal: DecimalMark | undefined;
  private width = 0;
  private dateCol = 0;
  private assetCol = -1;
  private closeCol = -1;
  private ids: string[] = [];
  /** Rows met before the decimal mark is known, kept where they lie (their chunk held until then). */
  private sample: SampleRow[] = [];
  // wide rows
  private readonly rowKeys = new GrowableInt32();
  private readonly rowLines = new GrowableInt32();
  private readonly seenDates = new Map<DateKey, number>();
  private blocks: Float64Array[] = [];
  private blockRows = 0;
  private blockColumns: Float64Array[] = [];
  private blockRow = 0;
  private unparseable: Int32Array = new Int32Array(0);
  /** A row's bytes, for text that came without them (not ASCII, or text in memory). */
  private scratch = Buffer.alloc(0);
  private nonPositive: Int32Array = new Int32Array(0);
  // long rows
  private readonly long = new Map<string, LongAsset>();

  /** `bytes`: the size of the text to come, if known (it sizes the first block of rows). */
  constructor(
    private readonly file: string,
    private readonly options: Pick<ReadPriceFileOptions, 'dateOrder' | 'decimal'> = {},
    private readonly bytes = 0,
  ) {
    this.decimal = options.decimal;
    this.lines = new CsvLines(
      (source, start, end, line, inPlace) => this.record(source, start, end, line, inPlace),
      file,
    );
  }

  push(text: string): void {
    this.lines.push(text);
  }

  /** Text that is ASCII, as its bytes (decode-text.ts): valid only during the call. */
  pushAscii(bytes: Buffer): void {
    this.lines.pushAscii(bytes);
  }

  /** Where the text stopped: the line being read and its next column. */
  get position(): { line: number; column: number } {
    return { line: this.lines.line + 1, column: this.lines.column };
  }

  end(encoding: TextEncodingName, bytes: number): ParsedPriceFile {
    this.lines.end();
    if (!this.header) throw new InputError('the file is empty', { file: this.file });
    if (this.decimal === undefined) this.decideDecimal();
    return this.form === 'wide' ? this.finishWide(encoding, bytes) : this.finishLong(encoding, bytes);
  }

  /** A record's text or the bytes of its ASCII text (csv-records.ts). */
  private record(source: string | Buffer, start: number, end: number, line: number, inPlace: boolean): void {
    if (!this.header) return this.readHeader(spanText(source, start, end), line);
    this.dataRows++;
    if (this.decimal === undefined) {
      // Bytes are the caller's buffer, refilled by the next chunk: a row's bytes are copied (the
      // line break after them too), and read as bytes again once the mark is known.
      const kept = typeof source === 'string' ? source : Buffer.from(source.subarray(start, end + 1));
      const from = typeof source === 'string' ? start : 0;
      this.sample.push({ source: kept, start: from, end: from + end - start, line, inPlace });
      if (this.sample.length >= Math.min(SAMPLE_ROWS, Math.ceil(SAMPLE_CELLS / this.width))) this.decideDecimal();
      return;
    }
    if (this.form === 'wide') this.wideRow(source, start, end, line, inPlace);
    else this.longRow(this.cells(spanText(source, start, end), line), line);
  }

  private cells(raw: string, line: number): string[] {
    return splitRecord(raw, this.delimiter, line, this.file);
  }

  private readHeader(raw: string, line: number): void {
    this.header = true;
    const file = this.file;
    this.delimiter = chooseDelimiter(raw, file);
    this.separatorCode = this.delimiter.charCodeAt(0);
    const names = this.cells(raw, line).map((c) => c.trim());
    this.width = names.length;
    const lower = names.map((c) => c.toLowerCase());
    if (this.width === 3 && ['date', 'asset', 'close'].every((n) => lower.includes(n))) {
      this.form = 'long';
      [this.dateCol, this.assetCol, this.closeCol] = ['date', 'asset', 'close'].map((n) => lower.indexOf(n));
      return;
    }
    if (lower[0] !== 'date')
      throw new InputError(
        `the first header cell is '${shownCell(names[0])}'; expected 'date' followed by one column per asset (wide form) or the columns date, asset, close (long form)`,
        { file, line: 1, column: 1 },
      );
    const seen = new Set<string>();
    names.slice(1).forEach((id, i) => {
      const at = { file, line: 1, column: i + 2 };
      if (!ASSET_ID.test(id)) throw new InputError(`asset id '${shownCell(id)}': ${ASSET_ID_RULE}`, at);
      if (seen.has(id)) throw new InputError(`asset '${id}' appears twice in the header`, at);
      seen.add(id);
    });
    this.ids = names.slice(1);
    if (this.ids.length === 0) throw new InputError('the header names no asset columns', { file, line: 1, column: 2 });
    this.unparseable = new Int32Array(this.ids.length);
    this.nonPositive = new Int32Array(this.ids.length);
  }

  private decideDecimal(): void {
    let comma = 0;
    let point = 0;
    let cellsSeen = 0;
    const raw = (r: SampleRow) => spanText(r.source, r.start, r.end);
    // A comma-separated cell holds a decimal comma only inside quotes (a row read in place has none).
    const evidence =
      this.delimiter !== ',' ? this.sample : this.sample.filter((r) => !r.inPlace && raw(r).includes('"'));
    for (const r of evidence) {
      if (cellsSeen >= SAMPLE_CELLS) break;
      const cells = this.cells(raw(r), r.line);
      cellsSeen += cells.length;
      cells.forEach((c, i) => {
        if (i === this.dateCol || (this.form === 'long' && i !== this.closeCol)) return;
        const e = decimalEvidence(c);
        if (e > 0) comma++;
        else if (e < 0) point++;
      });
    }
    this.decimal = comma > point ? 'comma' : 'point';
    this.markCode = this.decimal === 'comma' ? COMMA : POINT;
    const sample = this.sample;
    this.sample = [];
    for (const r of sample)
      if (this.form === 'wide') this.wideRow(r.source, r.start, r.end, r.line, r.inPlace);
      else this.longRow(this.cells(raw(r), r.line), r.line);
  }

  /** Room for one more wide row in the current block. */
  private rowSlot(length: number): void {
    if (this.blockRow < this.blockRows) return;
    const n = this.ids.length;
    const expected = this.blocks.length === 0 ? Math.ceil((1.05 * this.bytes) / (length + 1)) + 16 : Infinity;
    this.blockRows = Math.max(64, Math.min(expected, Math.floor(BLOCK_NUMBERS / n)));
    const buffer = new Float64Array(n * this.blockRows);
    this.blocks.push(buffer);
    this.blockColumns = Array.from({ length: n }, (_, k) =>
      buffer.subarray(k * this.blockRows, (k + 1) * this.blockRows),
    );
    this.blockRow = 0;
  }

  private keepRow(key: DateKey, line: number): void {
    this.rowKeys.push(key);
    this.rowLines.push(line);
    this.seenDates.set(key, line);
    this.blockRow++;
  }

  /**
   * The prices of a row read in place from `source[from, end)`: its bytes, or its text copied
   * into bytes when it is ASCII (readDecimalCells); NaN when the row is not of that kind.
   */
  private readCells(source: string | Buffer, from: number, end: number): number {
    let bytes: Buffer;
    if (typeof source === 'string') {
      const length = end - from;
      if (this.scratch.length <= length) this.scratch = Buffer.alloc(2 * length + 1);
      bytes = this.scratch;
      for (let j = 0; j < length; j++) {
        const code = source.charCodeAt(from + j);
        if (code > 127) return NaN;
        bytes[j] = code;
      }
      bytes[length] = 10; // the line break that ends every row read in place
      end = length;
      from = 0;
    } else bytes = source;
    return readDecimalCells(bytes, from, end, this.separatorCode, this.markCode, this.blockColumns, this.blockRow);
  }

  private wideRow(source: string | Buffer, start: number, end: number, line: number, inPlace: boolean): void {
    // The common row: no quote, a date cell, then numbers above zero, read in place from bytes.
    if (inPlace) {
      const d =
        typeof source === 'string' ? source.indexOf(this.delimiter, start) : source.indexOf(this.separatorCode, start);
      if (d !== -1 && d < end) {
        const key = typeof source === 'string' ? dateKey(source, start, d) : dateKey(asciiText(source, start, d));
        // A row on a date already read is not kept; past 20 problems it is only counted.
        if (key !== NO_DATE && this.seenDates.has(key) && this.problems.countedOnly(line)) return;
        if (key !== NO_DATE && !this.seenDates.has(key)) {
          this.rowSlot(end - start);
          if (this.readCells(source, d + 1, end) > 0) return this.keepRow(key, line);
        }
      }
    }
    // Any other row, cell by cell: finds and explains each problem.
    const cells = this.cells(spanText(source, start, end), line);
    const key = dateKey(cells[0]);
    if (key === NO_DATE)
      return this.problems.add({
        kind: 'date',
        line,
        column: 1,
        message: `'${shownCell(cells[0])}' is not a date (${DATE_FORMS})`,
      });
    if (cells.length < this.width || cells.slice(this.width).some((c) => !isBlank(c)))
      return this.problems.add({
        kind: 'row',
        line,
        column: Math.min(cells.length, this.width) + 1,
        message: `expected ${this.width} cells as in the header, found ${cells.length}`,
      });
    const first = this.seenDates.get(key);
    if (first !== undefined)
      return this.problems.add({
        kind: 'repeated-date',
        line,
        column: 1,
        lines: [first, line],
        date: cells[0].trim(),
        message: `date ${cells[0].trim()} repeats the date of line ${first}`,
      });
    this.rowSlot(end - start);
    for (let k = 0; k < this.ids.length; k++) {
      const cell = cells[k + 1];
      let value = NaN;
      if (!isBlank(cell)) {
        const read = readPrice(cell, this.decimal!);
        if (typeof read === 'number') value = read;
        else {
          if (read.kind === 'unparseable') this.unparseable[k]++;
          else this.nonPositive[k]++;
          this.problems.add({ kind: read.kind, line, column: k + 2, asset: this.ids[k], message: read.why });
        }
      }
      this.blockColumns[k][this.blockRow] = value;
    }
    this.keepRow(key, line);
  }

  private longRow(cells: string[], line: number): void {
    if (cells.length !== this.width)
      return this.problems.add({
        kind: 'row',
        line,
        column: Math.min(cells.length, this.width) + 1,
        message: `expected ${this.width} cells (date, asset, close), found ${cells.length}`,
      });
    const dateText = cells[this.dateCol];
    const key = dateKey(dateText);
    if (key === NO_DATE)
      return this.problems.add({
        kind: 'date',
        line,
        column: this.dateCol + 1,
        message: `'${shownCell(dateText)}' is not a date (${DATE_FORMS})`,
      });
    const id = cells[this.assetCol].trim();
    if (!ASSET_ID.test(id))
      return this.problems.add({
        kind: 'row',
        line,
        column: this.assetCol + 1,
        message: `asset id '${shownCell(id)}': ${ASSET_ID_RULE}`,
      });
    let s = this.long.get(id);
    if (!s)
      this.long.set(
        id,
        (s = {
          id,
          keys: new GrowableInt32(),
          lines: new GrowableInt32(),
          closes: new GrowableFloat64(),
          lastKey: NO_DATE,
          lastLine: 0,
          emptyCells: 0,
          unparseableCount: 0,
          nonPositiveCount: 0,
        }),
      );
    const cell = cells[this.closeCol];
    if (isBlank(cell)) {
      s.emptyCells++;
      return;
    }
    if (key === s.lastKey) {
      if (this.problems.countedOnly(line)) return;
      return this.problems.add({
        kind: 'repeated-date',
        line,
        column: this.dateCol + 1,
        asset: id,
        lines: [s.lastLine, line],
        date: dateText.trim(),
        message: `date ${dateText.trim()} repeats the date of line ${s.lastLine} for ${id}`,
      });
    }
    const read = readPrice(cell, this.decimal!);
    if (typeof read !== 'number') {
      if (read.kind === 'unparseable') s.unparseableCount++;
      else s.nonPositiveCount++;
      return this.problems.add({ kind: read.kind, line, column: this.closeCol + 1, asset: id, message: read.why });
    }
    s.keys.push(key);
    s.lines.push(line);
    s.closes.push(read);
    s.lastKey = key;
    s.lastLine = line;
  }

  /** The date order, from the evidence in the keys or the user's choice. */
  private dateOrder(keysOf: (visit: (key: DateKey, line: number) => void) => void): DateOrder | 'ambiguous' {
    let iso: number | undefined;
    let dayMonth: number | undefined;
    let dayFirst: number | undefined;
    let monthFirst: number | undefined;
    keysOf((key, line) => {
      if (!isDayMonthKey(key)) {
        iso ??= line;
        return;
      }
      dayMonth ??= line;
      const { a, b } = keyParts(key);
      if (a > 12) dayFirst ??= line;
      if (b > 12) monthFirst ??= line;
    });
    if (iso !== undefined && dayMonth !== undefined) {
      this.problems.add({
        kind: 'date',
        line: Math.max(iso, dayMonth),
        column: this.dateCol + 1,
        message: `the file mixes ISO dates (YYYY-MM-DD, line ${iso}) with day/month dates (line ${dayMonth}); use one form throughout`,
      });
      return 'iso';
    }
    if (dayMonth === undefined) return 'iso';
    if (this.options.dateOrder) return this.options.dateOrder;
    if (dayFirst !== undefined && monthFirst !== undefined) {
      this.problems.add({
        kind: 'date',
        line: Math.max(dayFirst, monthFirst),
        column: this.dateCol + 1,
        message: `the dates follow no single order: line ${dayFirst} reads only day-first, line ${monthFirst} only month-first`,
      });
      return 'day-first';
    }
    if (dayFirst !== undefined) return 'day-first';
    if (monthFirst !== undefined) return 'month-first';
    return 'ambiguous';
  }

  private calendarProblem(line: number, order: DateOrder): void {
    this.problems.add({
      kind: 'date',
      line,
      column: this.dateCol + 1,
      message:
        order === 'iso'
          ? 'no such calendar date'
          : `no such calendar date when read ${order}${this.options.dateOrder ? ' (the order chosen)' : ''}`,
    });
  }

  private base(encoding: TextEncodingName, bytes: number) {
    return {
      file: this.file,
      form: this.form,
      delimiter: this.delimiter,
      decimal: this.decimal!,
      encoding,
      dataRows: this.dataRows,
      problems: this.problems,
      bytes,
    };
  }

  private finishWide(encoding: TextEncodingName, bytes: number): ParsedPriceFile {
    const keys = this.rowKeys.view();
    const rowLines = this.rowLines.view();
    const order = this.dateOrder((visit) => keys.forEach((k, r) => visit(k, rowLines[r])));
    // Rows by day; a row with no such date is dropped, and so is a later row on the same day.
    const kept: number[] = [];
    const dayOfRow = new Int32Array(keys.length);
    let sorted = true;
    if (order !== 'ambiguous')
      for (let r = 0; r < keys.length; r++) {
        const day = dayOfKey(keys[r], order);
        if (day === undefined) {
          this.calendarProblem(rowLines[r], order);
          continue;
        }
        dayOfRow[r] = day;
        if (kept.length > 0 && day <= dayOfRow[kept[kept.length - 1]]) sorted = false;
        kept.push(r);
      }
    if (!sorted) kept.sort((x, y) => dayOfRow[x] - dayOfRow[y] || x - y);
    const rows: number[] = [];
    for (const r of kept) {
      const previous = rows[rows.length - 1];
      if (previous !== undefined && dayOfRow[previous] === dayOfRow[r]) {
        this.problems.add({
          kind: 'repeated-date',
          line: rowLines[r],
          column: 1,
          lines: [rowLines[previous], rowLines[r]],
          date: isoFromDay(dayOfRow[r]),
          message: `this date is the date of line ${rowLines[previous]}`,
        });
        continue;
      }
      rows.push(r);
    }
    const n = rows.length;
    const days = Int32Array.from(rows, (r) => dayOfRow[r]);
    const lines = Int32Array.from(rows, (r) => rowLines[r]);
    const identity = n === keys.length && rows.every((r, i) => r === i);
    const sizes = this.blocks.map((b) => b.length / this.ids.length);
    const starts = sizes.map((_, b) => sizes.slice(0, b).reduce((t, s) => t + s, 0));
    const assets = this.ids.map((id, k): ParsedAsset => {
      let closes: Float64Array;
      if (identity && this.blocks.length === 1) closes = this.blocks[0].subarray(k * sizes[0], k * sizes[0] + n);
      else {
        closes = new Float64Array(n);
        let b = 0;
        for (let i = 0; i < n; i++) {
          const r = rows[i];
          while (r >= starts[b] + sizes[b]) b++;
          while (r < starts[b]) b--;
          closes[i] = this.blocks[b][k * sizes[b] + r - starts[b]];
        }
      }
      return {
        id,
        column: k + 2,
        closes,
        unparseableCount: this.unparseable[k],
        nonPositiveCount: this.nonPositive[k],
      };
    });
    this.blocks = [];
    return { ...this.base(encoding, bytes), dateOrder: order, days, assets, lineOf: (_k, i) => lines[i] };
  }

  private finishLong(encoding: TextEncodingName, bytes: number): ParsedPriceFile {
    const series = [...this.long.values()];
    const order = this.dateOrder((visit) =>
      series.forEach((s) => {
        const lines = s.lines.view();
        s.keys.view().forEach((k, i) => visit(k, lines[i]));
      }),
    );
    // Each asset's points by day, the calendar and repeats checked; then the union of their days.
    const points = series.map((s) => {
      const keys = s.keys.view();
      const lines = s.lines.view();
      const idx: number[] = [];
      const day = new Int32Array(keys.length);
      if (order !== 'ambiguous')
        for (let i = 0; i < keys.length; i++) {
          const d = dayOfKey(keys[i], order);
          if (d === undefined) this.calendarProblem(lines[i], order);
          else {
            day[i] = d;
            idx.push(i);
          }
        }
      idx.sort((x, y) => day[x] - day[y] || lines[x] - lines[y]);
      const kept: number[] = [];
      for (const i of idx) {
        const previous = kept[kept.length - 1];
        if (previous !== undefined && day[previous] === day[i]) {
          this.problems.add({
            kind: 'repeated-date',
            line: lines[i],
            column: this.dateCol + 1,
            asset: s.id,
            lines: [lines[previous], lines[i]],
            date: isoFromDay(day[i]),
            message: `this date is the date of line ${lines[previous]} for ${s.id}`,
          });
          continue;
        }
        kept.push(i);
      }
      return { s, kept, day, lines };
    });
    const all = new Set<number>();
    for (const p of points) for (const i of p.kept) all.add(p.day[i]);
    const days = Int32Array.from([...all].sort((a, b) => a - b));
    const index = new Map<number, number>();
    days.forEach((d, i) => index.set(d, i));
    const lineTables: Int32Array[] = [];
    const assets = points.map(({ s, kept, day, lines }): ParsedAsset => {
      const closes = new Float64Array(days.length).fill(NaN);
      const at = new Int32Array(days.length);
      const values = s.closes.view();
      for (const i of kept) {
        const j = index.get(day[i])!;
        closes[j] = values[i];
        at[j] = lines[i];
      }
      lineTables.push(at);
      return {
        id: s.id,
        column: this.closeCol + 1,
        closes,
        blankCells: s.emptyCells,
        unparseableCount: s.unparseableCount,
        nonPositiveCount: s.nonPositiveCount,
      };
    });
    return { ...this.base(encoding, bytes), dateOrder: order, days, assets, lineOf: (k, i) => lineTables[k][i] };
  }
}

/** The text of `source[start, end)`. */
function spanText(source: string | Buffer, start: number, end: number): string {
  return typeof source === 'string' ? source.slice(start, end) : asciiText(source, start, end);
}

function missing(error: unknown, file: string): InputError {
  const code = (error as NodeJS.ErrnoException).code;
  const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory' : (error as Error).message;
  return new InputError(why, { file });
}

function located(error: UndecodableBytes, reader: PriceFileReader, file: string): InputError {
  reader.push(error.text);
  return new InputError(error.message, { file, ...reader.position });
}

/**
 * Decodes the whole lines of `bytes` into the reader (`last`: all of them) and returns how many
 * bytes they took; bytes that are no text are placed where they stand.
 */
function pushLines(reader: PriceFileReader, decoder: ChunkDecoder, bytes: Buffer, last: boolean, file: string): number {
  try {
    const lines = decoder.decodeLines(bytes, last);
    if (lines.ascii) reader.pushAscii(lines.ascii);
    else reader.push(lines.text);
    return lines.used;
  } catch (error) {
    if (error instanceof UndecodableBytes) throw located(error, reader, file);
    throw error;
  }
}

/** Moves `buffer[used, end)` to the buffer's start; returns its length. */
function keepRest(buffer: Buffer, end: number, used: number): number {
  buffer.copyWithin(0, used, end);
  return end - used;
}

/** Reads a price file from disk, in chunks, yielding to the event loop between them (the import). */
export async function readPriceFile(path: string, options: ReadPriceFileOptions = {}): Promise<ParsedPriceFile> {
  const file = options.file ?? path;
  let handle;
  let totalBytes: number;
  try {
    handle = await open(path, 'r');
    const stat = await handle.stat();
    if (stat.isDirectory()) throw Object.assign(new Error(), { code: 'EISDIR' });
    totalBytes = stat.size;
  } catch (error) {
    await handle?.close();
    throw missing(error, file);
  }
  const reader = new PriceFileReader(file, options, totalBytes);
  const decoder = new ChunkDecoder();
  const buffer = Buffer.allocUnsafe(CHUNK_BYTES);
  let bytesRead = 0;
  let kept = 0; // the start of a line, left from the previous chunk at the buffer's start
  try {
    for (;;) {
      if (options.signal?.aborted) throw new CancelledError();
      const { bytesRead: n } = await handle.read(buffer, kept, CHUNK_BYTES - kept, null);
      bytesRead += n;
      kept = keepRest(buffer, kept + n, pushLines(reader, decoder, buffer.subarray(0, kept + n), n === 0, file));
      options.onProgress?.({ bytesRead, totalBytes, rows: reader.dataRows });
      if (n === 0) break;
    }
  } finally {
    await handle.close();
  }
  return reader.end(decoder.encoding ?? 'utf-8', bytesRead);
}

/** The same reading without yielding (the commands): chunks read synchronously, memory as above. */
export function readPriceFileSync(
  path: string,
  options: Omit<ReadPriceFileOptions, 'signal' | 'onProgress'> = {},
): ParsedPriceFile {
  const file = options.file ?? path;
  let fd: number;
  let size: number;
  try {
    const stat = statSync(path);
    if (stat.isDirectory()) throw Object.assign(new Error(), { code: 'EISDIR' });
    size = stat.size;
    fd = openSync(path, 'r');
  } catch (error) {
    throw missing(error, file);
  }
  const reader = new PriceFileReader(file, options, size);
  const decoder = new ChunkDecoder();
  const buffer = Buffer.allocUnsafe(CHUNK_BYTES);
  let bytesRead = 0;
  let kept = 0;
  try {
    for (;;) {
      const n = readSync(fd, buffer, kept, CHUNK_BYTES - kept, null);
      bytesRead += n;
      kept = keepRest(buffer, kept + n, pushLines(reader, decoder, buffer.subarray(0, kept + n), n === 0, file));
      if (n === 0) break;
    }
  } finally {
    closeSync(fd);
  }
  return reader.end(decoder.encoding ?? 'utf-8', bytesRead);
}

/** A price file's text already in memory (tests, generated files). */
export function parsePriceText(text: string, options: ReadPriceFileOptions = {}): ParsedPriceFile {
  const reader = new PriceFileReader(options.file ?? 'prices', options, text.length);
  reader.push(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  return reader.end('utf-8', text.length);
}
