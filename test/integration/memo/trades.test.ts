import { describe, expect, it } from 'vitest';
import { planTrades } from '../../../src-main/memo/trades.js';

describe('trades from holdings to target weights, rounded to the lot', () => {
  const assets = ['A', 'B', 'C', 'D'];
  const held = { A: 512_345, B: 250_000, C: 237_655, D: 0 };

  it('worked example: 1,000,000 held, lots of 1,000, C sold in full to the last unit', () => {
    const plan = planTrades(assets, held, { A: 0.4, B: 0.35, C: 0, D: 0.25 }, 1000, 0);
    expect(plan.total).toBe(1_000_000);
    // A: 400,000 - 512,345 = -112,345 -> -112,000; B: +100,000; C: -237,655 (all); D: +250,000.
    expect(plan.rows.map((r) => r.trade)).toEqual([-112_000, 100_000, -237_655, 250_000]);
    expect(plan.buys).toBe(350_000);
    expect(plan.sells).toBe(349_655);
    expect(plan.residual).toBe(-345);
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
      const decimals = lot === 0.5 ? 2 : 0;
      const plan = planTrades(assets, amounts, weights, lot, decimals);
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
