import type { PriceTable } from '../../shared-core/prices/price-table.js';
import type { Scenario } from '../../shared-core/scenario/schema.js';
import type { Comparison } from './comparison.js';

/** Messages between the scenario page and the recompute worker (structured clone, no JSON). */
export type ToWorker = {
  type: 'run';
  requestId: number;
  scenario: Scenario;
  prices: PriceTable;
  /** Rates into the base currency, one column per currency (when an asset is priced in another). */
  fx?: PriceTable;
};

export type FromWorker =
  | { type: 'ready' }
  | { type: 'done'; requestId: number; comparison: Comparison }
  | {
      type: 'failed';
      requestId: number;
      /** A sentence for the advisor. */
      message: string;
      /** JSON path of the scenario field at fault, where the core named one. */
      path?: string;
      /** True for a bad input (InputError), false for a fault in the code. */
      input: boolean;
    };
