/**
 * What a price may be, wherever it comes from (a price file, a household file): a finite number
 * above zero, within [MIN_PRICE, MAX_PRICE], so that the ratio of any two prices, and hence
 * every return, is a finite normal double (IEEE 754 doubles reach about 1e308; 1e150 / 1e-150 is
 * 1e300). A cell of 1e308 or 1e-320 is a typing or export error, not a price.
 */
export const MIN_PRICE = 1e-150;
export const MAX_PRICE = 1e150;

/** Why `value` cannot be a price, or undefined when it can. */
export function priceProblem(value: number): string | undefined {
  if (!(value > 0)) return 'a price must be above zero';
  if (value < MIN_PRICE || value > MAX_PRICE)
    return 'a price must lie between 1e-150 and 1e150 (so that every ratio of two prices is a finite number)';
  return undefined;
}
