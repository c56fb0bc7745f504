import { describe, expect, it } from 'vitest';
import { formatInputError } from '../../../shared-core/errors.js';
import { parseScenario, type Scenario, type ScenarioInput } from '../../../shared-core/scenario/schema.js';
import { estimateAndSolve } from '../../../shared-core/walkforward/estimate-and-solve.js';
import {
  runBacktest,
  type EstimateAndSolveFn,
  type SolveOutcome,
} from '../../../shared-core/walkforward/run-backtest.js';
import { syntheticPrices } from './synthetic.js';

function scenario(over: Partial<ScenarioInput>): Scenario {
  const parsed = parseScenario({
    format: 'holdfast-scenario@1',
    name: 'Turnover test',
    baseCurrency: 'EUR',
    constraints: { weightBounds: { default: [0, 0.5] } },
    candidates: [
      { id: 'mv', estimator: { method: 'ledoit-wolf' }, objective: { method: 'min-variance' } },
      { id: 'md', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } },
    ],
    backtest: { estimationWindow: 120, rebalance: 'monthly', costBps: 0 },
    ...over,
  });
  if (!parsed.ok) throw new Error(parsed.errors.map(formatInputError).join('\n'));
  return parsed.scenario;
}

const prices = syntheticPrices(6, 600, 41);

describe('the estimate-and-solve allocator', () => {
  it('a turnover limit holds against the drifted weights at every rebalance after the first (issue 7)', async () => {
    const run = await runBacktest(
      scenario({ constraints: { weightBounds: { default: [0, 0.5] }, maxTurnover: 0.05 } }),
      prices,
      {
        estimateAndSolve,
        comparisonDraws: 10,
      },
    );
    for (const c of run.candidates) {
      const [first, ...rest] = c.walkForward.rebalances;
      expect(first.turnover).toBeCloseTo(1, 9); // bought from cash: no limit to measure against
      expect(rest.length).toBeGreaterThan(10);
      for (const r of rest) {
        expect(r.status).toBe('optimal');
        expect(r.turnover).toBeLessThanOrEqual(0.05 + 1e-9);
      }
    }
  });

  it('candidates that share an estimator share one estimate per window; the weights do not depend on the sharing', async () => {
    const seen: SolveOutcome[] = [];
    const spy: EstimateAndSolveFn = (r) => {
      const out = estimateAndSolve(r);
      seen.push(out);
      return out;
    };
    const shared = await runBacktest(scenario({}), prices, { estimateAndSolve: spy, comparisonDraws: 10 });
    const perCandidate = shared.candidates[0].walkForward.rebalances.length + 1;
    // Same window and estimator: the very same covariance object for mv and md.
    expect(seen[perCandidate].covariance).toBe(seen[0].covariance);
    const alone = await runBacktest(
      scenario({
        candidates: [{ id: 'md', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } }],
      }),
      prices,
      {
        estimateAndSolve,
        comparisonDraws: 10,
      },
    );
    const a = shared.candidates[1].walkForward.rebalances.map((r) => Array.from(r.weights));
    const b = alone.candidates[0].walkForward.rebalances.map((r) => Array.from(r.weights));
    expect(a).toEqual(b);
  });

  it('forecast volatility and DR come from the annualised estimate of the weights chosen', async () => {
    const run = await runBacktest(scenario({}), prices, { estimateAndSolve, comparisonDraws: 10 });
    const md = run.candidates[1].today;
    expect(md.status).toBe('optimal');
    const n = run.assets.length;
    let v = 0;
    let wsig = 0;
    for (let i = 0; i < n; i++) {
      wsig += md.weights[i] * Math.sqrt(md.covariance.data[i * n + i]);
      for (let j = 0; j < n; j++) v += md.weights[i] * md.weights[j] * md.covariance.data[i * n + j];
    }
    expect(md.forecastVolatility).toBeCloseTo(Math.sqrt(v), 12);
    expect(md.forecastDiversificationRatio).toBeCloseTo(wsig / Math.sqrt(v), 12);
  });
});
