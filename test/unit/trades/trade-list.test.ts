import { describe, expect, it } from 'vitest';
import { tradeList } from '../../../shared-core/trades/trade-list.js';

// Rebalancing arithmetic (common practice for rebalancing tickets): target amount = weight x
// total, trade = target - held rounded to whole lots, a full sale to the last unit, what rounding
// leaves over kept in cash.
describe('trades from holdings to target weights, rounded to the lot', () => {
  const assets = ['A', 'B', 'C', 'D'];
  const held = { A: 512_345, B: 250_000, C: 237_655, D: 0 };

  it('worked example: 1,000,000 held, lots of 1,000, C sold in full to the last unit', () => {
    const plan = tradeList({ assets, held, weights: { A: 0.4, B: 0.35, C: 0, D: 0.25 }, lot: 1000 });
    expect(plan.total).toBe(1_000_000);
    expect(plan.decimals).toBe(0);
    // A: 400,000 - 512,345 = -112,345 -> -112,000; B: +100,000; C: -237,655 (all); D: +250,000.
    // Sells first, then buys, each by size.
    expect(plan.rows.map((r) => [r.asset, r.trade])).toEqual([
      ['C', -237_655],
      ['A', -112_000],
      ['D', 250_000],
      ['B', 100_000],
    ]);
    expect(plan.rows.find((r) => r.asset === 'C')?.after).toBe(0);
    expect(plan.buys).toBe(350_000);
    expect(plan.sells).toBe(349_655);
    expect(plan.residual).toBe(-345);
  });

  it('keeps the given order for assets that do not trade, after the trades', () => {
    const plan = tradeList({ assets: ['Z', 'A', 'Y'], held: { A: 1000, Y: 500 }, weights: { A: 1 }, lot: 100 });
    expect(plan.rows.map((r) => [r.asset, r.trade])).toEqual([
      ['Y', -500],
      ['A', 500],
      ['Z', 0],
    ]);
    expect(Object.is(plan.rows[2].trade, -0)).toBe(false);
  });

  it('sells a held asset the weights leave out, and buys a weighted asset not yet held', () => {
    const plan = tradeList({ assets: [], held: { A: 600_000, B: 400_000 }, weights: { A: 0.3, C: 0.7 }, lot: 1000 });
    expect(Object.fromEntries(plan.rows.map((r) => [r.asset, r.trade]))).toEqual({
      A: -300_000,
      B: -400_000,
      C: 700_000,
    });
  });

  it('takes the decimals of the lot: a lot of 0.5 trades in tenths', () => {
    const plan = tradeList({ assets: ['A', 'B'], held: { A: 10.26, B: 0 }, weights: { A: 0.5, B: 0.5 }, lot: 0.5 });
    expect(plan.decimals).toBe(1);
    expect(plan.total).toBe(10.3);
    // wanted -5.13 -> 10 lots of 0.5 = -5.0; B +5.13 -> +5.0.
    expect(plan.rows.map((r) => [r.asset, r.trade])).toEqual([
      ['A', -5],
      ['B', 5],
    ]);
  });

  it('trades plus the rounding cash add up to zero, and values after trading plus that cash to the total, over many seeded cases', () => {
    let s = 3;
    const next = () => ((s = (s * 48271) % 2147483647), s / 2147483647);
    for (let k = 0; k < 500; k++) {
      const amounts = Object.fromEntries(assets.map((a) => [a, Math.round(next() * 3e6) / 100]));
      const raw = assets.map(() => (next() < 0.2 ? 0 : next()));
      const sum = raw.reduce((x, y) => x + y, 0) || 1;
      const weights = Object.fromEntries(assets.map((a, i) => [a, raw[i] / sum]));
      const lot = [1, 100, 1000, 0.5][k % 4];
      const plan = tradeList({ assets, held: amounts, weights, lot });
      const decimals = plan.decimals;
      const cents = (x: number) => Math.round(x * 10 ** decimals) + 0;
      expect(cents(plan.rows.reduce((t, r) => t + r.trade, 0) + plan.residual)).toBe(0);
      expect(cents(plan.rows.reduce((t, r) => t + r.after, 0) + plan.residual)).toBe(cents(plan.total));
      for (const r of plan.rows) {
        if ((weights[r.asset] ?? 0) === 0) expect(cents(r.after)).toBe(0);
        else {
          expect((cents(r.trade) % cents(lot)) + 0).toBe(0);
          // Never more than half a lot from the exact trade.
          expect(Math.abs(r.trade - (r.target - amounts[r.asset]))).toBeLessThanOrEqual(
            lot / 2 + 1e-6 + 10 ** -decimals,
          );
        }
      }
    }
  });
});
