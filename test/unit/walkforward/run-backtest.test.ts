import { describe, expect, it } from 'vitest';
import { InputError, formatInputError } from '../../../shared-core/errors.js';
import { zeros, type Matrix } from '../../../shared-core/linalg/matrix.js';
import type { PriceTable } from '../../../shared-core/prices/price-table.js';
import { defaultEstimationWindow } from '../../../shared-core/scenario/backtest-spec.js';
import { parseScenario, type Scenario, type ScenarioInput } from '../../../shared-core/scenario/schema.js';
import {
  runBacktest,
  type EstimateAndSolveFn,
  type SolveRequest,
} from '../../../shared-core/walkforward/run-backtest.js';
import { syntheticPrices } from './synthetic.js';

/** Sample covariance (annualised) and inverse-volatility weights: a small allocator for these tests. */
const inverseVolatility: EstimateAndSolveFn = ({ returns, periodsPerYear }) => {
  const { rows: T, cols: n, data } = returns;
  const mean = new Float64Array(n);
  for (let t = 0; t < T; t++) for (let i = 0; i < n; i++) mean[i] += data[t * n + i] / T;
  const cov: Matrix = zeros(n, n);
  for (let t = 0; t < T; t++)
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++)
        cov.data[i * n + j] += ((data[t * n + i] - mean[i]) * (data[t * n + j] - mean[j]) * periodsPerYear) / (T - 1);
  const vol = Float64Array.from({ length: n }, (_, i) => Math.sqrt(cov.data[i * n + i]));
  const inv = Float64Array.from(vol, (v) => 1 / v);
  const total = inv.reduce((a, b) => a + b, 0);
  const w = Float64Array.from(inv, (v) => v / total);
  let variance = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) variance += w[i] * w[j] * cov.data[i * n + j];
  const weightedVol = w.reduce((s, wi, i) => s + wi * vol[i], 0);
  return {
    status: 'optimal',
    weights: w,
    covariance: cov,
    forecastVolatility: Math.sqrt(variance),
    forecastDiversificationRatio: weightedVol / Math.sqrt(variance),
  };
};

function scenario(over: Partial<ScenarioInput> = {}): Scenario {
  const parsed = parseScenario({
    format: 'holdfast-scenario@1',
    name: 'Walk-forward test',
    baseCurrency: 'EUR',
    candidates: [
      { id: 'iv-a', estimator: { method: 'sample' }, objective: { method: 'inverse-volatility' } },
      { id: 'iv-b', estimator: { method: 'sample' }, objective: { method: 'inverse-volatility' } },
    ],
    backtest: { estimationWindow: 120, rebalance: 'monthly', costBps: 10 },
    ...over,
  });
  if (!parsed.ok) throw new Error(parsed.errors.map(formatInputError).join('\n'));
  return parsed.scenario;
}

const prices = syntheticPrices(4, 500, 17);

async function inputError(promise: Promise<unknown>): Promise<string> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof InputError) return formatInputError(error);
    throw error;
  }
  throw new Error('expected an InputError');
}

describe('runBacktest (scenario-level walk-forward)', () => {
  it('estimates on exactly the trailing window of log returns ending on each rebalance date', async () => {
    const seen: SolveRequest[] = [];
    const spy: EstimateAndSolveFn = (r) => {
      seen.push(r);
      return inverseVolatility(r);
    };
    const run = await runBacktest(scenario(), prices, { estimateAndSolve: spy, comparisonDraws: 50 });
    // The first rebalance is the date of the 120th return: row 120.
    expect(run.settings.startDate).toBe(prices.dates[120]);
    const first = run.candidates[0].walkForward.rebalances;
    for (let k = 0; k < first.length; k++) {
      const req = seen[k];
      const t = first[k].index;
      expect(req.returns.rows).toBe(120);
      const lastRow = req.returns.data.subarray((req.returns.rows - 1) * 4, req.returns.rows * 4);
      expect(lastRow[2]).toBeCloseTo(Math.log(prices.closes[2][t] / prices.closes[2][t - 1]), 15);
      expect(req.periodsPerYear).toBe(252);
    }
    expect(seen[0].current).toBeNull();
    expect(seen[1].current).not.toBeNull();
  });

  it('no look-ahead through estimation: prices changed after a date leave earlier rebalances bit-for-bit unchanged', async () => {
    const cut = 330;
    const changed: PriceTable = {
      ...prices,
      closes: prices.closes.map((c, i) =>
        Float64Array.from(c, (p, t) => (t > cut ? p * (1 + 0.01 * i * (t - cut)) : p)),
      ),
    };
    const a = await runBacktest(scenario(), prices, { estimateAndSolve: inverseVolatility, comparisonDraws: 20 });
    const b = await runBacktest(scenario(), changed, { estimateAndSolve: inverseVolatility, comparisonDraws: 20 });
    const ra = a.candidates[0].walkForward.rebalances;
    const rb = b.candidates[0].walkForward.rebalances;
    const early = ra.filter((r) => r.index <= cut);
    expect(early.length).toBeGreaterThan(5);
    early.forEach((r, k) => {
      expect(Buffer.from(rb[k].weights.buffer).equals(Buffer.from(r.weights.buffer))).toBe(true);
      expect(Object.is(rb[k].turnover, r.turnover)).toBe(true);
    });
    expect(Array.from(rb[ra.length - 1].weights)).not.toEqual(Array.from(ra[ra.length - 1].weights));
  });

  it('expanding windows grow with each rebalance; `from` delays the start', async () => {
    const rows: number[] = [];
    await runBacktest(scenario({ backtest: { estimationWindow: 60, expanding: true, from: '2015-09-01' } }), prices, {
      estimateAndSolve: (r) => {
        if (r.candidate.id === 'iv-a') rows.push(r.returns.rows);
        return inverseVolatility(r);
      },
      comparisonDraws: 10,
    });
    // 2015-09-01 is row 173 of the invented weekday calendar: 173 returns by then.
    expect(prices.dates[173]).toBe('2015-09-01');
    expect(rows[0]).toBe(173);
    expect(rows.every((v, k) => k === 0 || v > rows[k - 1])).toBe(true);
    expect(rows.at(-1)).toBe(499); // the final solve on the whole history
  });

  it('produces metrics, comparisons against the reference, stress rows and stability bands', async () => {
    const run = await runBacktest(
      scenario({
        recommended: 'iv-b',
        constraints: { groups: [{ name: 'Growth', members: ['A01', 'A02'] }] },
        stress: { shocks: [{ name: 'Growth -20%', target: 'Growth', shock: -0.2 }] },
      }),
      prices,
      { estimateAndSolve: inverseVolatility, comparisonDraws: 100, stabilityDraws: 25, seed: 4 },
    );
    expect(run.reference).toBe('iv-b');
    expect(run.comparisons.map((c) => [c.a, c.b])).toEqual([['iv-a', 'iv-b']]);
    // Identical candidates: the difference is exactly zero.
    expect(run.comparisons[0].sharpeRatio.difference).toBe(0);
    const m = run.candidates[0].metrics;
    expect(m.rebalanceCount).toBe(run.candidates[0].walkForward.rebalances.length);
    expect(m.volatilityRatio!.count).toBeGreaterThan(5);
    expect(run.stress.historical.map((h) => h.basis)).toEqual([
      'the equal-weight universe',
      'the equal-weight universe',
      'Growth',
      'Growth',
    ]);
    expect(run.stress.shocks[0].byCandidate['iv-a'].portfolioReturn).toBeLessThan(0);
    expect(run.candidates[0].stability!.draws).toBe(25);
    expect(run.candidates[0].stability!.weights.A01.p5).toBeLessThanOrEqual(run.candidates[0].today.weights[0]);
  });

  it('without a window: the usual one for the frequency, never more than half the history, and says so', async () => {
    // 36 monthly, 104 weekly, 252 daily (common practice, from memory), capped at half the returns.
    expect(defaultEstimationWindow('monthly', 98)).toBe(36);
    expect(defaultEstimationWindow('monthly', 50)).toBe(25);
    expect(defaultEstimationWindow('daily', 3000)).toBe(252);
    expect(defaultEstimationWindow('weekly', 150)).toBe(75);
    expect(defaultEstimationWindow('daily', 4)).toBe(3);
    const seen: SolveRequest[] = [];
    const spy: EstimateAndSolveFn = (r) => {
      seen.push(r);
      return inverseVolatility(r);
    };
    const run = await runBacktest(scenario({ backtest: { rebalance: 'quarterly' } }), prices, {
      estimateAndSolve: spy,
    });
    // 500 daily prices give 499 returns: half of them, 249, is below the usual 252.
    expect(run.settings).toMatchObject({ estimationWindow: 249, windowFromHistory: true, historyReturns: 499 });
    expect(seen[0].returns.rows).toBe(249);
    const given = await runBacktest(scenario(), prices, { estimateAndSolve: inverseVolatility });
    expect(given.settings).toMatchObject({ estimationWindow: 120, windowFromHistory: false });
  });

  it('refuses bad settings with the JSON path, before any work is done', async () => {
    let calls = 0;
    const counting: EstimateAndSolveFn = (r) => {
      calls++;
      return inverseVolatility(r);
    };
    expect(
      await inputError(
        runBacktest(scenario({ backtest: { estimationWindow: 800 } }), prices, { estimateAndSolve: counting }),
      ),
    ).toBe('backtest.estimationWindow: the first rebalance needs 800 returns of history, the prices give 499 in all');
    expect(
      await inputError(
        runBacktest(scenario({ backtest: { costBps: { Equity: 10 } } }), prices, { estimateAndSolve: counting }),
      ),
    ).toBe("backtest.costBps.Equity: no asset has class 'Equity' (assetInfo gives no asset classes)");
    expect(
      await inputError(
        runBacktest(scenario({ stress: { shocks: [{ name: 'x', target: 'Nope', shock: -0.1 }] } }), prices, {
          estimateAndSolve: counting,
        }),
      ),
    ).toBe(
      "stress.shocks[0].target: unknown target 'Nope': expected an asset id (the scenario names no groups or asset classes)",
    );
    expect(
      await inputError(runBacktest(scenario({ assets: ['A01', 'ZZ'] }), prices, { estimateAndSolve: counting })),
    ).toBe("assets[1]: no price history for asset 'ZZ'");
    expect(calls).toBe(0);
  });

  it('stops on cancel between steps when run asynchronously', async () => {
    let steps = 0;
    await expect(
      runBacktest(scenario(), prices, {
        estimateAndSolve: inverseVolatility,
        pause: async () => {
          steps++;
        },
        shouldCancel: () => steps > 3,
      }),
    ).rejects.toMatchObject({ name: 'CancelledError' });
  });
});
