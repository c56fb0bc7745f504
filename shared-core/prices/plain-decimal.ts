/** The decimal mark of a price file: a point (1234.5) or a comma (1234,5). */
export type DecimalMark = 'point' | 'comma';

/** 10^0 to 10^22, each exact (5^22 < 2^53), made by exact products rather than by a power function. */
const POW10: number[] = [1];
for (let k = 1; k <= 22; k++) POW10.push(POW10[k - 1] * 10);

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
 * conversion (correctly rounded). `readDecimalCells` reads a line of such numbers from its bytes,
 * to the same doubles (test/unit/prices/read-decimal-cells.test.ts checks that they agree).
 */
export function readDecimal(text: string, mark: DecimalMark): number {
  if (!GRAMMAR[mark].test(text)) return NaN;
  return Number(mark === 'comma' ? text.replace(',', '.') : text);
}

/**
 * Cells separated by the byte `separator` in `bytes[start, end)` (ASCII: one byte per character),
 * read in place, without a string per cell: cell k into `columns[k][at]` (at least one column),
 * NaN when empty, else a number of `readDecimal`'s grammar without blanks, `[+-]digits[mark
 * digits][(e|E)[+-]digits]`, to the double `readDecimal` gives (Number(), correctly rounded).
 *
 * The digits before and after the mark are gathered as two integers, exact while each has at most
 * 9 digits. With at most 15 significant digits in all (leading zeros counted) and a power of ten
 * within 10^±22, both the digits as one integer and the power of ten are exact doubles, so one
 * multiplication or division gives the correctly rounded double (Clinger 1990, "How to read
 * floating point numbers accurately", the fast path). Such a value is 0 or lies within
 * [1e-22, 1e37], inside the range of a price.
 *
 * Returns the least value read (+Infinity when every cell is empty), so that a caller checks a
 * line of prices for positivity at once; or NaN as soon as a cell is anything else (a blank, a
 * quote, a second mark, more digits or a larger power of ten than the fast path takes) or the
 * range does not hold exactly `columns.length` cells (what was written then means nothing; the
 * caller takes its general path, which reads each cell with Number() and names each problem; a
 * string per cell there costs no more than one made here). The byte after the range must exist
 * and be none of a digit, the mark or `e` (a line break is none): it stops the digit loops, which
 * then need not test for the end of the range.
 *
 * Written for V8's first pass over a file as much as for its optimised code: one call per line,
 * no call inside, few operations per byte. Every test runs in each cell, none only before or
 * after the loop: V8 compiles the function while its first line is being read, and a test that
 * had not run by then would be compiled without type feedback and deoptimise on every later
 * line. The character codes are written as numbers: a module constant costs the unoptimised code
 * a load each time.
 */
export function readDecimalCells(
  bytes: Uint8Array,
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
    let code = bytes[i];
    let value = NaN; // an empty cell
    if (i < end && code !== separator) {
      let negative = false;
      if (code === 45 || code === 43) {
        negative = code === 45; // '-' rather than '+'
        code = bytes[++i];
      }
      const wholeStart = i;
      let whole = 0;
      // '0' to '9' give 0 to 9 under the exclusive or, anything else more; `| 0` keeps the
      // integer in 32 bits (it wraps past 9 digits, which then are not used).
      for (; (code ^ 48) <= 9; code = bytes[++i]) whole = (whole * 10 + (code ^ 48)) | 0;
      const wholeDigits = i - wholeStart;
      let part = 0;
      let fraction = 0;
      if (code === markCode && i < end) {
        const partStart = ++i;
        code = bytes[i];
        for (; (code ^ 48) <= 9; code = bytes[++i]) part = (part * 10 + (code ^ 48)) | 0;
        fraction = i - partStart;
      }
      if (wholeDigits + fraction === 0) return NaN;
      let exponent = 0;
      if ((code | 32) === 101 && i < end) {
        code = bytes[++i];
        let below = false;
        if (code === 45 || code === 43) {
          below = code === 45;
          code = bytes[++i];
        }
        const exponentStart = i;
        for (; (code ^ 48) <= 9; code = bytes[++i]) if (exponent < 100_000) exponent = exponent * 10 + (code ^ 48);
        if (i === exponentStart) return NaN;
        if (below) exponent = -exponent;
      }
      if (i < end && code !== separator) return NaN;
      const scale = exponent - fraction;
      if (wholeDigits > 9 || fraction > 9 || wholeDigits + fraction > 15 || scale < -22 || scale > 22) return NaN;
      const digits = fraction > 0 ? whole * POW10[fraction] + part : whole;
      const magnitude = scale < 0 ? digits / POW10[-scale] : scale > 0 ? digits * POW10[scale] : digits;
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
