/** The decimal mark of a price file: a point (1234.5) or a comma (1234,5). */
export type DecimalMark = 'point' | 'comma';

const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k);

/** The character codes of the two decimal marks. */
export const POINT = 46;
export const COMMA = 44;

const GRAMMAR = {
  point: /^[ \t]*[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?[ \t]*$/,
  comma: /^[ \t]*[+-]?(?:\d+(?:,\d*)?|,\d+)(?:[eE][+-]?\d+)?[ \t]*$/,
};

/**
 * The one grammar of a number in a price file: an optional sign, digits with at most one decimal
 * mark (the file's: point or comma), an optional exponent, blanks around it; no thousands
 * separators, no hex, no `Infinity`. NaN when `text` is anything else. `Number()` does the
 * conversion (correctly rounded). `readPlainDecimals` reads the common subset in place, to the
 * same double (test/unit/prices/read-plain-decimals.test.ts checks that they agree).
 */
export function readDecimal(text: string, mark: DecimalMark): number {
  if (!GRAMMAR[mark].test(text)) return NaN;
  return Number(mark === 'comma' ? text.replace(',', '.') : text);
}

/**
 * Cells separated by the character code `separator` in `text[start, end)`, read in place: cell k
 * into `columns[k][at]` (at least one column), NaN when empty, else a plain decimal
 * `[+-]digits[.digits]` of 1 to 15 digits (here with the decimal mark `markCode`), read as
 * `readDecimal` reads it, to the same double: with at most 15 significant digits the digits form
 * an exact integer and 10^k is exact, so one division gives the correctly rounded double
 * (Clinger 1990, "How to read floating point numbers accurately", the fast path).
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
 * reads the first lines runs some 30% fewer instructions than a scan of each cell found by
 * indexOf (Node 20, --no-opt, 500 x 1261 prices). Every test runs in each cell, none
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
