import type { PriceTable } from '../shared-core/prices/price-table.js';
import { seededRng, type Rng } from '../shared-core/stability/rng.js';

/**
 * Invented universes for the solver's bench, from seeds: daily closes from a four-factor
 * lognormal model. Two shapes, so that no setting of the solver is tuned to one:
 * - `few-held`: strong factors and idiosyncratic volatilities spread over 0.4-1.6 % a day; a
 *   capped maximum-diversification optimum holds a small share of the assets (the bench's
 *   universes of issue 4);
 * - `most-held`: weak factors and idiosyncratic volatilities of 0.9-1.2 % a day, close to one
 *   another; the same optimum holds most of the assets.
 * The numbers are invented; nothing is fitted to a market.
 */
export type UniverseShape = 'few-held' | 'most-held';

export const TRADING_DAYS = 1260;

function gaussian(rng: Rng): number {
  return Math.sqrt(-2 * Math.log(1 - rng.next())) * Math.cos(2 * Math.PI * rng.next());
}

const SHAPES: Record<UniverseShape, { market: [number, number]; styles: number; idio: [number, number] }> = {
  'few-held': { market: [0.5, 1], styles: 1, idio: [0.004, 0.012] },
  'most-held': { market: [0.15, 0.1], styles: 0.2, idio: [0.009, 0.003] },
};

export function inventedPrices(
  n: number,
  seed: number,
  shape: UniverseShape = 'few-held',
  days = TRADING_DAYS,
): PriceTable {
  const rng = seededRng(seed);
  const s = SHAPES[shape];
  const rows = days + 1;
  const load = Array.from({ length: n }, () => [
    s.market[0] + s.market[1] * rng.next(),
    gaussian(rng) * 0.5 * s.styles,
    gaussian(rng) * 0.5 * s.styles,
    gaussian(rng) * 0.3 * s.styles,
  ]);
  const idio = Array.from({ length: n }, () => s.idio[0] + s.idio[1] * rng.next());
  const closes = Array.from({ length: n }, () => new Float64Array(rows));
  const level = new Float64Array(n).fill(100);
  const dates: string[] = [];
  const day = new Date('2019-01-02T00:00:00Z');
  for (let t = 0; t < rows; t++) {
    while (day.getUTCDay() === 0 || day.getUTCDay() === 6) day.setUTCDate(day.getUTCDate() + 1);
    dates.push(day.toISOString().slice(0, 10));
    day.setUTCDate(day.getUTCDate() + 1);
    const f = [0.008 * gaussian(rng), 0.004 * gaussian(rng), 0.004 * gaussian(rng), 0.003 * gaussian(rng)];
    for (let i = 0; i < n; i++) {
      if (t > 0) {
        const l = load[i];
        level[i] *= Math.exp(l[0] * f[0] + l[1] * f[1] + l[2] * f[2] + l[3] * f[3] + idio[i] * gaussian(rng));
      }
      closes[i][t] = level[i];
    }
  }
  return { dates, assets: Array.from({ length: n }, (_, i) => `F${String(i + 1).padStart(4, '0')}`), closes };
}

export function csvOf(table: PriceTable): string {
  const lines = [`date,${table.assets.join(',')}`];
  table.dates.forEach((d, t) => lines.push(`${d},${table.closes.map((c) => c[t].toFixed(6)).join(',')}`));
  return lines.join('\n') + '\n';
}
