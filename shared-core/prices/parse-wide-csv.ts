import { InputError, type InputLocation } from '../errors.js';
import { scanPlainDecimal } from './plain-decimal.js';
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
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  while (lines.length > 0 && lines[lines.length - 1] === '') lines.pop();
  if (lines.length === 0)
    throw new InputError('empty price file: expected a header line starting with "date"', at(1, 1));

  const header = splitLine(lines[0], 1);
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

  const rows = lines.length - 1;
  const dates: string[] = new Array(rows);
  const closes = assets.map(() => new Float64Array(rows));
  for (let r = 0; r < rows; r++) {
    const lineNo = r + 2;
    const line = lines[r + 1];
    if (line.trim() === '') throw new InputError('empty line inside the price table', at(lineNo, 1));
    const comma = line.indexOf(',');
    const date = comma === -1 || line.charCodeAt(0) === QUOTE ? splitLine(line, lineNo)[0] : line.slice(0, comma);
    const why = isoDateProblem(date);
    if (why) throw new InputError(`"${date}" is not a date: ${why}`, at(lineNo, 1));
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
    if (comma !== -1 && line.charCodeAt(0) !== QUOTE && scanPrices(line, comma + 1, closes, r)) continue;
    const cells = splitLine(line, lineNo);
    if (cells.length !== header.length)
      throw new InputError(
        `expected ${header.length} cells (date and ${assets.length} prices), found ${cells.length}`,
        at(lineNo, Math.min(cells.length, header.length) + 1),
      );
    for (let k = 0; k < assets.length; k++) {
      const cell = cells[k + 1];
      if (cell === '') {
        closes[k][r] = NaN;
        continue;
      }
      if (!DECIMAL.test(cell))
        throw new InputError(`price "${cell}" for ${assets[k]} is not a number`, at(lineNo, k + 2));
      const value = Number(cell);
      if (!Number.isFinite(value))
        throw new InputError(`price "${cell}" for ${assets[k]} is out of range`, at(lineNo, k + 2));
      if (value <= 0) throw new InputError(`price ${cell} for ${assets[k]} is not positive`, at(lineNo, k + 2));
      closes[k][r] = value;
    }
  }
  return { dates, assets, closes };
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

/**
 * The common line, read without splitting it into strings: every price cell unquoted, empty or a
 * plain positive decimal of at most 15 digits (scanPlainDecimal, exact as Number()). Returns
 * false, having written nothing that matters, as soon as a cell is anything else: the caller
 * then re-reads the line cell by cell, which finds and explains any error.
 */
function scanPrices(line: string, start: number, closes: Float64Array[], r: number): boolean {
  const length = line.length;
  let i = start;
  for (let k = 0; k < closes.length; k++) {
    if (i > length) return false; // fewer cells than assets
    let end = line.indexOf(',', i);
    if (end === -1) end = length;
    if (end === i) closes[k][r] = NaN;
    else {
      const value = line.charCodeAt(i) === QUOTE ? NaN : scanPlainDecimal(line, i, end, 'point');
      if (!(value > 0)) return false;
      closes[k][r] = value;
    }
    i = end + 1;
  }
  return i > length; // and not more cells than assets
}

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
