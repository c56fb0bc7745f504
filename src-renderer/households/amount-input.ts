/**
 * An amount of money as an advisor types it, to a number: "1,200,000", "1 200 000", "1'200'000",
 * "1200000.50", "1.200.000,50". With both separators the last one is the decimal mark; a lone
 * comma followed by groups of exactly three digits is a thousands separator, otherwise a decimal
 * comma. Returns a reason instead of guessing when the text is not an amount.
 */
export type AmountParse = { ok: true; value: number } | { ok: false; reason: string };

export function parseAmountInput(text: string): AmountParse {
  const compact = text.trim().replace(/[\s\u00a0\u202f'_]/g, '');
  if (compact === '') return { ok: false, reason: 'enter an amount' };
  if (compact.startsWith('-') || compact.startsWith('\u2212'))
    return { ok: false, reason: 'an amount cannot be negative' };
  if (!/^[\d.,]+$/.test(compact)) return { ok: false, reason: 'only digits and separators, such as 1,250,000' };
  const lastDot = compact.lastIndexOf('.');
  const lastComma = compact.lastIndexOf(',');
  let normal: string;
  if (lastDot >= 0 && lastComma >= 0) {
    const decimal = lastDot > lastComma ? '.' : ',';
    const group = decimal === '.' ? ',' : '.';
    normal = compact.split(group).join('').replace(decimal, '.');
  } else if (lastComma >= 0) {
    normal = /^\d{1,3}(,\d{3})+$/.test(compact) ? compact.replace(/,/g, '') : compact.replace(',', '.');
  } else if (lastDot >= 0) {
    normal = /^\d{1,3}(\.\d{3}){2,}$/.test(compact) ? compact.replace(/\./g, '') : compact;
  } else normal = compact;
  if (!/^\d+(\.\d+)?$/.test(normal)) return { ok: false, reason: 'not an amount; type it as 1,250,000 or 1250000.50' };
  return { ok: true, value: Number(normal) };
}
