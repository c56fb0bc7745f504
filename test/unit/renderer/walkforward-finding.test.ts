import { describe, expect, it } from 'vitest';
import type { BacktestRun } from '../../../shared-core/walkforward/run-backtest.js';
import { growthFinding } from '../../../src-renderer/scenario/walkforward/WalkForwardView.js';

/** A run with only what the chart's title reads: each candidate's growth and deepest fall. */
function run(candidates: { id: string; growth: number[]; depth: number }[]): BacktestRun {
  return {
    candidates: candidates.map((c) => ({
      id: c.id,
      walkForward: { growth: Float64Array.from(c.growth) },
      metrics: { maxDrawdown: { depth: c.depth } },
    })),
  } as unknown as BacktestRun;
}

describe('the walk-forward chart states its finding', () => {
  it('compares candidates when there are several', () => {
    expect(
      growthFinding(
        run([
          { id: 'a', growth: [1, 1.3], depth: 0.2 },
          { id: 'b', growth: [1, 1.1], depth: 0.05 },
        ]),
      ),
    ).toBe('a ends highest (1 grew to 1.30); b fell least (−5.0% at worst)');
  });

  it('says where a lone candidate ended and how far it fell, with no "highest"', () => {
    expect(growthFinding(run([{ id: 'lw-maxdiv', growth: [1, 1.28], depth: 0.107 }]))).toBe(
      'lw-maxdiv: 1 grew to 1.28, and fell 10.7% at worst',
    );
  });
});
