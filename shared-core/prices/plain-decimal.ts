/** The decimal mark of a price file: a point (1234.5) or a comma (1234,5). */
export type DecimalMark = 'point' | 'comma';

const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * A plain decimal `[+-]digits[.digits]` in `text[start, end)` without making a substring, or
 * NaN when the cell is anything else (the caller then takes the general path). With at most 15
 * significant digits the digits form an exact integer and 10^k is exact, so one division gives
 * the correctly rounded double, the same as Number() (Clinger 1990, "How to read floating point
 * numbers accurately", the fast path).
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
