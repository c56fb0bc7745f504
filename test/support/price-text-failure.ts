import { InputError, formatInputError } from '../../shared-core/errors.js';
import { priceTableFromText } from '../../src-main/io/read-price-table.js';

/** The message the price reader gives for `text` read as the file p.csv; throws if it reads it. */
export function priceTextFailure(text: string): string {
  try {
    priceTableFromText(text, { file: 'p.csv' });
  } catch (error) {
    if (error instanceof InputError) return formatInputError(error);
    throw error;
  }
  throw new Error('expected an InputError');
}
