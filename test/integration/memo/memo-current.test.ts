import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isSolved } from '../../../shared-core/optimise/result.js';
import { memoFromFiles } from '../../../src-main/app/memo.js';
import { scenarioFromFiles } from '../../../src-main/app/scenario-inputs.js';
import { writeDemoFiles } from '../../../src-main/demo/write-demo-files.js';
import { parseHoldingsText } from '../../../src-main/memo/memo-sources.js';

// A scenario file without `current`, printed with a holdings document: the memo's turnover and
// its trades start from the same holdings, as the store form fills `current` from them
// (app/stored-scenario.ts). The memo used to print "Turnover from current 0.0%" beside trades
// moving a third of the portfolio.
describe('holdfast memo --holdings on a scenario that states no current weights', () => {
  let dir: string;
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'holdfast-memo-current-'));
    writeDemoFiles(dir);
    const scenario = JSON.parse(readFileSync(join(dir, 'demo-scenario.json'), 'utf8')) as Record<string, unknown>;
    delete scenario.current;
    writeFileSync(join(dir, 'no-current.json'), JSON.stringify(scenario));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  const memoOf = (scenarioFile: string) => {
    const inputs = scenarioFromFiles(dir, {
      scenario: scenarioFile,
      prices: 'demo-prices.csv',
      fx: 'demo-fx.csv',
    });
    const file = join(dir, 'demo-household.json');
    const holdings = { ...parseHoldingsText(readFileSync(file, 'utf8')), file };
    return memoFromFiles(inputs, holdings, { date: '2026-01-15', lot: 1000, preparedBy: 'QA' });
  };

  it('takes the current weights from the holdings: the turnover is the sum of |target - held share|', async () => {
    const memo = await memoOf('no-current.json');
    const held = memo.household.holdings!.positions;
    const total = held.reduce((s, p) => s + p.amount, 0);
    const share = Object.fromEntries(held.map((p) => [p.asset, p.amount / total]));
    const recommended = memo.run.candidates.find((c) => c.id === memo.recommended)!;
    if (!isSolved(recommended)) throw new Error('the demo recommendation is solved');
    const assets = new Set([...Object.keys(share), ...Object.keys(recommended.weights)]);
    const turnover = [...assets].reduce((s, a) => s + Math.abs((recommended.weights[a] ?? 0) - (share[a] ?? 0)), 0);
    expect(recommended.metrics.turnover).toBeGreaterThan(0.1);
    expect(recommended.metrics.turnover).toBeCloseTo(turnover, 12);
  });

  it('gives the same candidates as the scenario with those weights written in', async () => {
    const filled = await memoOf('no-current.json');
    const stated = await memoOf('demo-scenario.json');
    // The demo scenario's `current` is the demo household's holdings, rounded in the file.
    const turnovers = (m: typeof filled) =>
      m.run.candidates.map((c) => (isSolved(c) ? Number(c.metrics.turnover.toFixed(3)) : null));
    expect(turnovers(filled)).toEqual(turnovers(stated));
  });
});
