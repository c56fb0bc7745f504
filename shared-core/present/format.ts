/**
 * The one place figures and dates become text, for the memo and the screens alike. Every weight,
 * volatility, ratio and amount goes through these functions, so a figure printed twice reads the
 * same twice, and a test can round `holdfast solve`'s weights with the same function and find
 * them in the PDF. The memo prints in the plain notation (12.3%, 1,250,000 EUR); the screens pass
 * the notation of the user's locale (`notationFor`), which changes only the separators and the
 * place of the per cent sign, never the digits.
 *
 * Rounding is half away from zero on the number's shortest decimal form (the digits JavaScript
 * prints for it), which is what ICU's number formatting does, so the memo and the app's screens
 * (Intl.NumberFormat) round every weight the same way: 0.1235 is 12.4%, not 12.3% as
 * (0.1235 * 100).toFixed(1) gives. Scaling by 100 is done on the digits, not in floating point.
 * A value that rounds to zero prints without a sign.
 */

/** The minus sign used for negative figures (U+2212, the typographic minus). */
export const MINUS = '\u2212';

/** What reads for a figure that cannot be computed. */
export const DASH = '\u2013';

/** Separators and the per cent pattern of one locale. */
export interface Notation {
  decimal: string;
  group: string;
  /** Text between the number and the per cent sign (a no-break space in many locales). */
  percentGap: string;
}

/** The memo's notation and the files': 1,234.5 and 12.3%. */
export const PLAIN: Notation = { decimal: '.', group: ',', percentGap: '' };

const notations = new Map<string, Notation>();

/** The notation of a BCP 47 locale (`undefined`: the runtime's own), read once from Intl. */
export function notationFor(locale: string | undefined): Notation {
  const key = locale ?? '';
  let n = notations.get(key);
  if (!n) {
    const parts = new Intl.NumberFormat(locale, { useGrouping: true }).formatToParts(12345.6);
    const pct = new Intl.NumberFormat(locale, { style: 'percent' }).formatToParts(0.5);
    const sign = pct.findIndex((p) => p.type === 'percentSign');
    const gap = sign > 0 && pct[sign - 1].type === 'literal' ? pct[sign - 1].value : '';
    n = {
      decimal: parts.find((p) => p.type === 'decimal')?.value ?? '.',
      group: parts.find((p) => p.type === 'group')?.value ?? ',',
      percentGap: gap,
    };
    notations.set(key, n);
  }
  return n;
}

function localise(text: string, notation: Notation): string {
  if (notation === PLAIN) return text;
  return text.replace(/[.,]/g, (c) => (c === '.' ? notation.decimal : notation.group));
}

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
export function formatFixed(value: number, digits: number, notation: Notation = PLAIN): string {
  if (!Number.isFinite(value)) return DASH;
  const { units, negative } = decimalUnits(value, digits);
  return signed(localise(unitsText(units, digits), notation), negative);
}

/** A weight in signed tenths of a percent, as printed: 0.1235 -> 124. */
export function percentTenths(weight: number): number {
  const { units, negative } = decimalUnits(weight, 1, 2);
  return negative ? -Number(units) : Number(units);
}

/** A weight (fraction) as a percentage with `digits` decimals, without the % sign: 0.1234 -> "12.3". */
export function formatPercent1(weight: number, notation: Notation = PLAIN, digits = 1): string {
  if (!Number.isFinite(weight)) return DASH;
  const { units, negative } = decimalUnits(weight, digits, 2);
  return signed(localise(unitsText(units, digits), notation), negative);
}

/** The same with a `%` sign: "12.3%" (or "12,3 %" in a locale that writes it so). */
export function formatPct(weight: number, notation: Notation = PLAIN, digits = 1): string {
  if (!Number.isFinite(weight)) return DASH;
  return `${formatPercent1(weight, notation, digits)}${notation.percentGap}%`;
}

/** A difference of two fractions in per cent with an explicit sign: +2.1%, −0.4%, 0.0%. */
export function formatSignedPct(delta: number, notation: Notation = PLAIN, digits = 1): string {
  if (!Number.isFinite(delta)) return DASH;
  return withSign(formatPct(delta, notation, digits));
}

/** A change in percentage points with an explicit sign: +2.0, −1.5, 0.0. */
export function formatChangePoints(delta: number): string {
  return withSign(formatPercent1(delta));
}

function withSign(text: string): string {
  return /^[0.,\s\u00a0\u202f%]+$/.test(text) || text.startsWith(MINUS) || text === DASH ? text : `+${text}`;
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
export function formatRatio2(value: number, notation: Notation = PLAIN): string {
  return formatFixed(value, 2, notation);
}

/** Groups thousands: 1234567 -> "1,234,567". */
function groupThousands(digits: string, group: string): string {
  return digits.replace(/\B(?=(\d{3})+(?!\d))/g, group);
}

/** Decimals needed to show multiples of `lot` exactly (1000 -> 0, 0.5 -> 1, 0.01 -> 2). */
export function decimalsForLot(lot: number): number {
  for (let d = 0; d <= 6; d++) if (Math.abs(roundHalfAway(lot, d) - lot) < 1e-9 * Math.max(1, lot)) return d;
  return 6;
}

/** An amount with thousands separators and `decimals` decimals: −12,500. */
export function formatAmount(value: number, decimals = 0, notation: Notation = PLAIN): string {
  if (!Number.isFinite(value)) return DASH;
  const { units, negative } = decimalUnits(value, decimals);
  const [whole, frac] = unitsText(units, decimals).split('.');
  return signed(groupThousands(whole, notation.group) + (frac ? `${notation.decimal}${frac}` : ''), negative);
}

/** An amount with an explicit sign for trades: +12,000, −3,000, 0. */
export function formatTrade(value: number, decimals = 0, notation: Notation = PLAIN): string {
  return withSign(formatAmount(value, decimals, notation));
}

/** An amount followed by its ISO 4217 code: "1,250,000 EUR". */
export function formatMoney(value: number, currency: string, decimals = 0, notation: Notation = PLAIN): string {
  if (!Number.isFinite(value)) return DASH;
  return `${formatAmount(value, decimals, notation)} ${currency}`;
}

/**
 * An ISO 8601 day ("2024-03-31") in a locale's medium date ("31 Mar 2024"), read in UTC so the
 * day never shifts with the time zone. Screens show dates so; files and the memo keep ISO 8601.
 * Text that is not an ISO day is returned as it is.
 */
/** The ISO 8601 days inside a sentence of the core's, in the reader's locale: screens only. */
export function daysInLocale(text: string, locale: string | undefined): string {
  return text.replace(/\b\d{4}-\d{2}-\d{2}\b/g, (day) => formatDay(day, locale));
}

export function formatDay(iso: string, locale: string | undefined): string {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(iso);
  if (!match) return iso;
  const date = new Date(Date.UTC(Number(match[1]), Number(match[2]) - 1, Number(match[3])));
  return dayFormat(locale).format(date);
}

const dayFormats = new Map<string, Intl.DateTimeFormat>();

function dayFormat(locale: string | undefined): Intl.DateTimeFormat {
  let f = dayFormats.get(locale ?? '');
  if (!f) {
    f = new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeZone: 'UTC' });
    dayFormats.set(locale ?? '', f);
  }
  return f;
}

/** An instant (ISO 8601 with time) as the locale's medium date and short time, in local time: "1 Dec 2026, 14:02". */
export function formatInstant(iso: string | null | undefined, locale?: string): string {
  if (!iso) return DASH;
  const t = Date.parse(iso);
  if (!Number.isFinite(t)) return iso;
  return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeStyle: 'short' }).format(new Date(t));
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

/** A count with its noun, singular for exactly one: "1 asset", "25 assets", "0 trades". */
export function countOf(n: number, singular: string, plural = `${singular}s`): string {
  return `${formatAmount(n)} ${n === 1 ? singular : plural}`;
}

/** A moment's time of day in the locale: "14:02". */
export function formatTimeOfDay(iso: string | null | undefined, locale?: string): string {
  if (!iso) return DASH;
  const t = Date.parse(iso);
  if (!Number.isFinite(t)) return iso;
  return new Intl.DateTimeFormat(locale, { timeStyle: 'short' }).format(new Date(t));
}

/** Today's date as ISO 8601 `YYYY-MM-DD` in the user's own time zone (for files and fields). */
export function todayIso(now = new Date()): string {
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${now.getFullYear()}-${pad(now.getMonth() + 1)}-${pad(now.getDate())}`;
}
