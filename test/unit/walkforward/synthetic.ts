import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { seededRng } from '../../../shared-core/stability/rng.js';
import { weekdays } from '../../support/calendar.js';

export { weekdays };

/** Standard normal by Box-Muller from the seeded generator. */
export function normals(seed: number): () => number {
  const rng = seededRng(seed);
  return () => Math.sqrt(-2 * Math.log(1 - rng.next())) * Math.cos(2 * Math.PI * rng.next());
}

/**
 * Invented prices: a one-factor lognormal model with per-asset loadings and volatilities,
 * seeded, so every test run sees the same table.
 */
export function syntheticPrices(assets: number, rows: number, seed = 7, from = '2015-01-01'): PriceTable {
  const z = normals(seed);
  const ids = Array.from({ length: assets }, (_, i) => `A${String(i + 1).padStart(2, '0')}`);
  const beta = ids.map((_, i) => 0.3 + (0.9 * i) / Math.max(1, assets - 1));
  const vol = ids.map((_, i) => 0.006 + (0.012 * ((i * 7) % assets)) / Math.max(1, assets));
  const closes = ids.map(() => new Float64Array(rows));
  const level = ids.map(() => 100);
  for (let t = 0; t < rows; t++) {
    const f = 0.008 * z();
    for (let i = 0; i < assets; i++) {
      if (t > 0) level[i] *= Math.exp(0.0002 + beta[i] * f + vol[i] * z());
      closes[i][t] = level[i];
    }
  }
  return { dates: weekdays(from, rows), assets: ids, closes };
}
