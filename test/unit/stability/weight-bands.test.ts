import { describe, expect, it } from 'vitest';
import { zeros, type Matrix } from '../../../shared-core/linalg/matrix.js';
import { movingBlockIndices, stationaryBootstrapIndices } from '../../../shared-core/stability/block-bootstrap.js';
import { seededRng } from '../../../shared-core/stability/rng.js';
import { weightStability, type ResolveFn } from '../../../shared-core/stability/weight-bands.js';
import { normals } from '../walkforward/synthetic.js';

function iidReturns(T: number, n: number, seed: number, sd = 0.01): Matrix {
  const z = normals(seed);
  const m = zeros(T, n);
  for (let k = 0; k < m.data.length; k++) m.data[k] = sd * z();
  return m;
}

/** Weight of asset 1 moves with the mean return of asset 1: w1 = 0.5 + 10 x mean(r_1). */
const meanTilt: ResolveFn = (r) => {
  let s = 0;
  for (let t = 0; t < r.rows; t++) s += r.data[t * r.cols];
  const w1 = 0.5 + (10 * s) / r.rows;
  return { status: 'optimal', weights: Float64Array.from([w1, 1 - w1]), volatility: 0.1, diversificationRatio: 1.2 };
};

describe('block bootstraps (Politis and Romano 1994; Kunsch 1989)', () => {
  it('stationary bootstrap blocks have geometric lengths with the requested mean, and rows are drawn uniformly', () => {
    const n = 500;
    const rng = seededRng(3);
    const counts = new Float64Array(n);
    let blocks = 0;
    let rows = 0;
    for (let d = 0; d < 200; d++) {
      const idx = stationaryBootstrapIndices(n, 8, rng);
      blocks++;
      for (let t = 0; t < n; t++) {
        counts[idx[t]]++;
        if (t > 0 && idx[t] !== (idx[t - 1] + 1) % n) blocks++;
        rows++;
      }
    }
    // Mean block length 1/p = 8 (a new block starts with probability 1/8; a random restart at the
    // next row is indistinguishable from a continuation, so the observed mean is slightly above 8).
    expect(rows / blocks).toBeGreaterThan(7.6);
    expect(rows / blocks).toBeLessThan(8.5);
    // Each row is drawn with probability 1/n: 200 expected per row; all within 200 +/- 6 sd of a block-correlated count.
    const min = Math.min(...counts);
    const max = Math.max(...counts);
    expect(min).toBeGreaterThan(100);
    expect(max).toBeLessThan(300);
  });

  it('moving-block bootstrap concatenates contiguous blocks of the fixed length', () => {
    const idx = movingBlockIndices(100, 10, seededRng(4), 100);
    for (let b = 0; b < 10; b++) for (let k = 1; k < 10; k++) expect(idx[b * 10 + k]).toBe(idx[b * 10] + k);
    for (const i of idx) expect(i).toBeLessThan(100);
  });
});

describe('weight stability by bootstrap', () => {
  it('is deterministic for a seed, changes with the seed, and runs 200 draws by default', () => {
    const r = iidReturns(250, 2, 1);
    const a = weightStability({ returns: r, assets: ['A', 'B'], resolve: meanTilt, seed: 7 });
    const b = weightStability({ returns: r, assets: ['A', 'B'], resolve: meanTilt, seed: 7 });
    const c = weightStability({ returns: r, assets: ['A', 'B'], resolve: meanTilt, seed: 8 });
    expect(a).toEqual(b);
    expect(a.draws).toBe(200);
    expect(c.weights.A.p5).not.toBe(a.weights.A.p5);
  });

  it('an allocation that ignores the data has zero-width bands and no turnover between draws', () => {
    const equal: ResolveFn = () => ({
      status: 'optimal',
      weights: Float64Array.from([0.5, 0.5]),
      volatility: 0.1,
      diversificationRatio: 1.3,
    });
    const s = weightStability({ returns: iidReturns(100, 2, 2), assets: ['A', 'B'], resolve: equal, draws: 50 });
    expect(s.weights.A).toEqual({ p5: 0.5, median: 0.5, p95: 0.5, mean: 0.5 });
    expect(s.averageTurnoverBetweenDraws).toBe(0);
    expect(s.diversificationRatio.p95).toBe(1.3);
  });

  it('bands of a mean-driven weight match the bootstrap standard error of a mean, sd / sqrt(T) (Efron and Tibshirani 1993, An Introduction to the Bootstrap, ch. 5)', () => {
    // w1 = 0.5 + 10 mean(r_1); with i.i.d. rows (block 1) the 5-95% band is 2 x 1.645 x 10 x sd / sqrt(T) wide.
    for (const T of [250, 1000]) {
      const r = iidReturns(T, 2, 10 + T);
      let s = 0;
      let s2 = 0;
      for (let t = 0; t < T; t++) {
        s += r.data[t * 2];
        s2 += r.data[t * 2] ** 2;
      }
      const sd = Math.sqrt((s2 - (s * s) / T) / T);
      const expected = 2 * 1.644854 * 10 * (sd / Math.sqrt(T));
      const band = weightStability({
        returns: r,
        assets: ['A', 'B'],
        resolve: meanTilt,
        draws: 2000,
        blockLength: 1,
        seed: 3,
      }).weights.A;
      expect((band.p95 - band.p5) / expected).toBeGreaterThan(0.9);
      expect((band.p95 - band.p5) / expected).toBeLessThan(1.1);
    }
  });

  it('hands each draw the previous successful draw (warm start), skips failed draws and counts them', () => {
    let calls = 0;
    const seenPrevious: boolean[] = [];
    const flaky: ResolveFn = (r, previous) => {
      seenPrevious.push(previous !== null);
      return calls++ % 3 === 1 ? { ...meanTilt(r, null), status: 'infeasible' } : meanTilt(r, null);
    };
    const s = weightStability({ returns: iidReturns(100, 2, 5), assets: ['A', 'B'], resolve: flaky, draws: 30 });
    expect(s.failedDraws).toBe(10);
    expect(seenPrevious[0]).toBe(false);
    expect(seenPrevious.slice(1).every(Boolean)).toBe(true);
  });

  it('reports progress per draw and stops on cancel', () => {
    const seen: number[] = [];
    weightStability({
      returns: iidReturns(60, 2, 6),
      assets: ['A', 'B'],
      resolve: meanTilt,
      draws: 12,
      onProgress: (d) => seen.push(d),
    });
    expect(seen).toEqual(Array.from({ length: 12 }, (_, k) => k + 1));
    let k = 0;
    expect(() =>
      weightStability({
        returns: iidReturns(60, 2, 6),
        assets: ['A', 'B'],
        resolve: meanTilt,
        shouldCancel: () => ++k > 5,
      }),
    ).toThrow(expect.objectContaining({ name: 'CancelledError' }));
  });
});
