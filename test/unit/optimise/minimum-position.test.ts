import { describe, expect, it } from 'vitest';
import { fromRows } from '../../../shared-core/linalg/matrix.js';
import { attempt, equicorrelated, ids, solve, weightsArray } from './helpers.js';
import { failed } from '../../support/candidate-status.js';
import { randomCovariance } from './random-problems.js';

/**
 * Minimum position size (each weight 0 or at least m) is a heuristic (common practice, no
 * source): these tests check what it promises, every returned weight is 0 or >= m and every
 * other limit still holds, and that it changes nothing when the optimum already complies.
 */
describe('minimum position size (heuristic)', () => {
  it('every weight is 0 or at least the minimum, the budget and caps hold, and the heuristic is flagged', () => {
    for (const seed of [3, 5, 8, 13]) {
      const S = randomCovariance(30, seed, 3, 1, 0.15);
      const free = solve(S, { method: 'max-diversification' }, { weightBounds: { default: [0, 0.2] } });
      const r = solve(S, { method: 'max-diversification' }, { weightBounds: { default: [0, 0.2] }, minPosition: 0.04 });
      expect(r.status).toBe('optimal');
      const w = weightsArray(r, 30);
      for (const v of w) expect(v < 1e-9 || v >= 0.04 - 1e-9).toBe(true);
      for (const v of w) expect(v).toBeLessThanOrEqual(0.2 + 1e-9);
      expect(w.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 9);
      const small = weightsArray(free, 30).filter((v) => v > 1e-9 && v < 0.04);
      if (small.length > 0) {
        expect(r.explanations!.flags.join(' ')).toMatch(/minimum position size 4% \(a heuristic/);
        const out = r.explanations!.assets.filter((a) => /left out by the minimum position size of 4%/.test(a.text));
        expect(out.length).toBeGreaterThan(0);
        for (const a of out) expect(r.weights[a.asset]).toBe(0);
        // The [0, 0] bounds it set are its own, not the mandate's: no shadow price is reported for them.
        for (const a of out)
          expect(r.explanations!.binding.some((b) => b.constraint.startsWith(`cap on ${a.asset} `))).toBe(false);
        // Eliminating assets can only lower the diversification ratio it maximises.
        expect(r.metrics!.diversificationRatio).toBeLessThanOrEqual(free.metrics!.diversificationRatio + 1e-12);
      }
    }
  });

  it('changes nothing when every weight is already 0 or above the minimum', () => {
    const S = equicorrelated(5, 0.15, 0.3);
    const a = solve(S, { method: 'min-variance' }, {});
    const b = solve(S, { method: 'min-variance' }, { minPosition: 0.1 });
    expect(weightsArray(b, 5)).toEqual(weightsArray(a, 5));
    expect(b.explanations!.flags).toEqual(a.explanations!.flags);
  });

  it('holds an asset at the minimum where leaving it out would break a band', () => {
    // A003 alone forms the Gold band with a 1% minimum: it cannot be left out, so it is held at 5%.
    const S = fromRows([
      [0.04, 0.01, 0.0],
      [0.01, 0.05, 0.0],
      [0.0, 0.0, 0.09],
    ]);
    const r = failed(
      attempt(
        S,
        { method: 'min-variance' },
        { groups: [{ name: 'Gold', members: ['A003'], min: 0.01, max: 0.02 }], minPosition: 0.05 },
      ),
    );
    expect(r.status).toBe('infeasible');
    expect(r.message).toMatch(/minimum position size of 5%: A003 can neither be left out nor held at 5%/);
    const ok = solve(
      S,
      { method: 'min-variance' },
      { groups: [{ name: 'Gold', members: ['A003'], min: 0.01, max: 0.3 }], minPosition: 0.05 },
    );
    expect(ok.status).toBe('optimal');
    const w = weightsArray(ok, 3);
    expect(w[2]).toBeGreaterThanOrEqual(0.05 - 1e-9);
    for (const v of w) expect(v < 1e-9 || v >= 0.05 - 1e-9).toBe(true);
    expect(ids(3)).toEqual(['A001', 'A002', 'A003']);
  });

  it('is refused for a long-short mandate, with the reason', () => {
    const r = failed(
      attempt(equicorrelated(4, 0.1, 0.2), { method: 'min-variance' }, { longOnly: false, minPosition: 0.05 }),
    );
    expect(r.status).toBe('error');
    expect(r.message).toMatch(/applies to long-only mandates/);
  });
});
