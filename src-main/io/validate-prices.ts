import { formatInputError, InputError } from '../../shared-core/errors.js';
import { isoFromDay, weekday } from '../store/days.js';
import { LISTED, ProblemList, type LocatedProblem } from './problem-list.js';
import type { ParsedPriceFile } from './read-price-file.js';

/** Relative one-day move above which a price is flagged for a second look (not rejected). */
export const DEFAULT_SUSPICIOUS_MOVE = 0.25;

export interface CellProblem {
  line: number;
  column: number;
  message: string;
}

export interface FileProblem {
  line?: number;
  column?: number;
  message: string;
}

export interface SuspiciousMove {
  date: string;
  previousDate: string;
  change: number;
  line: number;
  column: number;
}

export interface AssetReport {
  asset: string;
  rowsRead: number;
  firstDate?: string;
  lastDate?: string;
  /** Weekdays between the first and last date with no price (holidays included: common practice). */
  missingDays: number;
  emptyCells: number;
  /** The listed problems of this asset's cells (at most 20 over the whole file). */
  nonPositive: CellProblem[];
  unparseable: CellProblem[];
  /** Cells that are not prices (not a number, or out of range), listed or not. */
  unparseableCount: number;
  nonPositiveCount: number;
  repeatedDates: { date: string; lines: number[] }[];
  /** The first 20 flagged moves of this asset; `suspiciousMoveCount` counts them all. */
  suspiciousMoves: SuspiciousMove[];
  suspiciousMoveCount: number;
  /** No error of its own (suspicious moves are warnings). */
  ok: boolean;
}

export interface ValidationReport {
  file: string;
  form: 'wide' | 'long';
  delimiter: 'comma' | 'semicolon' | 'tab';
  decimal: 'point' | 'comma';
  encoding: ParsedPriceFile['encoding'];
  dateOrder: 'iso' | 'day-first' | 'month-first' | 'ambiguous';
  dataRows: number;
  suspiciousMove: number;
  /** The listed problems of the file as a whole (rows, dates), each with its line and column. */
  problems: FileProblem[];
  /** The first 20 problems of every kind in file order, and how many there are in all. */
  listed: LocatedProblem[];
  problemCount: number;
  /** The first 20 flagged moves in file order, and how many there are in all. */
  warnings: LocatedProblem[];
  warningCount: number;
  assets: AssetReport[];
  /** Nothing in the way of writing (the date order is known and no cell or row has an error). */
  ok: boolean;
}

/**
 * The one validation of a price file, for the import and every command, computed before anything
 * is written or run: what the reading found (cells, rows, dates), plus the file's date order and
 * each asset's one-day moves above `suspiciousMove`, flagged as warnings.
 */
export function validatePrices(parsed: ParsedPriceFile, suspiciousMove = DEFAULT_SUSPICIOUS_MOVE): ValidationReport {
  const problems = new ProblemList();
  for (const p of parsed.problems.listed) problems.add(p);
  problems.count += parsed.problems.unlisted;
  if (parsed.dateOrder === 'ambiguous')
    problems.add({
      kind: 'file',
      message:
        'every date reads both day-first and month-first (no day above 12); choose the order (--date-order day-first or month-first)',
    });
  if (parsed.dataRows === 0)
    problems.add({ kind: 'file', line: 1, message: 'the file has a header but no rows of prices' });

  const warnings = new ProblemList();
  const days = parsed.days;
  const weekdayFlags = Uint8Array.from(days, (d) => (weekday(d) < 5 ? 1 : 0));
  const assets = parsed.assets.map((a, k): AssetReport => {
    const moves: SuspiciousMove[] = [];
    let count = 0;
    const { first, last, weekdays, values } = scanSeries(
      a.closes,
      weekdayFlags,
      suspiciousMove,
      (i, previous, change) => {
        count++;
        const move = {
          date: isoFromDay(days[i]),
          previousDate: isoFromDay(days[previous]),
          change,
          line: parsed.lineOf(k, i),
          column: a.column,
        };
        if (moves.length < LISTED) moves.push(move);
        warnings.add({
          kind: 'jump',
          line: move.line,
          column: move.column,
          asset: a.id,
          change,
          date: move.date,
          previousDate: move.previousDate,
          message: `one-day move of ${(100 * change).toFixed(1)}% on ${move.date} (flagged, kept)`,
        });
      },
    );
    const report: AssetReport = {
      asset: a.id,
      rowsRead: values,
      missingDays: first === -1 ? 0 : weekdaysBetween(days[first], days[last]) - weekdays,
      emptyCells: a.blankCells ?? days.length - values - a.unparseableCount - a.nonPositiveCount,
      nonPositive: [],
      unparseable: [],
      unparseableCount: a.unparseableCount,
      nonPositiveCount: a.nonPositiveCount,
      repeatedDates: [],
      suspiciousMoves: moves,
      suspiciousMoveCount: count,
      ok: a.unparseableCount === 0 && a.nonPositiveCount === 0,
    };
    if (first !== -1) {
      report.firstDate = isoFromDay(days[first]);
      report.lastDate = isoFromDay(days[last]);
    }
    return report;
  });

  // The listed problems, each under its asset where it has one (the service shows them there).
  const byId = new Map(assets.map((a) => [a.asset, a]));
  const fileProblems: FileProblem[] = [];
  for (const p of problems.listed) {
    const a = p.asset === undefined ? undefined : byId.get(p.asset);
    const cell = { line: p.line ?? 1, column: p.column ?? 1, message: p.message };
    if (a && p.kind === 'non-positive') a.nonPositive.push(cell);
    else if (a && p.kind === 'unparseable') a.unparseable.push(cell);
    else if (a && p.kind === 'repeated-date') {
      a.repeatedDates.push({ date: p.date ?? '', lines: p.lines ?? [] });
      a.ok = false;
    } else fileProblems.push({ line: p.line, column: p.column, message: p.message });
  }
  return {
    file: parsed.file,
    form: parsed.form,
    delimiter: parsed.delimiter === ',' ? 'comma' : parsed.delimiter === ';' ? 'semicolon' : 'tab',
    decimal: parsed.decimal,
    encoding: parsed.encoding,
    dateOrder: parsed.dateOrder,
    dataRows: parsed.dataRows,
    suspiciousMove,
    problems: fileProblems,
    listed: problems.listed,
    problemCount: problems.count,
    warnings: warnings.listed,
    warningCount: warnings.count,
    assets,
    ok: problems.count === 0,
  };
}

/** `file:line:column: asset: message`, one per listed problem, then how many more there are. */
export function problemLines(report: ValidationReport): string[] {
  return describe(report.file, report.listed, report.problemCount, 'problems');
}

/** The flagged moves in the same form. */
export function warningLines(report: ValidationReport): string[] {
  return describe(report.file, report.warnings, report.warningCount, 'flagged moves');
}

function describe(file: string, listed: readonly LocatedProblem[], count: number, what: string): string[] {
  const lines = listed.map((p) =>
    formatInputError(
      new InputError(p.asset === undefined ? p.message : `${p.asset}: ${p.message}`, {
        file,
        line: p.line,
        column: p.column,
      }),
    ),
  );
  if (count > listed.length) lines.push(`${file}: ${count - listed.length} more ${what} not listed`);
  return lines;
}

/**
 * One pass over a series on the file's days (NaN: no price): its first and last priced day, the
 * prices and weekdays priced, and each move between consecutive prices above the threshold.
 */
function scanSeries(
  closes: Float64Array,
  weekdayFlags: Uint8Array,
  threshold: number,
  onMove: (i: number, previous: number, change: number) => void,
): { first: number; last: number; weekdays: number; values: number } {
  let first = -1;
  let last = -1;
  let weekdays = 0;
  let values = 0;
  for (let i = 0; i < closes.length; i++) {
    const close = closes[i];
    if (close !== close) continue;
    values++;
    weekdays += weekdayFlags[i];
    if (last !== -1) {
      const change = close / closes[last] - 1;
      if (change > threshold || change < -threshold) onMove(i, last, change);
    } else first = i;
    last = i;
  }
  return { first, last, weekdays, values };
}

/** Monday-to-Friday days in [from, to]. */
function weekdaysBetween(from: number, to: number): number {
  let count = 0;
  const full = Math.floor((to - from + 1) / 7);
  count += full * 5;
  for (let d = from + full * 7; d <= to; d++) if (weekday(d) < 5) count++;
  return count;
}
