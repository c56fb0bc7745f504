import { describe, expect, it } from 'vitest';
import { formatPct } from '../../../shared-core/present/format.js';
import type { ScenarioRun } from '../../../shared-core/run/run-scenario.js';
import { solveTable } from '../../../src-main/cli/commands/solve.js';

// One figure, one function: `holdfast solve` prints a weight as the memo and the screens do
// (present/format.ts rounds half away from zero on the shortest decimal form). A weight of
// 0.1235 is 12.4 % there; toFixed on 0.1235 * 100 printed 12.3 %.
describe('holdfast solve text output', () => {
  it('prints weights and figures with the formatter the memo uses', () => {
    const run = {
      candidates: [
        {
          id: 'md',
          status: 'optimal',
          weights: { X: 0.1235, Y: 0.8765 },
          metrics: {
            volatility: 0.10005,
            diversificationRatio: 1.2345,
            effectiveBets: 2.345,
            effectiveHoldings: 1.5,
            turnover: 0,
          },
          explanations: { assets: [{ asset: 'X', weight: 0.1235, text: 'held' }], binding: [], flags: [] },
        },
      ],
    } as unknown as ScenarioRun;
    const text = solveTable(run);
    expect(formatPct(0.1235)).toBe('12.4%');
    expect(text).toMatch(/^ {2}X +12\.4% {2}held$/m);
    expect(text).toContain('volatility 10.0%, diversification ratio 1.235, effective bets 2.35');
  });
});
