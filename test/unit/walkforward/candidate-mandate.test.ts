import { describe, expect, it } from 'vitest';
import { generateDemo } from '../../../shared-core/demo/index.js';
import { formatInputError } from '../../../shared-core/errors.js';
import { runScenario } from '../../../shared-core/run/run-scenario.js';
import { parseScenario, type Scenario } from '../../../shared-core/scenario/schema.js';
import { estimateAndSolve } from '../../../shared-core/walkforward/estimate-and-solve.js';
import { runBacktest } from '../../../shared-core/walkforward/run-backtest.js';
import { optimal } from '../../support/candidate-status.js';

/**
 * Issue 15, disagreement 1: a candidate with its own cap on one asset. The comparison merges the
 * candidate's weight bounds into the scenario's table entry by entry; the walk-forward used to
 * replace the whole table, so on the invented demo (every asset capped at 15 %, two at 10 %) the
 * Ledoit-Wolf maximum-diversification candidate held ILB-GLB-H at 23.7 % on 2024-01-31.
 */
const demo = generateDemo();
const parsed = parseScenario({
  ...demo.scenario,
  candidates: [
    {
      id: 'lw-maxdiv',
      estimator: { method: 'ledoit-wolf' },
      objective: { method: 'max-diversification' },
      constraints: { weightBounds: { GOLD: [0, 0.2] } },
    },
  ],
  backtest: { estimationWindow: 36 },
});
if (!parsed.ok) throw new Error(parsed.errors.map(formatInputError).join('\n'));
const scenario: Scenario = parsed.scenario;
const prices = {
  ...demo.prices,
  currencies: demo.prices.assets.map((a) => scenario.assetInfo?.[a]?.currency),
};
const table = scenario.constraints.weightBounds!;
/** The upper bound the mandate gives each asset: GOLD its own, every other the scenario's. */
const cap = (asset: string) => (asset === 'GOLD' ? 0.2 : (table[asset] ?? table.default!)[1]);

describe("a candidate's own weight bound in the walk-forward", () => {
  it('keeps every other asset under the scenario bound at every rebalance, as the comparison does', async () => {
    const run = await runBacktest(scenario, prices, { estimateAndSolve, fx: demo.fx, comparisonDraws: 10 });
    const rebalances = run.candidates[0].walkForward.rebalances.filter((r) => r.status === 'optimal');
    expect(rebalances.length).toBeGreaterThan(40);
    const overCap = rebalances.flatMap((r) =>
      run.assets.flatMap((asset, i) =>
        r.weights[i] > cap(asset) + 1e-9 ? [`${r.date} ${asset} ${r.weights[i]}`] : [],
      ),
    );
    expect(overCap).toEqual([]);
    const comparison = runScenario(scenario, prices, { fx: demo.fx });
    for (const [asset, w] of Object.entries(optimal(comparison.candidates[0]).weights))
      expect(w).toBeLessThanOrEqual(cap(asset) + 1e-9);
  });
});
