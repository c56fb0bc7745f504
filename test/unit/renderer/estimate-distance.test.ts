import { describe, expect, it } from 'vitest';
import { fromRows } from '../../../shared-core/linalg/matrix.js';
import { correlationFromCovariance, estimateDistance } from '../../../src-renderer/scenario/estimate-distance.js';

describe('how far an estimate moves from the sample', () => {
  const sample = fromRows([
    [0.04, 0.012, 0.0],
    [0.012, 0.09, 0.018],
    [0.0, 0.018, 0.01],
  ]);

  it('is zero for the sample itself', () => {
    const d = estimateDistance(sample, sample);
    expect(d.volatilityRatio).toEqual([1, 1, 1]);
    expect(d.meanVolatilityChange).toBe(0);
    expect(d.meanCorrelationChange).toBe(0);
  });

  it('reads correlations of a hand-computed covariance: 0.012 / (0.2 x 0.3) = 0.2, 0.018 / (0.3 x 0.1) = 0.6', () => {
    const rho = correlationFromCovariance(sample);
    expect(rho[1]).toBeCloseTo(0.2, 12);
    expect(rho[5]).toBeCloseTo(0.6, 12);
  });

  it('measures linear shrinkage towards a scaled identity: delta = 0.5 halves every correlation (Ledoit and Wolf 2004 form)', () => {
    // (1 - delta) S + delta mu I with mu = trace(S)/N keeps no off-diagonal structure beyond (1 - delta) S.
    const delta = 0.5;
    const mu = (0.04 + 0.09 + 0.01) / 3;
    const shrunk = fromRows(
      [0, 1, 2].map((i) => [0, 1, 2].map((j) => (1 - delta) * sample.data[i * 3 + j] + (i === j ? delta * mu : 0))),
    );
    const d = estimateDistance(sample, shrunk);
    d.volatilityRatio.forEach((r, i) =>
      expect(r).toBeCloseTo(Math.sqrt((0.5 * sample.data[i * 4] + 0.5 * mu) / sample.data[i * 4]), 12),
    );
    const rs = correlationFromCovariance(sample);
    const re = correlationFromCovariance(shrunk);
    expect(d.largestCorrelationChange?.sample).toBeCloseTo(rs[5], 12);
    expect(d.largestCorrelationChange?.estimate).toBeCloseTo(re[5], 12);
    const pairs = [
      [0, 1],
      [0, 2],
      [1, 2],
    ];
    expect(d.meanCorrelationChange).toBeCloseTo(
      pairs.reduce((s, [i, j]) => s + Math.abs(re[i * 3 + j] - rs[i * 3 + j]), 0) / 3,
      12,
    );
  });
});
