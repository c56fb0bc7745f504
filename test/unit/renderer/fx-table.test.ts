import { describe, expect, it } from 'vitest';
import type { Asset } from '../../../shared-core/contract/service-api.js';
import { fxSources, fxTable } from '../../../src-renderer/scenario/fx-table.js';

const fx = (id: string, base: string, quote: string): Asset => ({
  id,
  name: id,
  assetClass: '',
  region: '',
  currency: quote,
  liquidity: 'daily',
  lockUpDays: null,
  notes: '',
  fx: { base, quote },
});

describe('exchange rates for the base currency', () => {
  it('finds the series pricing each foreign currency in the base one, either way round', () => {
    const out = fxSources(['EUR', 'USD', 'CHF', undefined, 'USD'], 'EUR', [
      fx('USDEUR', 'USD', 'EUR'),
      fx('EURCHF', 'EUR', 'CHF'),
    ]);
    expect(out).toEqual({
      sources: [
        { currency: 'CHF', assetId: 'EURCHF', inverted: true },
        { currency: 'USD', assetId: 'USDEUR', inverted: false },
      ],
      missing: [],
    });
  });

  it('names a currency without a series', () => {
    expect(fxSources(['GBP'], 'EUR', []).missing).toEqual(['GBP']);
  });

  it('inverts a series quoted the other way: 1.25 CHF per EUR is 0.8 EUR per CHF', () => {
    const table = fxTable(
      { dates: ['2025-01-02'], assets: ['USDEUR', 'EURCHF'], closes: [Float64Array.of(0.9), Float64Array.of(1.25)] },
      [
        { currency: 'CHF', assetId: 'EURCHF', inverted: true },
        { currency: 'USD', assetId: 'USDEUR', inverted: false },
      ],
    );
    expect(table.assets).toEqual(['CHF', 'USD']);
    expect(table.closes[0][0]).toBeCloseTo(0.8, 15);
    expect(table.closes[1][0]).toBe(0.9);
  });
});
