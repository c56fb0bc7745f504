import { describe, expect, it } from 'vitest';
import type { Holdings } from '../../../shared-core/contract/service-api.js';
import { tradesFromHoldings, weightsFromHoldings } from '../../../src-renderer/scenario/trade-list.js';

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

// Rebalancing arithmetic (common practice): target amount = weight x total, trade = target - held
// in whole lots; the arithmetic itself is tested in test/unit/trades.
describe("the screen's trade list from the household's valued holdings", () => {
  it('turns target weights into amounts in the base currency, sells first, and nets to zero', () => {
    const out = tradesFromHoldings({ A: 0.3, B: 0.5, C: 0.2 }, holdings);
    expect(out.ok).toBe(true);
    if (!out.ok) return;
    expect(out.currency).toBe('EUR');
    expect(out.plan.total).toBe(1_000_000);
    expect(out.plan.rows.map((r) => [r.asset, r.trade])).toEqual([
      ['A', -300_000],
      ['C', 200_000],
      ['B', 100_000],
    ]);
    expect(out.plan.residual).toBe(0);
    expect(out.rates).toEqual(holdings.rates);
  });

  it('rounds to the lot it is given (1,000 by default, as the memo)', () => {
    const odd = { A: 0.3333, B: 0.6667 };
    const byDefault = tradesFromHoldings(odd, holdings);
    const byHundreds = tradesFromHoldings(odd, holdings, 100);
    expect(byDefault.ok && byDefault.plan.rows.map((r) => r.trade)).toEqual([-267_000, 267_000]);
    expect(byHundreds.ok && byHundreds.plan.rows.map((r) => r.trade)).toEqual([-266_700, 266_700]);
  });

  it('says which holding cannot be valued instead of guessing a rate', () => {
    const unvalued: Holdings = {
      ...holdings,
      positions: [holdings.positions[0], { ...holdings.positions[1], valueInBase: null, weight: null }],
      total: null,
    };
    expect(tradesFromHoldings({ A: 1 }, unvalued)).toEqual({
      ok: false,
      reason: 'B is held in USD, and the store has no rate to EUR on or before the holdings date',
    });
  });

  it('gives the current weights of the holdings as the turnover reference', () => {
    const out = weightsFromHoldings(holdings);
    expect(out).toEqual({ ok: true, weights: { A: 0.6, B: 0.4 } });
  });

  it('refuses an empty household, or one whose holdings add up to zero, with a sentence', () => {
    expect(tradesFromHoldings({ A: 1 }, { ...holdings, positions: [], total: null }).ok).toBe(false);
    const zero = holdings.positions.map((p) => ({ ...p, amount: 0, valueInBase: 0 }));
    expect(tradesFromHoldings({ A: 1 }, { ...holdings, positions: zero, total: 0 })).toEqual({
      ok: false,
      reason: 'the holdings add up to zero, so weights cannot become amounts',
    });
  });
});
