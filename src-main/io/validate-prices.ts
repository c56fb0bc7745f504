import { isoFromDay, weekday } from '../store/days.js';
import type { CellProblem, FileProblem, ParsedPriceFile } from './read-price-file.js';

/** Relative one-day move above which a price is flagged for a second look (not rejected). */
export const DEFAULT_SUSPICIOUS_MOVE = 0.25;

export interface AssetReport {
  asset: string;
  rowsRead: number;
  firstDate?: string;
  lastDate?: string;
  /** Weekdays between the first and last date with no price (holidays included: common practice). */
  missingDays: number;
  emptyCells: number;
  nonPositive: CellProblem[];
  unparseable: CellProblem[];
  unparseableCount: number;
  repeatedDates: { date: string; lines: number[] }[];
  suspiciousMoves: { date: string; previousDate: string; change: number; line: number }[];
  /** No error of its own (suspicious moves are warnings). */
  ok: boolean;
}

export interface ValidationReport {
  file: string;
  form: 'wide' | 'long';
  delimiter: 'comma' | 'semicolon' | 'tab';
  decimal: 'point' | 'comma';
  dateOrder: 'iso' | 'day-first' | 'month-first' | 'ambiguous';
  dataRows: number;
  suspiciousMove: number;
  /** Problems of the file as a whole (rows, dates), each with its line and column. */
  problems: FileProblem[];
  assets: AssetReport[];
  /** Nothing in the way of writing (the date order is known and no asset has an error). */
  ok: boolean;
}

/** The per-asset validation report of a file, computed before anything is written. */
export function validatePrices(parsed: ParsedPriceFile, suspiciousMove = DEFAULT_SUSPICIOUS_MOVE): ValidationReport {
  const assets = parsed.assets.map((a): AssetReport => {
    const nonPositive: CellProblem[] = [];
    const repeated = new Map<number, number[]>();
    const moves: AssetReport['suspiciousMoves'] = [];
    let weekdays = 0;
    for (let i = 0; i < a.days.length; i++) {
      const close = a.closes[i];
      if (!(close > 0))
        nonPositive.push({
          line: a.lines[i],
          column: a.column,
          text: String(close),
          message: 'a price must be above zero',
        });
      if (i > 0 && a.days[i] === a.days[i - 1]) {
        const lines = repeated.get(a.days[i]) ?? [a.lines[i - 1]];
        lines.push(a.lines[i]);
        repeated.set(a.days[i], lines);
        continue;
      }
      if (weekday(a.days[i]) < 5) weekdays++;
      if (i > 0 && close > 0 && a.closes[i - 1] > 0) {
        const change = close / a.closes[i - 1] - 1;
        if (Math.abs(change) > suspiciousMove)
          moves.push({
            date: isoFromDay(a.days[i]),
            previousDate: isoFromDay(a.days[i - 1]),
            change,
            line: a.lines[i],
          });
      }
    }
    const n = a.days.length;
    const report: AssetReport = {
      asset: a.id,
      rowsRead: a.values,
      missingDays: n ? weekdaysBetween(a.days[0], a.days[n - 1]) - weekdays : 0,
      emptyCells: a.emptyCells,
      nonPositive,
      unparseable: a.unparseable,
      unparseableCount: a.unparseableCount,
      repeatedDates: [...repeated].map(([d, lines]) => ({ date: isoFromDay(d), lines })),
      suspiciousMoves: moves,
      ok: nonPositive.length === 0 && a.unparseableCount === 0 && repeated.size === 0,
    };
    if (n) {
      report.firstDate = isoFromDay(a.days[0]);
      report.lastDate = isoFromDay(a.days[n - 1]);
    }
    return report;
  });
  const problems = [...parsed.problems];
  if (parsed.dateOrder === 'ambiguous')
    problems.push({
      message:
        'every date reads both day-first and month-first (no day above 12); choose the order (--date-order day-first or month-first)',
    });
  if (parsed.dataRows === 0) problems.push({ message: 'the file has a header but no rows of prices' });
  return {
    file: parsed.file,
    form: parsed.form,
    delimiter: parsed.delimiter === ',' ? 'comma' : parsed.delimiter === ';' ? 'semicolon' : 'tab',
    decimal: parsed.decimal,
    dateOrder: parsed.dateOrder,
    dataRows: parsed.dataRows,
    suspiciousMove,
    problems,
    assets,
    ok: problems.length === 0 && assets.every((a) => a.ok),
  };
}

/** Monday-to-Friday days in [from, to]. */
function weekdaysBetween(from: number, to: number): number {
  let count = 0;
  const full = Math.floor((to - from + 1) / 7);
  count += full * 5;
  for (let d = from + full * 7; d <= to; d++) if (weekday(d) < 5) count++;
  return count;
}
