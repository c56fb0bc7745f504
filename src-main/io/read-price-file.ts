import { InputError } from '../../shared-core/errors.js';
import { dayFromCivil } from '../store/days.js';
import { csvRecords, type CsvRecord, type Delimiter, type ReadProgress } from './csv-records.js';
import {
  decimalEvidence,
  readDateToken,
  readNumber,
  resolveDate,
  scanPlainDecimal,
  type DateOrder,
  type DateToken,
  type DecimalMark,
} from './cells.js';
import { GrowableFloat64, GrowableInt32 } from './growable.js';

/**
 * Reads a price file in either form, detected from its header:
 *   wide: `date,<asset>,<asset>,...`, one row per date;
 *   long: `date,asset,close` (in any column order), one row per price.
 * Comma, semicolon or tab separators; decimal point or decimal comma (decided from the first
 * rows' numbers, or given); ISO dates or day-first / month-first dates. The date order is read
 * from the dates themselves (a first part above 12 means day-first); when every date reads both
 * ways the file is marked `ambiguous` and the caller must choose, never guessed.
 */
export interface CellProblem {
  line: number;
  column: number;
  text: string;
  message: string;
}

export interface FileProblem {
  line?: number;
  column?: number;
  message: string;
}

export interface ParsedAsset {
  id: string;
  /** 1-based column of the asset's prices (a wide file's asset column, a long file's close column). */
  column: number;
  /** Points in date order (repeats kept, so validation can list them). */
  days: Int32Array;
  closes: Float64Array;
  lines: Int32Array;
  /** Prices read (parseable, with a readable date). */
  values: number;
  emptyCells: number;
  unparseable: CellProblem[];
  unparseableCount: number;
}

export interface ParsedPriceFile {
  file: string;
  form: 'wide' | 'long';
  delimiter: Delimiter;
  decimal: DecimalMark;
  dateOrder: DateOrder | 'ambiguous';
  dataRows: number;
  assets: ParsedAsset[];
  problems: FileProblem[];
  bytes: number;
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

const ASSET_ID = /^[A-Za-z0-9][A-Za-z0-9._-]*$/;
const LISTED_PER_ASSET = 20;
const SAMPLE_ROWS = 200;
const NO_DAY = -0x80000000;

interface AssetState {
  id: string;
  column: number;
  rec: GrowableInt32;
  val: GrowableFloat64;
  emptyCells: number;
  unparseable: CellProblem[];
  unparseableCount: number;
}

function newState(id: string, column: number): AssetState {
  return {
    id,
    column,
    rec: new GrowableInt32(),
    val: new GrowableFloat64(),
    emptyCells: 0,
    unparseable: [],
    unparseableCount: 0,
  };
}

export async function readPriceFile(path: string, options: ReadPriceFileOptions = {}): Promise<ParsedPriceFile> {
  const file = options.file ?? path;
  const problems: FileProblem[] = [];
  let bytes = 0;
  let delimiter: Delimiter = ',';
  let form: 'wide' | 'long' = 'wide';
  let width = 0;
  let dateCol = 0;
  let assetCol = -1;
  let closeCol = -1;
  const wide: AssetState[] = [];
  const long = new Map<string, AssetState>();
  let decimal = options.decimal;
  let sample: CsvRecord[] = [];
  let header = false;

  const recLine = new GrowableInt32();
  const tokens: (DateToken | undefined)[] = [];
  let dayFirstLine: number | undefined;
  let monthFirstLine: number | undefined;

  const cellValue = (s: AssetState, rec: number, text: string, line: number) => {
    if (text === '' || (text.charCodeAt(0) <= 32 && text.trim() === '')) {
      s.emptyCells++;
      return;
    }
    const v = readNumber(text, decimal!);
    if (Number.isNaN(v)) {
      s.unparseableCount++;
      if (s.unparseable.length < LISTED_PER_ASSET)
        s.unparseable.push({
          line,
          column: s.column,
          text,
          message: `'${text}' is not a number${decimal === 'comma' ? ' with a decimal comma (like 101,25)' : ' (like 101.25)'}`,
        });
      return;
    }
    s.rec.push(rec);
    s.val.push(v);
  };

  // Sized once the header is read.
  let rowValues = new Float64Array(0);
  let rowEnds = new Int32Array(0);

  // A wide row without quotes, scanned in place: most cells never become strings.
  const handleWideRaw = (line: number, raw: string) => {
    if (rowValues.length !== wide.length) {
      rowValues = new Float64Array(wide.length);
      rowEnds = new Int32Array(wide.length);
    }
    const d = raw.indexOf(delimiter);
    const cellsFound = () => raw.split(delimiter).length;
    if (d === -1) {
      recLine.push(line);
      tokens.push(readDateToken(raw));
      problems.push({ line, message: `expected ${width} cells as in the header, found 1` });
      return;
    }
    let start = d + 1;
    for (let a = 0; a < wide.length; a++) {
      let end = raw.indexOf(delimiter, start);
      if (end === -1) {
        if (a < wide.length - 1) {
          pushDate(line, raw.slice(0, d));
          problems.push({ line, message: `expected ${width} cells as in the header, found ${cellsFound()}` });
          return;
        }
        end = raw.length;
      }
      rowValues[a] = scanPlainDecimal(raw, start, end, decimal!);
      rowEnds[a] = end;
      start = end + 1;
    }
    const lastEnd = rowEnds[wide.length - 1];
    if (
      lastEnd < raw.length &&
      raw
        .slice(lastEnd + 1)
        .split(delimiter)
        .some((c) => c.trim() !== '')
    ) {
      pushDate(line, raw.slice(0, d));
      problems.push({ line, message: `expected ${width} cells as in the header, found ${cellsFound()}` });
      return;
    }
    const rec = pushDate(line, raw.slice(0, d));
    if (rec === -1) return;
    for (let a = 0; a < wide.length; a++) {
      const v = rowValues[a];
      if (v === v) {
        wide[a].rec.push(rec);
        wide[a].val.push(v);
      } else cellValue(wide[a], rec, raw.slice(a === 0 ? d + 1 : rowEnds[a - 1] + 1, rowEnds[a]), line);
    }
  };

  /** Records a row's date; returns the row index, or -1 when the date cell is unreadable. */
  const pushDate = (line: number, dateText: string): number => {
    const rec = recLine.length;
    recLine.push(line);
    const token = readDateToken(dateText);
    tokens.push(token);
    if (!token) {
      problems.push({
        line,
        column: dateCol + 1,
        message: `'${dateText}' is not a date (expected YYYY-MM-DD, DD/MM/YYYY or MM/DD/YYYY)`,
      });
      return -1;
    }
    if (token.kind === 'numeric') {
      if (token.a > 12) dayFirstLine ??= line;
      if (token.b > 12) monthFirstLine ??= line;
    }
    return rec;
  };

  const handle = (r: CsvRecord) => {
    if (form === 'wide' && r.raw !== undefined) return handleWideRaw(r.line, r.raw);
    const rec = recLine.length;
    recLine.push(r.line);
    const dateText = r.cells[dateCol] ?? '';
    const token = readDateToken(dateText);
    tokens.push(token);
    if (!token) {
      problems.push({
        line: r.line,
        column: dateCol + 1,
        message: `'${dateText}' is not a date (expected YYYY-MM-DD, DD/MM/YYYY or MM/DD/YYYY)`,
      });
      return;
    }
    if (token.kind === 'numeric') {
      if (token.a > 12) dayFirstLine ??= r.line;
      if (token.b > 12) monthFirstLine ??= r.line;
    }
    if (form === 'wide') {
      const extra = r.cells.slice(width);
      if (r.cells.length < width || extra.some((c) => c.trim() !== '')) {
        problems.push({ line: r.line, message: `expected ${width} cells as in the header, found ${r.cells.length}` });
        return;
      }
      for (let a = 0; a < wide.length; a++) cellValue(wide[a], rec, r.cells[a + 1], r.line);
    } else {
      if (r.cells.length !== width) {
        problems.push({
          line: r.line,
          message: `expected ${width} cells (date, asset, close), found ${r.cells.length}`,
        });
        return;
      }
      const id = r.cells[assetCol].trim();
      if (!ASSET_ID.test(id)) {
        problems.push({
          line: r.line,
          column: assetCol + 1,
          message: `asset id '${id}': expected letters, digits, dot, dash or underscore`,
        });
        return;
      }
      let s = long.get(id);
      if (!s) long.set(id, (s = newState(id, closeCol + 1)));
      cellValue(s, rec, r.cells[closeCol], r.line);
    }
  };

  for await (const r of csvRecords(path, {
    file,
    signal: options.signal,
    onChunk: (p) => {
      bytes = p.totalBytes;
      options.onProgress?.(p);
    },
  })) {
    if (!header) {
      header = true;
      delimiter = r.delimiter;
      width = r.cells.length;
      const names = r.cells.map((c) => c.trim());
      const lower = names.map((c) => c.toLowerCase());
      if (width === 3 && ['date', 'asset', 'close'].every((n) => lower.includes(n))) {
        form = 'long';
        [dateCol, assetCol, closeCol] = ['date', 'asset', 'close'].map((n) => lower.indexOf(n));
      } else {
        if (lower[0] !== 'date')
          throw new InputError(
            `the first header cell is '${names[0]}'; expected 'date' followed by one column per asset (wide form) or the columns date, asset, close (long form)`,
            { file, line: 1, column: 1 },
          );
        const seen = new Set<string>();
        names.slice(1).forEach((id, i) => {
          const at = { file, line: 1, column: i + 2 };
          if (!ASSET_ID.test(id))
            throw new InputError(`asset id '${id}': expected letters, digits, dot, dash or underscore`, at);
          if (seen.has(id)) throw new InputError(`asset '${id}' appears twice in the header`, at);
          seen.add(id);
          wide.push(newState(id, i + 2));
        });
        if (wide.length === 0) throw new InputError('the header names no asset columns', { file, line: 1 });
      }
      continue;
    }
    if (decimal === undefined) {
      sample.push(r);
      if (sample.length < SAMPLE_ROWS) continue;
      decimal = chooseDecimal(sample, form === 'wide' ? undefined : closeCol);
      sample.forEach(handle);
      sample = [];
      continue;
    }
    handle(r);
  }
  if (!header) throw new InputError('the file is empty', { file });
  if (decimal === undefined) {
    decimal = chooseDecimal(sample, form === 'wide' ? undefined : closeCol);
    sample.forEach(handle);
  }

  // The date order, from the evidence or the user's choice.
  const kinds = new Set(tokens.filter((t) => t).map((t) => t!.kind));
  let dateOrder: DateOrder | 'ambiguous';
  if (kinds.size > 1) {
    problems.push({ message: 'the file mixes ISO dates (YYYY-MM-DD) with day/month dates; use one form throughout' });
    dateOrder = 'iso';
  } else if (!kinds.has('numeric')) dateOrder = 'iso';
  else if (options.dateOrder) dateOrder = options.dateOrder;
  else if (dayFirstLine !== undefined && monthFirstLine !== undefined) {
    problems.push({
      message: `the dates follow no single order: line ${dayFirstLine} reads only day-first, line ${monthFirstLine} only month-first`,
    });
    dateOrder = 'day-first';
  } else if (dayFirstLine !== undefined) dateOrder = 'day-first';
  else if (monthFirstLine !== undefined) dateOrder = 'month-first';
  else dateOrder = 'ambiguous';

  const recDay = new Int32Array(recLine.length).fill(NO_DAY);
  if (dateOrder !== 'ambiguous') {
    const lines = recLine.view();
    tokens.forEach((t, i) => {
      if (!t) return;
      const d = resolveDate(t, dateOrder as DateOrder);
      if (d) recDay[i] = dayFromCivil(d.year, d.month, d.day);
      else
        problems.push({
          line: lines[i],
          column: dateCol + 1,
          message:
            t.kind === 'iso'
              ? 'no such calendar date'
              : `no such calendar date when read ${dateOrder}${options.dateOrder ? ' (the order chosen)' : ''}`,
        });
    });
  }

  const lineOf = recLine.view();
  const assets = (form === 'wide' ? wide : [...long.values()]).map((s) => finishAsset(s, recDay, lineOf));
  return { file, form, delimiter, decimal, dateOrder, dataRows: recLine.length, assets, problems, bytes };
}

function chooseDecimal(sample: readonly CsvRecord[], onlyColumn: number | undefined): DecimalMark {
  let comma = 0;
  let point = 0;
  for (const r of sample)
    r.cells.forEach((c, i) => {
      if (i === 0 || (onlyColumn !== undefined && i !== onlyColumn)) return;
      const e = decimalEvidence(c);
      if (e > 0) comma++;
      else if (e < 0) point++;
    });
  return comma > point ? 'comma' : 'point';
}

function finishAsset(s: AssetState, recDay: Int32Array, lineOf: Int32Array): ParsedAsset {
  const rec = s.rec.view();
  const val = s.val.view();
  const idx: number[] = [];
  for (let i = 0; i < rec.length; i++) if (recDay[rec[i]] !== NO_DAY) idx.push(i);
  let sorted = true;
  for (let k = 1; k < idx.length; k++) if (recDay[rec[idx[k]]] < recDay[rec[idx[k - 1]]]) sorted = false;
  if (!sorted) idx.sort((x, y) => recDay[rec[x]] - recDay[rec[y]] || x - y);
  const days = new Int32Array(idx.length);
  const closes = new Float64Array(idx.length);
  const lines = new Int32Array(idx.length);
  idx.forEach((i, k) => {
    days[k] = recDay[rec[i]];
    closes[k] = val[i];
    lines[k] = lineOf[rec[i]];
  });
  return {
    id: s.id,
    column: s.column,
    days,
    closes,
    lines,
    values: val.length,
    emptyCells: s.emptyCells,
    unparseable: s.unparseable,
    unparseableCount: s.unparseableCount,
  };
}
