/**
 * The one place the memo turns numbers into text. Every weight, volatility and amount in the
 * memo goes through these functions, so a figure printed twice reads the same twice, and a test
 * can round `holdfast solve`'s weights with the same function and find them in the PDF.
 *
 * Rounding is half away from zero on the number's shortest decimal form (the digits JavaScript
 * prints for it), which is what ICU's number formatting does, so the memo and the app's screens
 * (Intl.NumberFormat) round every weight the same way: 0.1235 is 12.4%, not 12.3% as
 * (0.1235 * 100).toFixed(1) gives. Scaling by 100 is done on the digits, not in floating point.
 * A value that rounds to zero prints without a sign. No locale data is used.
 */

/** The minus sign used for negative figures (U+2212, the typographic minus). */
export const MINUS = '\u2212';

/**
 * |value| x 10^shift rounded half away from zero to `digits` decimals, as an integer count of
 * 10^-digits units (a bigint, so large amounts stay exact), and the sign.
 */
function decimalUnits(value: number, digits: number, shift = 0): { units: bigint; negative: boolean } {
  const m = /^(\d+)(?:\.(\d+))?(?:e([+-]\d+))?$/.exec(Math.abs(value).toString());
  if (!m) throw new RangeError(`cannot format ${value}`);
  const all = m[1] + (m[2] ?? '');
  const point = m[1].length + Number(m[3] ?? 0) + shift;
  const keep = point + digits;
  let units = 0n;
  if (keep > 0) units = BigInt((all + '0'.repeat(Math.max(0, keep - all.length))).slice(0, keep) || '0');
  const next = keep >= 0 && keep < all.length ? all.charCodeAt(keep) - 48 : 0;
  if (next >= 5) units += 1n;
  return { units, negative: value < 0 && units !== 0n };
}

function unitsText(units: bigint, digits: number): string {
  const raw = units.toString().padStart(digits + 1, '0');
  return digits === 0 ? raw : `${raw.slice(0, -digits)}.${raw.slice(-digits)}`;
}

/** Rounds to `digits` decimals, half away from zero on the shortest decimal form. */
export function roundHalfAway(value: number, digits: number): number {
  if (!Number.isFinite(value)) return value;
  const { units, negative } = decimalUnits(value, digits);
  const r = Number(unitsText(units, digits));
  return negative ? -r : r;
}

function signed(text: string, negative: boolean): string {
  return negative ? MINUS + text : text;
}

/** A number with a fixed number of decimals and ASCII digits, no grouping. */
export function formatFixed(value: number, digits: number): string {
  if (!Number.isFinite(value)) return '\u2013';
  const { units, negative } = decimalUnits(value, digits);
  return signed(unitsText(units, digits), negative);
}

/** A weight in signed tenths of a percent, as printed: 0.1235 -> 124. */
export function percentTenths(weight: number): number {
  const { units, negative } = decimalUnits(weight, 1, 2);
  return negative ? -Number(units) : Number(units);
}

/** A weight (fraction) as a percentage with one decimal, without the % sign: 0.1234 -> "12.3". */
export function formatPercent1(weight: number): string {
  if (!Number.isFinite(weight)) return '\u2013';
  const { units, negative } = decimalUnits(weight, 1, 2);
  return signed(unitsText(units, 1), negative);
}

/** The same with a `%` sign. */
export function formatPct(weight: number): string {
  return `${formatPercent1(weight)}%`;
}

/** A change in percentage points with an explicit sign: +2.0, −1.5, 0.0. */
export function formatChangePoints(delta: number): string {
  return withSign(formatPercent1(delta));
}

function withSign(text: string): string {
  return /^[0.,]+$/.test(text) || text.startsWith(MINUS) || text === '\u2013' ? text : `+${text}`;
}

/**
 * The change between two weights as the difference of their printed values (12.3 -> 15.0 is
 * +2.7), so every row of the allocation table reads true by itself.
 */
export function formatWeightChange(from: number, to: number): string {
  const tenths = percentTenths(to) - percentTenths(from);
  return withSign(formatFixed(tenths / 10, 1));
}

/** Diversification ratio, effective bets and similar ratios: two decimals. */
export function formatRatio2(value: number): string {
  return formatFixed(value, 2);
}

/** Groups thousands with commas: 1234567 -> "1,234,567". */
function groupThousands(digits: string): string {
  return digits.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

/** Decimals needed to show multiples of `lot` exactly (1000 -> 0, 0.5 -> 1, 0.01 -> 2). */
export function decimalsForLot(lot: number): number {
  for (let d = 0; d <= 6; d++) if (Math.abs(roundHalfAway(lot, d) - lot) < 1e-9 * Math.max(1, lot)) return d;
  return 6;
}

/** An amount with thousands separators and `decimals` decimals: −12,500. */
export function formatAmount(value: number, decimals = 0): string {
  if (!Number.isFinite(value)) return '\u2013';
  const { units, negative } = decimalUnits(value, decimals);
  const [whole, frac] = unitsText(units, decimals).split('.');
  return signed(groupThousands(whole) + (frac ? `.${frac}` : ''), negative);
}

/** An amount with an explicit sign for trades: +12,000, −3,000, 0. */
export function formatTrade(value: number, decimals = 0): string {
  return withSign(formatAmount(value, decimals));
}

/** An amount followed by its ISO 4217 code: "1,250,000 EUR". */
export function formatMoney(value: number, currency: string, decimals = 0): string {
  return `${formatAmount(value, decimals)} ${currency}`;
}

/** Ordinal for ranks in sentences: 1st, 2nd, 3rd, 4th, 11th. */
export function ordinal(n: number): string {
  const mod100 = n % 100;
  if (mod100 >= 11 && mod100 <= 13) return `${n}th`;
  return `${n}${({ 1: 'st', 2: 'nd', 3: 'rd' } as Record<number, string>)[n % 10] ?? 'th'}`;
}

/** "a, b and c". */
export function listInWords(items: readonly string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
