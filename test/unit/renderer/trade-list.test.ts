import { describe, expect, it } from 'vitest';
import type { Holdings } from '../../../shared-core/contract/service-api.js';
import { tradeList, weightsFromHoldings } from '../../../src-renderer/scenario/trade-list.js';

const holdings: Holdings = {
  householdId: 'h1',
  baseCurrency: 'EUR',
  asOf: '2025-12-31',
  positions: [
    { asset: 'A', amount: 600_000, currency: 'EUR', valueInBase: 600_000, weight: 0.6 },
    { asset: 'B', amount: 440_000, currency: 'USD', valueInBase: 400_000, weight: 0.4 },
  ],
  total: 1_000_000,
  rates: ['USD to EUR 0.909091 on 2025-12-31, series USDEUR'],
};

// Rebalancing arithmetic (common practice): target amount = weight x total, trade = target - held;
// buys and sells net to zero when the weights sum to one.
describe('trade list in the base currency', () => {
  it('turns target weights into amounts, sells first, and nets to zero', () => {
    const out = tradeList({ A: 0.3, B: 0.5, C: 0.2 }, holdings);
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.total).toBe(1_000_000);
    expect(out.lines.map((l) => [l.asset, Math.round(l.trade)])).toEqual([
      ['A', -300_000],
      ['C', 200_000],
      ['B', 100_000],
    ]);
    expect(out.bought - out.sold).toBeCloseTo(0, 6);
    expect(out.rates).toEqual(holdings.rates);
  });

  it('sells a holding the candidate leaves out entirely', () => {
    const out = tradeList({ A: 1 }, holdings);
    expect(out.ok && out.lines.find((l) => l.asset === 'B')?.trade).toBeCloseTo(-400_000, 6);
  });

  it('says which holding cannot be valued instead of guessing a rate', () => {
    const unvalued: Holdings = {
      ...holdings,
      positions: [holdings.positions[0], { ...holdings.positions[1], valueInBase: null, weight: null }],
      total: null,
    };
    expect(tradeList({ A: 1 }, unvalued)).toEqual({
      ok: false,
      reason: 'B is held in USD, and the store has no rate to EUR on or before the holdings date',
    });
  });

  it('gives the current weights of the holdings as the turnover reference', () => {
    const out = weightsFromHoldings(holdings);
    expect(out).toEqual({ ok: true, weights: { A: 0.6, B: 0.4 } });
  });

  it('refuses an empty household with a sentence', () => {
    expect(tradeList({ A: 1 }, { ...holdings, positions: [], total: null }).ok).toBe(false);
  });
});
