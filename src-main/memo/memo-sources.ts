import { InputError } from '../../shared-core/errors.js';
import { parseJsonText } from '../../shared-core/scenario/json-text.js';
import type { MemoPosition } from './memo-input.js';

/**
 * Holdings for `holdfast memo --holdings FILE.json`, in either of two forms:
 * - the demo household document (`holdfast-demo-household@1`, written by `holdfast demo`): its
 *   `holdings[].baseAmount` (the amount in the base currency), `asOf` and household name;
 * - a plain document `{ "asOf": "YYYY-MM-DD", "positions": [{ "asset": "ID", "amount": 1250000 }] }`
 *   with amounts already in the base currency.
 * Errors name the JSON path.
 */
export interface HoldingsFile {
  householdName?: string;
  baseCurrency?: string;
  asOf: string | null;
  positions: MemoPosition[];
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function amountAt(value: unknown, path: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0)
    throw new InputError('expected an amount of zero or more', { path });
  return value;
}

function assetAt(value: unknown, path: string): string {
  if (typeof value !== 'string' || value === '') throw new InputError('expected an asset id', { path });
  return value;
}

export function parseHoldingsText(text: string): HoldingsFile {
  const doc = parseJsonText(text);
  if (!isRecord(doc)) throw new InputError('expected a JSON object', { path: '$' });
  const asOf = typeof doc.asOf === 'string' ? doc.asOf : null;
  if (doc.format === 'holdfast-demo-household@1') {
    if (!Array.isArray(doc.holdings)) throw new InputError('expected an array of holdings', { path: 'holdings' });
    const household = isRecord(doc.household) ? doc.household : {};
    return {
      householdName: typeof household.name === 'string' ? household.name : undefined,
      baseCurrency: typeof household.baseCurrency === 'string' ? household.baseCurrency : undefined,
      asOf,
      positions: doc.holdings.map((h: unknown, i) => {
        const path = `holdings[${i}]`;
        if (!isRecord(h)) throw new InputError('expected a holding object', { path });
        return { asset: assetAt(h.asset, `${path}.asset`), amount: amountAt(h.baseAmount, `${path}.baseAmount`) };
      }),
    };
  }
  if (!Array.isArray(doc.positions))
    throw new InputError(
      "expected 'positions': [{ asset, amount }] in the base currency, or a holdfast-demo-household@1 document",
      { path: 'positions' },
    );
  return {
    asOf,
    positions: doc.positions.map((p: unknown, i) => {
      const path = `positions[${i}]`;
      if (!isRecord(p)) throw new InputError('expected a position object', { path });
      return { asset: assetAt(p.asset, `${path}.asset`), amount: amountAt(p.amount, `${path}.amount`) };
    }),
  };
}
