import { describe, expect, it } from 'vitest';
import { formatInputError, InputError } from '../../../shared-core/errors.js';
import { fromRows } from '../../../shared-core/linalg/matrix.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { portfolioMove, propagateShock } from '../../../shared-core/stress/conditional-shock.js';
import { replay, worstWindows } from '../../../shared-core/stress/historical.js';
import { stressViews } from '../../../shared-core/stress/stress-views.js';
import { assetSets, distinctBases, exposureOf, resolveTarget } from '../../../shared-core/stress/targets.js';

// Bivariate normal: E[r_2 | r_1 = s] = rho sigma_2 / sigma_1 s (Anderson 2003, An Introduction
// to Multivariate Statistical Analysis, 3rd ed., Theorem 2.5.1).
const s1 = 0.2;
const s2 = 0.1;
const rho = 0.6;
const cov = fromRows([
  [s1 * s1, rho * s1 * s2, 0],
  [rho * s1 * s2, s2 * s2, 0],
  [0, 0, 0.04],
]);

describe('shock propagation by conditional expectation', () => {
  it('a shock to one asset moves another by its regression beta (Anderson 2003, Theorem 2.5.1)', () => {
    const { assetMoves } = propagateShock(cov, [1, 0, 0], -0.2, 'simple');
    expect(assetMoves[0]).toBeCloseTo(-0.2, 15);
    expect(assetMoves[1]).toBeCloseTo(((rho * s2) / s1) * -0.2, 15); // -0.06
    expect(Math.abs(assetMoves[2])).toBe(0); // uncorrelated: no move
  });

  it('with log-return estimates the shock is carried as ln(1 + s) and returned as simple returns', () => {
    const { assetMoves } = propagateShock(cov, [1, 0, 0], -0.2, 'log');
    expect(assetMoves[0]).toBeCloseTo(-0.2, 14);
    expect(assetMoves[1]).toBeCloseTo(Math.expm1(0.3 * Math.log(0.8)), 14);
  });

  it('a group shock moves the equal-weight average of its members by exactly the shock', () => {
    const g = [0.5, 0.5, 0];
    const { assetMoves } = propagateShock(cov, g, -0.15, 'simple');
    expect(portfolioMove(g, assetMoves)).toBeCloseTo(-0.15, 15);
    // The riskier member falls further: (Sigma g)_i / (g' Sigma g) x s.
    expect(assetMoves[0]).toBeLessThan(assetMoves[1]);
  });

  it('a shock to an asset without variance is refused', () => {
    expect(() =>
      propagateShock(
        fromRows([
          [0, 0],
          [0, 1],
        ]),
        [1, 0],
        -0.1,
      ),
    ).toThrow(/no variance/);
  });
});

describe('historical stress windows', () => {
  // Two assets over two months (invented). Equal-weight daily-rebalanced basis returns:
  // Jan 31: (0.10 + 0.00)/2 = 0.05; Feb 01: (-0.20 + 0.10)/2 = -0.05; Feb 02: (0.05 + -0.10)/2 = -0.025.
  // January: +5%. February: 0.95 x 0.975 - 1 = -7.375% (the worst month, from the Jan 31 close).
  const prices: PriceTable = {
    dates: ['2024-01-30', '2024-01-31', '2024-02-01', '2024-02-02'],
    assets: ['X', 'Y'],
    closes: [Float64Array.from([100, 110, 88, 92.4]), Float64Array.from([50, 50, 55, 49.5])],
  };
  const universe = { name: 'the universe', kind: 'group' as const, members: ['X', 'Y'], label: 'the universe' };

  it('finds the worst calendar month and the largest drawdown of the basis (hand-computed)', () => {
    const windows = worstWindows(prices, [universe]);
    expect(windows[0]).toMatchObject({ kind: 'worst-month', from: '2024-01-31', to: '2024-02-02' });
    expect(windows[0].basisReturn).toBeCloseTo(0.95 * 0.975 - 1, 14);
    // Curve 1, 1.05, 0.9975, 0.9725625: peak Jan 31, trough Feb 02, depth 1 - 0.95 x 0.975 = 7.375%.
    expect(windows[1]).toMatchObject({ kind: 'worst-drawdown', from: '2024-01-31', to: '2024-02-02' });
    expect(windows[1].basisReturn).toBeCloseTo(-(1 - 0.95 * 0.975), 14);
  });

  it('replays a window buy-and-hold on the weights (hand-computed)', () => {
    // 70/30 from the Jan 31 close: 0.7 x (92.4/110 - 1) + 0.3 x (49.5/50 - 1) = 0.7 x -0.16 + 0.3 x -0.01 = -0.115.
    expect(replay(prices, ['X', 'Y'], [0.7, 0.3], '2024-01-31', '2024-02-02')).toBeCloseTo(-0.115, 14);
  });

  it('builds the stress table for every candidate and resolves user shocks by asset, group or asset class', () => {
    const assets = ['X', 'Y'];
    const sets = assetSets(assets, [{ name: 'Growth', members: ['X'] }], { Y: { assetClass: 'Bonds' } });
    const views = stressViews({
      prices,
      assets,
      candidates: [
        {
          id: 'c1',
          weights: Float64Array.from([0.7, 0.3]),
          covariance: fromRows([
            [0.04, 0.006],
            [0.006, 0.01],
          ]),
        },
        {
          id: 'c2',
          weights: Float64Array.from([0.2, 0.8]),
          covariance: fromRows([
            [0.04, -0.006],
            [-0.006, 0.01],
          ]),
        },
      ],
      bases: [universe],
      sets,
      spec: {
        shocks: [
          { name: 'Growth sell-off', target: 'Growth', shock: -0.2 },
          { name: 'Bond rally', target: 'Bonds', shock: 0.05 },
        ],
      },
      returnsMethod: 'simple',
    });
    expect(views.historical[0].portfolioReturns.c1).toBeCloseTo(-0.115, 14);
    const growth = views.shocks[0];
    expect(growth.members).toEqual(['X']);
    // beta of Y on X: 0.006 / 0.04 = 0.15; c1 loses 0.7 x 0.2 + 0.3 x 0.03 = 0.149.
    expect(growth.byCandidate.c1.portfolioReturn).toBeCloseTo(-0.149, 14);
    expect(growth.byCandidate.c2.assetMoves.Y).toBeCloseTo(0.03, 14);
    expect(views.shocks[1].byCandidate.c1.assetMoves.Y).toBeCloseTo(0.05, 14);
    expect(views.method).toMatch(/Anderson 2003/);
  });

  it('an unknown shock target is an input error naming its JSON path and the choices', () => {
    const sets = assetSets(['X', 'Y'], [{ name: 'Growth', members: ['X'] }]);
    try {
      resolveTarget('Equities', sets, 'stress.shocks[1].target');
      expect.unreachable();
    } catch (error) {
      expect(error).toBeInstanceOf(InputError);
      expect(formatInputError(error as InputError)).toBe(
        "stress.shocks[1].target: unknown target 'Equities': expected an asset id or one of Growth",
      );
    }
    expect(Array.from(exposureOf(sets[2], ['X', 'Y']))).toEqual([1, 0]);
  });

  it('counts an asset class once whatever its spelling, and tells a group from a class of the same name', () => {
    const assets = ['X', 'Y', 'Z'];
    const sets = assetSets(assets, [{ name: 'Equity', members: ['X', 'Y', 'Z'] }], {
      X: { assetClass: 'Equity' },
      Y: { assetClass: ' equity' },
      Z: { assetClass: 'Real assets' },
    });
    expect(sets.filter((s) => s.kind === 'asset-class').map((s) => [s.name, s.members, s.label])).toEqual([
      ['equity', ['X', 'Y'], 'the equity class'],
      ['real-assets', ['Z'], 'the real assets class'],
    ]);
    expect(sets.find((s) => s.kind === 'group')?.label).toBe('the Equity group');
    // A shock names a class in any spelling; a group of that exact name comes first.
    expect(resolveTarget('EQUITY', sets, 'stress.shocks[0].target').members).toEqual(['X', 'Y']);
    expect(resolveTarget('Equity', sets, 'stress.shocks[0].target').kind).toBe('group');
    const rows = worstWindows(prices3(), distinctBases(sets.filter((s) => s.kind !== 'asset')));
    const names = rows.map((r) => r.name);
    expect(names).toContain('Worst month of the Equity group');
    expect(names).toContain('Worst month of the equity class');
    expect(new Set(names.map((n) => n.toLowerCase())).size).toBe(names.length);
  });

  it('replays a set once when a class holds the same assets as a group', () => {
    const sets = assetSets(['X', 'Y'], [{ name: 'Growth', members: ['Y', 'X'] }], {
      X: { assetClass: 'growth' },
      Y: { assetClass: 'Growth' },
    });
    expect(distinctBases(sets.filter((s) => s.kind !== 'asset')).map((s) => s.label)).toEqual(['the Growth group']);
  });
});

/** Three assets over two months, for the rows' names. */
function prices3(): PriceTable {
  return {
    dates: ['2024-01-30', '2024-01-31', '2024-02-01', '2024-02-02'],
    assets: ['X', 'Y', 'Z'],
    closes: [
      Float64Array.from([100, 110, 88, 92.4]),
      Float64Array.from([50, 50, 55, 49.5]),
      Float64Array.from([20, 21, 19, 18]),
    ],
  };
}
