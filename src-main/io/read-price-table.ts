import { resolve } from 'node:path';
import { InputError, type InputLocation } from '../../shared-core/errors.js';
import type { PriceTable } from '../../shared-core/prices/price-table.js';
import { isoFromDay } from '../store/days.js';
import {
  parsePriceText,
  readPriceFileSync,
  type ParsedPriceFile,
  type ReadPriceFileOptions,
} from './read-price-file.js';
import { problemLines, validatePrices, warningLines, type ValidationReport } from './validate-prices.js';

/**
 * A price file as the commands use it (`estimate`, `solve`, `backtest`, `memo` and the exchange
 * rates of `--fx`): the same reading and validation as `holdfast import`, then the prices as a
 * table. A file with any problem is refused as a whole with an InputError that points at the
 * first problem and lists up to 20 (validate-prices.ts); flagged moves come back as warnings.
 */
export interface PriceTableFile {
  table: PriceTable;
  /** The line and column of an asset's price on a date (line 1 or column 1 when unknown). */
  locate: (asset: string | undefined, date?: string) => InputLocation;
  /** Flagged one-day moves, `file:line:column: asset: ...`, at most 20 and a count. */
  warnings: string[];
  report: ValidationReport;
}

export type ReadPriceTableOptions = Omit<ReadPriceFileOptions, 'signal' | 'onProgress'>;

export function readPriceTable(path: string, options: ReadPriceTableOptions = {}): PriceTableFile {
  return priceTableOf(readPriceFileSync(path, options));
}

/**
 * A price file named by the user, relative to `cwd`: errors name it as given, with line and
 * column; flagged moves go to `warn`, one line each.
 */
export function readNamedPriceTable(
  cwd: string,
  path: string,
  warn?: (line: string) => void,
): { path: string; table: PriceTable; locate: PriceTableFile['locate'] } {
  const read = readPriceTable(resolve(cwd, path), { file: path });
  for (const w of read.warnings) warn?.(w);
  return { path, table: read.table, locate: read.locate };
}

/** The same from a price file's text already in memory (tests, generated files). */
export function priceTableFromText(text: string, options: ReadPriceTableOptions = {}): PriceTableFile {
  return priceTableOf(parsePriceText(text, options));
}

/** The table of a parsed file, or the InputError listing its problems. */
export function priceTableOf(parsed: ParsedPriceFile): PriceTableFile {
  const report = validatePrices(parsed);
  if (!report.ok) throw problemsError(report);
  const dates = Array.from(parsed.days, isoFromDay);
  const table: PriceTable = {
    dates,
    assets: parsed.assets.map((a) => a.id),
    closes: parsed.assets.map((a) => a.closes),
  };
  const row = new Map(dates.map((d, i) => [d, i] as const));
  const locate = (asset: string | undefined, date?: string): InputLocation => {
    const k = asset === undefined ? -1 : table.assets.indexOf(asset);
    const i = date === undefined ? undefined : row.get(date);
    const line = i === undefined ? 1 : parsed.lineOf(Math.max(k, 0), i) || 1;
    return { line, column: k === -1 ? 1 : parsed.assets[k].column };
  };
  return { table, locate, warnings: warningLines(report), report };
}

/** One error for a refused file: located at its first problem, the others listed below it. */
function problemsError(report: ValidationReport): InputError {
  const [first] = report.listed;
  const rest = problemLines(report).slice(1);
  const message = first.asset === undefined ? first.message : `${first.asset}: ${first.message}`;
  return new InputError(rest.length ? `${message}\n  ${rest.join('\n  ')}` : message, {
    file: report.file,
    line: first.line,
    column: first.column,
  });
}
