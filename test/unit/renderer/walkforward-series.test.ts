import { describe, expect, it } from 'vitest';
import { drawdowns, thinIndices } from '../../../src-renderer/scenario/walkforward/series.js';

describe('walk-forward curves', () => {
  it('measures the drawdown from the running peak (hand-computed: 1, 1.2, 0.9, 1.3 -> 0, 0, -25%, 0)', () => {
    const d = drawdowns([1, 1.2, 0.9, 1.3]);
    expect(Array.from(d).map((v) => Number(v.toFixed(12)))).toEqual([0, 0, -0.25, 0]);
  });

  it('counts a fall below the starting 1 as a drawdown from it', () => {
    expect(drawdowns([0.8])[0]).toBeCloseTo(-0.2, 12);
  });

  it('thins a long series but keeps the first, the last and the deepest trough', () => {
    const values = Array.from({ length: 5000 }, (_, i) => Math.sin(i / 50) + (i === 3217 ? -10 : 0));
    const keep = thinIndices(values, 400);
    expect(keep.length).toBeLessThanOrEqual(400);
    expect(keep[0]).toBe(0);
    expect(keep[keep.length - 1]).toBe(4999);
    expect(keep).toContain(3217);
    expect([...keep].sort((a, b) => a - b)).toEqual(keep);
  });

  it('keeps every point of a short series', () => {
    expect(thinIndices([3, 1, 2], 10)).toEqual([0, 1, 2]);
  });
});
