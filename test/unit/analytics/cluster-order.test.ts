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

  it('merges the pair a scan of every pair would, ties included (first of the smallest, rows then columns)', () => {
    // The definition, step by step: scan all active pairs in order, merge the first closest,
    // average the distances (Lance-Williams). Distances on a coarse grid make many ties.
    const byScan = (dist: Float64Array, n: number) => {
      const d = Float64Array.from(dist);
      const active = new Array<boolean>(n).fill(true);
      const id = Array.from({ length: n }, (_, i) => i);
      const size = new Array<number>(n).fill(1);
      const merges: number[][] = [];
      for (let step = 0; step < n - 1; step++) {
        let best = Infinity;
        let a = -1;
        let b = -1;
        for (let i = 0; i < n; i++)
          for (let j = i + 1; j < n; j++)
            if (active[i] && active[j] && d[i * n + j] < best) [best, a, b] = [d[i * n + j], i, j];
        const merged = size[a] + size[b];
        merges.push([Math.min(id[a], id[b]), Math.max(id[a], id[b]), best, merged]);
        for (let k = 0; k < n; k++)
          if (active[k] && k !== a && k !== b)
            d[a * n + k] = d[k * n + a] = (size[a] * d[a * n + k] + size[b] * d[b * n + k]) / merged;
        active[b] = false;
        size[a] = merged;
        id[a] = n + step;
      }
      return merges;
    };
    let state = 12345;
    const next = () => (state = (state * 48271) % 2147483647) / 2147483647;
    for (const [n, levels] of [
      [2, 3],
      [9, 2],
      [40, 4],
      [40, 1000],
      [120, 6],
    ]) {
      const dist = new Float64Array(n * n);
      for (let i = 0; i < n; i++)
        for (let j = 0; j < i; j++) dist[i * n + j] = dist[j * n + i] = Math.floor(next() * levels) / levels;
      expect(averageLinkage(dist, n).merges).toEqual(byScan(dist, n));
    }
  });

  it('handles one and zero assets', () => {
    expect(clusterOrder([1], 1)).toEqual([0]);
    expect(clusterOrder([], 0)).toEqual([]);
  });
});
