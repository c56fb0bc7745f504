import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { sharpeHacTest } from '../../../shared-core/walkforward/sharpe-hac.js';
import { perPeriodRate } from '../../../shared-core/walkforward/metrics.js';
import { compareCandidates, jobsonKorkieMemmel } from '../../../shared-core/walkforward/significance.js';
import { normals } from './synthetic.js';

interface Case {
  name: string;
  a: number[];
  b: number[];
  bandwidth: number;
  psi: number[][];
  delta: number;
  se: number;
  z: number;
  pValue: number;
}
/**
 * Reference: test/reference/walkforward/sharpe_hac.R with R 4.2.2 and r-cran-sandwich 3.0-2
 * (Debian): sandwich's prewhitened quadratic-spectral HAC (meatHAC, weightsAndrews, bwAndrews)
 * on daily log returns of datasets::EuStockMarkets and on a seeded synthetic pair.
 */
const fixture = JSON.parse(
  readFileSync(new URL('../../reference/fixtures/walkforward/sharpe-hac.json', import.meta.url), 'utf8'),
) as { cases: Case[] };

const rel = (x: number, y: number) => Math.abs(x - y) / Math.max(Math.abs(y), 1e-300);

describe('HAC test of a Sharpe ratio difference (Ledoit and Wolf 2008, J. Empirical Finance 15)', () => {
  it.each(fixture.cases.map((c) => [c.name, c] as const))(
    'bandwidth, long-run covariance, standard error and p-value equal R sandwich 3.0-2 on %s',
    (_, c) => {
      const r = sharpeHacTest(c.a, c.b);
      expect(rel(r.bandwidth, c.bandwidth)).toBeLessThan(1e-9);
      for (let i = 0; i < 4; i++)
        for (let j = 0; j < 4; j++) expect(rel(r.psi[i * 4 + j], c.psi[i][j])).toBeLessThan(1e-8);
      expect(rel(r.difference, c.delta)).toBeLessThan(1e-10);
      expect(rel(r.standardError, c.se)).toBeLessThan(1e-8);
      expect(rel(r.z, c.z)).toBeLessThan(1e-8);
      // normalCdf is exact to 1.5e-7 (Abramowitz and Stegun 7.1.26).
      expect(Math.abs(r.pValue - c.pValue)).toBeLessThan(5e-7);
    },
  );

  it('a series against itself differs by 0 with p-value 1', () => {
    const z = normals(5);
    const a = Float64Array.from({ length: 400 }, () => 0.0005 + 0.01 * z());
    const b = Float64Array.from(a, (v) => v + 1e-4 * z());
    const r = sharpeHacTest(a, Float64Array.from(a));
    expect(r.difference).toBe(0);
    expect(r.pValue).toBe(1);
    expect(sharpeHacTest(a, b).pValue).toBeLessThan(1);
  });

  it('for independent normal returns it agrees with the i.i.d. test of Jobson and Korkie with Memmel’s correction to within sampling error of the two variance estimates', () => {
    const z = normals(11);
    const T = 5000;
    const a = Float64Array.from({ length: T }, () => 0.0006 + 0.01 * z());
    const b = Float64Array.from(a, (v) => 0.3 * (v - 0.0006) + 0.0001 + 0.0095 * z());
    const hac = sharpeHacTest(a, b);
    const iid = jobsonKorkieMemmel(a, b, 0);
    expect(Math.abs(hac.z / iid.z - 1)).toBeLessThan(0.1);
  });

  it('every comparison of the walk-forward carries it, on returns in excess of the cash rate', () => {
    const c = fixture.cases[2];
    const k = compareCandidates(
      { id: 'a', returns: c.a },
      { id: 'b', returns: c.b },
      { periodsPerYear: 252, cashRate: 0.02, draws: 50 },
    );
    const direct = sharpeHacTest(c.a, c.b, perPeriodRate(0.02, 252));
    expect(k.hacTest).toMatchObject({ z: direct.z, pValue: direct.pValue, bandwidth: direct.bandwidth });
    expect(k.hacTest!.method).toMatch(/Ledoit and Wolf \(2008\)/);
  });
});
