import { InputError, type InputLocation } from '../errors.js';
import { COMMA, POINT, readPlainDecimals } from './plain-decimal.js';
import type { PriceTable } from './price-table.js';

/**
 * The wide price file of `holdfast estimate`: comma-separated, a header `date` followed by one
 * asset id per column, then one line per day with an ISO date and the closing prices; an empty
 * cell means no price that day. Strict on purpose: every deviation is an InputError with the line
 * and column (1-based) of the offending cell; the caller adds the file name with `inFile`.
 *
 * Blank lines are allowed only at the end, so a date's line is always its row index + 2 (see
 * `wideCsvLocator`).
 */
export function parseWidePriceCsv(text: string): PriceTable {
  const { starts, ends } = lineSpans(text);
  if (starts.length === 0)
    throw new InputError('empty price file: expected a header line starting with "date"', at(1, 1));

  const header = splitLine(text.slice(starts[0], ends[0]), 1);
  if (header[0] !== 'date')
    throw new InputError(`the first header cell must be "date", found "${header[0]}"`, at(1, 1));
  const assets = header.slice(1);
  if (assets.length === 0) throw new InputError('the header names no asset after "date"', at(1, 2));
  const seen = new Map<string, number>();
  assets.forEach((id, k) => {
    const column = k + 2;
    if (id === '') throw new InputError('empty asset id in the header', at(1, column));
    if (id.trim() !== id) throw new InputError(`asset id "${id}" has leading or trailing spaces`, at(1, column));
    const first = seen.get(id);
    if (first !== undefined) throw new InputError(`asset id "${id}" repeats the id of column ${first}`, at(1, column));
    seen.set(id, column);
  });

  const rows = starts.length - 1;
  const dates: string[] = new Array(rows);
  const closes = priceColumns(assets.length, rows);
  for (let r = 0; r < rows; r++) {
    const start = starts[r + 1];
    const end = ends[r + 1];
    // The common line starts with a digit (so it is not blank) and has its date before the first
    // comma; its prices are read in place from `text`. Any other line is read as a string.
    const first = text.charCodeAt(start);
    const comma = first >= 48 && first <= 57 ? text.indexOf(',', start) : -1;
    if (comma === -1 || comma > end) {
      readLine(text.slice(start, end), r, header, dates, closes);
      continue;
    }
    takeDate(text.slice(start, comma), r, dates);
    // Every cell empty or a plain positive decimal: the common case, read in place (the line ends
    // at a line break or the end of the text, no digit). Otherwise the line is read again cell by
    // cell, which finds and explains any error.
    if (!(readPlainDecimals(text, comma + 1, end, COMMA, POINT, closes, r) > 0))
      readCells(text.slice(start, end), r, header, closes);
  }
  return { dates, assets, closes };
}

/**
 * One column per asset, views of one buffer (so a column's `buffer` is the whole table's): one
 * allocation instead of one per asset, each of which costs microseconds, milliseconds for a wide
 * file.
 */
function priceColumns(assets: number, rows: number): Float64Array[] {
  const buffer = new Float64Array(assets * rows);
  const columns: Float64Array[] = new Array(assets);
  for (let k = 0; k < assets; k++) columns[k] = buffer.subarray(k * rows, (k + 1) * rows);
  return columns;
}

/**
 * Where each line of `text` starts and ends, as `text.replace(/^\uFEFF/, '').split(/\r?\n/)`
 * would cut it (a line's end excludes the CR of its CRLF), without the trailing blank lines.
 */
function lineSpans(text: string): { starts: number[]; ends: number[] } {
  const starts: number[] = [];
  const ends: number[] = [];
  let start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  for (;;) {
    const newline = text.indexOf('\n', start);
    starts.push(start);
    if (newline === -1) {
      ends.push(text.length);
      break;
    }
    ends.push(newline > start && text.charCodeAt(newline - 1) === CR ? newline - 1 : newline);
    start = newline + 1;
  }
  while (starts.length > 0 && starts[starts.length - 1] === ends[ends.length - 1]) {
    starts.pop();
    ends.pop();
  }
  return { starts, ends };
}

/** A data line off the common path (quoted cells, no comma, blank): read cell by cell. */
function readLine(line: string, r: number, header: readonly string[], dates: string[], closes: Float64Array[]): void {
  if (line.trim() === '') throw new InputError('empty line inside the price table', at(r + 2, 1));
  const comma = line.indexOf(',');
  takeDate(comma === -1 || line.charCodeAt(0) === QUOTE ? splitLine(line, r + 2)[0] : line.slice(0, comma), r, dates);
  readCells(line, r, header, closes);
}

/** Checks the date of row r (line r + 2) and its order after the previous one, then keeps it. */
function takeDate(date: string, r: number, dates: string[]): void {
  const lineNo = r + 2;
  // Days 1 to 28 of any month exist: most dates pass this one test, done by the pattern engine
  // (a few microseconds less per line than isoDateProblem before V8 has optimised it).
  if (!EXISTS_IN_EVERY_MONTH.test(date)) {
    const why = isoDateProblem(date);
    if (why) throw new InputError(`"${date}" is not a date: ${why}`, at(lineNo, 1));
  }
  if (r > 0) {
    const previous = dates[r - 1];
    if (date === previous) throw new InputError(`date ${date} repeats the date of line ${lineNo - 1}`, at(lineNo, 1));
    if (date < previous)
      throw new InputError(`date ${date} is out of order: it comes after ${previous} on line ${lineNo - 1}`, {
        line: lineNo,
        column: 1,
      });
  }
  dates[r] = date;
}

const EXISTS_IN_EVERY_MONTH = /^\d{4}-(?:0[1-9]|1[0-2])-(?:0[1-9]|1\d|2[0-8])$/;

/** The prices of row r from its line split into cells; finds and explains any bad cell. */
function readCells(line: string, r: number, header: readonly string[], closes: Float64Array[]): void {
  const lineNo = r + 2;
  const cells = splitLine(line, lineNo);
  const assets = header.length - 1;
  if (cells.length !== header.length)
    throw new InputError(
      `expected ${header.length} cells (date and ${assets} prices), found ${cells.length}`,
      at(lineNo, Math.min(cells.length, header.length) + 1),
    );
  for (let k = 0; k < assets; k++) {
    const cell = cells[k + 1];
    if (cell === '') {
      closes[k][r] = NaN;
      continue;
    }
    const id = header[k + 1];
    if (!DECIMAL.test(cell)) throw new InputError(`price "${cell}" for ${id} is not a number`, at(lineNo, k + 2));
    const value = Number(cell);
    if (!Number.isFinite(value)) throw new InputError(`price "${cell}" for ${id} is out of range`, at(lineNo, k + 2));
    if (value <= 0) throw new InputError(`price ${cell} for ${id} is not positive`, at(lineNo, k + 2));
    closes[k][r] = value;
  }
}

/**
 * Maps an (asset, date) of a table parsed by `parseWidePriceCsv` back to its cell, so later
 * stages (returns, estimation) can point at the file. Unknown dates map to the header line.
 */
export function wideCsvLocator(table: PriceTable): (asset: string | undefined, date?: string) => InputLocation {
  const row = new Map(table.dates.map((d, i) => [d, i] as const));
  return (asset, date) => {
    const k = asset === undefined ? -1 : table.assets.indexOf(asset);
    const i = date === undefined ? undefined : row.get(date);
    return { line: i === undefined ? 1 : i + 2, column: k === -1 ? 1 : k + 2 };
  };
}

// Plain decimal notation with an optional exponent; no sign other than an explicit '+' or '-'
// (a '-' is caught as "not positive" with a clearer message), no thousands separators.
const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

const QUOTE = 34;
const CR = 13;

function at(line: number, column: number): InputLocation {
  return { line, column };
}

/** Splits one CSV line; double-quoted cells may contain commas and doubled quotes (RFC 4180). */
function splitLine(line: string, lineNo: number): string[] {
  const cells: string[] = [];
  let i = 0;
  for (;;) {
    if (line[i] === '"') {
      let value = '';
      let j = i + 1;
      for (;;) {
        if (j >= line.length) throw new InputError('unterminated quoted cell', at(lineNo, cells.length + 1));
        if (line[j] === '"') {
          if (line[j + 1] === '"') {
            value += '"';
            j += 2;
            continue;
          }
          break;
        }
        value += line[j++];
      }
      j++;
      if (j < line.length && line[j] !== ',')
        throw new InputError('text after the closing quote of a cell', at(lineNo, cells.length + 1));
      cells.push(value);
      i = j;
    } else {
      const end = line.indexOf(',', i);
      cells.push(line.slice(i, end === -1 ? line.length : end));
      i = end === -1 ? line.length : end;
    }
    if (i >= line.length) break;
    i++; // the comma
    if (i === line.length) {
      cells.push('');
      break;
    }
  }
  return cells;
}

const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** Why `text` is not an ISO calendar date YYYY-MM-DD, or undefined when it is one. */
function isoDateProblem(text: string): string | undefined {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (!m) return 'expected YYYY-MM-DD';
  const year = Number(m[1]);
  const month = Number(m[2]);
  const day = Number(m[3]);
  if (month < 1 || month > 12) return `month ${m[2]} does not exist`;
  const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
  const days = month === 2 && leap ? 29 : DAYS_IN_MONTH[month - 1];
  if (day < 1 || day > days) return `day ${m[3]} does not exist in ${m[1]}-${m[2]}`;
  return undefined;
}
