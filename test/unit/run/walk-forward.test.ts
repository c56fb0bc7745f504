import { describe, expect, it } from 'vitest';
import { formatInputError } from '../../../shared-core/errors.js';
import { notWalkedWords, walkForwardScenario } from '../../../shared-core/run/walk-forward.js';
import { parseScenario, type Scenario, type ScenarioInput } from '../../../shared-core/scenario/schema.js';
import { estimateAndSolve } from '../../../shared-core/walkforward/estimate-and-solve.js';
import { runBacktest } from '../../../shared-core/walkforward/run-backtest.js';
import {
  keptWalkForwardSettings,
  walkForwardInputsKey,
} from '../../../src-renderer/scenario/walkforward/kept-settings.js';
import { syntheticPrices } from '../walkforward/synthetic.js';

/**
 * The one walk-forward of a scenario that the app's worker, `holdfast backtest` and the memo
 * call: checked against the comparison first, then shared-core's backtest with the real allocator.
 */
function scenario(over: Partial<ScenarioInput> = {}): Scenario {
  const parsed = parseScenario({
    format: 'holdfast-scenario@1',
    name: 'One walk-forward',
    baseCurrency: 'EUR',
    returns: { frequency: 'weekly' },
    candidates: [
      { id: 'lw-mv', estimator: { method: 'ledoit-wolf' }, objective: { method: 'min-variance' } },
      { id: 'lw-erc', estimator: { method: 'ledoit-wolf' }, objective: { method: 'equal-risk-contribution' } },
    ],
    ...over,
  });
  if (!parsed.ok) throw new Error(parsed.errors.map(formatInputError).join('\n'));
  return parsed.scenario;
}

const prices = syntheticPrices(4, 900, 23);

describe('the walk-forward of a scenario', () => {
  it('is the backtest with the comparison allocator once every candidate solves', async () => {
    const s = scenario();
    const outcome = await walkForwardScenario(s, prices, { comparisonDraws: 50, seed: 3 });
    expect(outcome.status).toBe('done');
    const direct = await runBacktest(s, prices, { estimateAndSolve, comparisonDraws: 50, seed: 3 });
    expect(outcome.status === 'done' && outcome.run).toEqual(direct);
  });

  it('does not walk a candidate whose mandate the comparison cannot meet, and says which', async () => {
    // Caps of 20 % on four assets cannot add up to 100 %.
    const s = scenario({ constraints: { weightBounds: { default: [0, 0.2] } } });
    const outcome = await walkForwardScenario(s, prices);
    expect(outcome.status).toBe('not-solved');
    if (outcome.status !== 'not-solved') return;
    expect(outcome.candidates.map((c) => c.id)).toEqual(['lw-mv', 'lw-erc']);
    expect(notWalkedWords(outcome.candidates)).toMatch(/^candidate 'lw-mv' is infeasible/);
  });

  it('gives the same figures with the settings a run on the defaults keeps in the draft', async () => {
    const bare = scenario();
    const kept = scenario({ backtest: keptWalkForwardSettings() });
    expect(bare.backtest).toBeUndefined();
    expect(walkForwardInputsKey(kept)).toBe(walkForwardInputsKey(bare));
    const a = await walkForwardScenario(bare, prices, { comparisonDraws: 50, seed: 3 });
    const b = await walkForwardScenario(kept, prices, { comparisonDraws: 50, seed: 3 });
    expect(b).toEqual(a);
    // Another setting is another walk.
    expect(walkForwardInputsKey(scenario({ backtest: { costBps: 25 } }))).not.toBe(walkForwardInputsKey(bare));
  });
});
