import { describe, expect, it } from 'vitest';
import { fxSources, fxTable, rateOnOrBefore } from '../../../shared-core/returns/exchange-rate.js';

/** Invented series: USDEUR quotes euro per dollar, EURCHF franc per euro. */
const series: Record<string, { base: string; quote: string }> = {
  USDEUR: { base: 'USD', quote: 'EUR' },
  EURCHF: { base: 'EUR', quote: 'CHF' },
};
const find = (base: string, quote: string) =>
  Object.keys(series).find((id) => series[id].base === base && series[id].quote === quote);

describe('the one exchange-rate lookup', () => {
  it('finds the series pricing each foreign currency in the base one, either way round', () => {
    expect(fxSources(['EUR', 'USD', 'CHF', undefined, 'USD', null], 'EUR', find)).toEqual({
      sources: [
        { currency: 'CHF', assetId: 'EURCHF', inverted: true },
        { currency: 'USD', assetId: 'USDEUR', inverted: false },
      ],
      missing: [],
    });
  });

  it('names a currency without a series', () => {
    expect(fxSources(['GBP'], 'EUR', find).missing).toEqual(['GBP']);
  });

  it('inverts a series quoted the other way: 1.25 CHF per EUR is 0.8 EUR per CHF', () => {
    const table = fxTable(
      { dates: ['2025-01-02'], assets: ['USDEUR', 'EURCHF'], closes: [Float64Array.of(0.9), Float64Array.of(1.25)] },
      fxSources(['CHF', 'USD'], 'EUR', find).sources,
    );
    expect(table.assets).toEqual(['CHF', 'USD']);
    expect(table.closes[0][0]).toBeCloseTo(0.8, 15);
    expect(table.closes[1][0]).toBe(0.9);
  });

  it('values on a date with the last finite rate on or before it, never a later one', () => {
    const fx = {
      dates: ['2025-01-02', '2025-01-03', '2025-01-06', '2025-01-07'],
      assets: ['USD'],
      closes: [Float64Array.of(0.9, NaN, 0.92, 0.95)],
    };
    expect(rateOnOrBefore(fx, 'USD', '2025-01-05')).toEqual({ rate: 0.9, date: '2025-01-02' });
    expect(rateOnOrBefore(fx, 'USD', '2025-01-06')).toEqual({ rate: 0.92, date: '2025-01-06' });
    expect(rateOnOrBefore(fx, 'USD', '2025-01-01')).toBeUndefined();
    expect(rateOnOrBefore(fx, 'CHF', '2025-01-06')).toBeUndefined();
  });
});
