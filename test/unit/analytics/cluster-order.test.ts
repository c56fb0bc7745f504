import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { averageLinkage, clusterOrder, correlationDistance } from '../../../shared-core/analytics/cluster-order.js';

interface Case {
  seed: number;
  n: number;
  correlation: number[];
  linkage: [number, number, number, number][];
  order: number[];
}
const fixture = JSON.parse(
  readFileSync(new URL('../../reference/fixtures/cluster-order.json', import.meta.url), 'utf8'),
) as {
  source: string;
  cases: Case[];
};

describe('heat map asset order (average linkage on sqrt((1 - rho) / 2), Mantegna 1999)', () => {
  for (const c of fixture.cases) {
    it(`N=${c.n} (seed ${c.seed}): merges and leaf order equal scipy's linkage(average) + leaves_list (${fixture.source})`, () => {
      const dendrogram = averageLinkage(correlationDistance(c.correlation, c.n), c.n);
      expect(dendrogram.order).toEqual(c.order);
      dendrogram.merges.forEach((m, k) => {
        expect([m[0], m[1], m[3]]).toEqual([c.linkage[k][0], c.linkage[k][1], c.linkage[k][3]]);
        expect(m[2]).toBeCloseTo(c.linkage[k][2], 12);
      });
    });
  }

  it('puts two perfectly correlated blocks side by side whatever the input order (property of any linkage)', () => {
    // Assets 0, 2, 4 form one block and 1, 3, 5 another: correlation 0.9 inside, 0.1 across.
    const n = 6;
    const corr = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) corr[i * n + j] = i === j ? 1 : i % 2 === j % 2 ? 0.9 : 0.1;
    const order = clusterOrder(corr, n);
    expect(order.slice().sort()).toEqual([0, 1, 2, 3, 4, 5]);
    const firstHalf = order.slice(0, 3).map((i) => i % 2);
    expect(new Set(firstHalf).size).toBe(1);
  });

  it('handles one and zero assets', () => {
    expect(clusterOrder([1], 1)).toEqual([0]);
    expect(clusterOrder([], 0)).toEqual([]);
  });
});
