import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { CliIO } from '../../../src-main/cli/command.js';
import { runCli } from '../../../src-main/cli/run-cli.js';
import { syntheticPrices } from '../walkforward/synthetic.js';

let dir = '';

function io(signal: AbortSignal = new AbortController().signal) {
  const out: string[] = [];
  const err: string[] = [];
  const cli: CliIO = { stdout: (t) => out.push(t), stderr: (t) => err.push(t), cwd: dir, env: {}, signal };
  return { cli, out, err };
}

const scenario = {
  format: 'holdfast-scenario@1',
  name: 'Invented household: core allocation',
  baseCurrency: 'EUR',
  assetInfo: {
    A01: { assetClass: 'Bonds' },
    A02: { assetClass: 'Bonds' },
    A03: { assetClass: 'Equity' },
    A04: { assetClass: 'Equity' },
    A05: { assetClass: 'Equity' },
  },
  constraints: { weightBounds: { default: [0, 0.6] } },
  candidates: [
    { id: 'mv-lw', estimator: { method: 'ledoit-wolf' }, objective: { method: 'min-variance' } },
    { id: 'ew', estimator: { method: 'sample' }, objective: { method: 'equal-weight' } },
  ],
  backtest: { estimationWindow: 120, rebalance: 'quarterly', costBps: { Bonds: 5, Equity: 15 }, cashRate: 0.01 },
  stress: { shocks: [{ name: 'Equity sell-off', target: 'Equity', shock: -0.2 }] },
};

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'holdfast-backtest-'));
  const p = syntheticPrices(5, 640, 23);
  const lines = [['date', ...p.assets].join(',')];
  p.dates.forEach((d, t) => lines.push([d, ...p.closes.map((c) => c[t].toFixed(4))].join(',')));
  writeFileSync(join(dir, 'prices.csv'), lines.join('\n') + '\n');
  writeFileSync(join(dir, 'scenario.json'), JSON.stringify(scenario, null, 2));
  writeFileSync(join(dir, 'bad-prices.csv'), 'date,A01\n2024-01-02,100\n2024-01-03,abc\n');
  writeFileSync(
    join(dir, 'bad-scenario.json'),
    JSON.stringify({ ...scenario, backtest: { ...scenario.backtest, rebalance: 'weekly' } }, null, 2),
  );
  writeFileSync(
    join(dir, 'bad-shock.json'),
    JSON.stringify({ ...scenario, stress: { shocks: [{ name: 'x', target: 'Commodities', shock: -0.1 }] } }),
  );
});

describe('holdfast backtest', () => {
  it('prints the JSON shape of the issue: candidates with rebalances, returns and metrics', async () => {
    const { cli, out, err } = io();
    const code = await runCli(['backtest', '--prices', 'prices.csv', '--scenario', 'scenario.json', '--json'], cli);
    expect(err.join('')).not.toMatch(/internal error/);
    expect(code).toBe(0);
    const doc = JSON.parse(out.join(''));
    expect(doc.candidates.map((c: { id: string }) => c.id)).toEqual(['mv-lw', 'ew']);
    const ew = doc.candidates[1];
    expect(Object.keys(ew.rebalances[0])).toEqual(expect.arrayContaining(['date', 'weights', 'turnover']));
    expect(ew.rebalances[0].weights).toEqual({ A01: 0.2, A02: 0.2, A03: 0.2, A04: 0.2, A05: 0.2 });
    expect(ew.returns[0]).toEqual({ date: expect.stringMatching(/^\d{4}-\d{2}-\d{2}$/), value: expect.any(Number) });
    expect(ew.returns).toHaveLength(640 - 1 - 120);
    expect(ew.metrics).toMatchObject({
      annualisedReturn: expect.any(Number),
      volatility: expect.any(Number),
      sharpeRatio: expect.any(Number),
      maxDrawdown: { depth: expect.any(Number), peakDate: expect.any(String), troughDate: expect.any(String) },
      turnoverPerYear: expect.any(Number),
      costsPaid: expect.any(Number),
    });
    // Per-class costs: buying 40% Bonds at 5 bps and 60% Equity at 15 bps from cash costs 0.0011.
    expect(ew.rebalances[0].cost).toBeCloseTo(0.4 * 0.0005 + 0.6 * 0.0015, 15);
    const mv = doc.candidates[0];
    expect(mv.rebalances.every((r: { status: string }) => r.status === 'optimal')).toBe(true);
    const sum = Object.values(mv.rebalances[3].weights as Record<string, number>).reduce((a, b) => a + b, 0);
    expect(sum).toBeCloseTo(1, 9);
    expect(doc.comparisons[0]).toMatchObject({
      a: 'ew',
      b: 'mv-lw',
      method: expect.stringMatching(/Politis and Romano 1994/),
    });
    expect(doc.stress.shocks[0].byCandidate.ew.portfolioReturn).toBeLessThan(0);
    expect(doc.cautions).toMatch(/past performance does not guarantee future results/);
  });

  it('prints a readable report with the cautions, and progress on standard error', async () => {
    const { cli, out, err } = io();
    const code = await runCli(['backtest', '--prices', 'prices.csv', '--scenario', 'scenario.json'], cli);
    expect(code).toBe(0);
    const text = out.join('');
    expect(text).toMatch(/^Walk-forward \d{4}-\d{2}-\d{2} to \d{4}-\d{2}-\d{2}: quarterly rebalancing/);
    expect(text).toMatch(/Differences from mv-lw/);
    expect(text).toMatch(/Equity sell-off/);
    expect(text).toMatch(/not advice/);
    expect(err.join('')).toMatch(/mv-lw \(1\/2\) walk-forward 100%/);
  });

  it('is deterministic: the same files and seed give the same JSON', async () => {
    const a = io();
    const b = io();
    const argv = ['backtest', '--prices', 'prices.csv', '--scenario', 'scenario.json', '--json', '--stability'];
    await runCli([...argv, '--draws', '20', '--seed', '3'], a.cli);
    await runCli([...argv, '--draws', '20', '--seed', '3'], b.cli);
    expect(a.out.join('')).toBe(b.out.join(''));
    const doc = JSON.parse(a.out.join(''));
    expect(doc.candidates[0].stability.draws).toBe(20);
    expect(doc.candidates[1].stability.averageTurnoverBetweenDraws).toBe(0);
  });

  it('bad input: exit 2, the message names file, line and column or JSON path, nothing on stdout', async () => {
    const cases: [string[], RegExp][] = [
      [['--prices', 'bad-prices.csv', '--scenario', 'scenario.json'], /bad-prices\.csv:3:2: /],
      [
        ['--prices', 'prices.csv', '--scenario', 'bad-scenario.json'],
        /bad-scenario\.json: backtest\.rebalance: unknown rebalance 'weekly'/,
      ],
      [
        ['--prices', 'prices.csv', '--scenario', 'bad-shock.json'],
        /bad-shock\.json: stress\.shocks\[0\]\.target: unknown target 'Commodities'/,
      ],
      [['--prices', 'missing.csv', '--scenario', 'scenario.json'], /missing\.csv: no such file/],
      [['--prices', 'prices.csv', '--scenario', 'scenario.json', '--draws', '5'], /--draws' needs --stability/],
    ];
    for (const [args, message] of cases) {
      const { cli, out, err } = io();
      expect(await runCli(['backtest', ...args], cli)).toBe(2);
      expect(err.join('')).toMatch(message);
      expect(out.join('')).toBe('');
    }
  });

  it('Ctrl-C stops cleanly: exit 130 and nothing on standard output', async () => {
    const controller = new AbortController();
    const { cli, out, err } = io(controller.signal);
    const running = runCli(['backtest', '--prices', 'prices.csv', '--scenario', 'scenario.json', '--json'], cli);
    setImmediate(() => controller.abort());
    expect(await running).toBe(130);
    expect(out.join('')).toBe('');
    expect(err.join('')).toMatch(/interrupted; nothing written/);
  });
});

describe('backtest exits as solve does (issue 16)', () => {
  const variant = (name: string, change: (s: typeof scenario) => object) =>
    writeFileSync(join(dir, name), JSON.stringify(change(JSON.parse(JSON.stringify(scenario)) as typeof scenario)));
  const both = async (file: string) => {
    const runs = [];
    for (const command of ['solve', 'backtest']) {
      const { cli, out, err } = io();
      const code = await runCli([command, '--prices', 'prices.csv', '--scenario', file, '--json'], cli);
      runs.push({ code, out: out.join(''), err: err.join('').replace(/^holdfast \w+: /gm, '') });
    }
    return runs;
  };

  it('a mandate that cannot be met (floors adding to 150 %) exits 3 and walks nothing forward, never a 0.0 % row', async () => {
    variant('floors.json', (s) => ({ ...s, constraints: { weightBounds: { default: [0.3, 0.6] } } }));
    const [solve, backtest] = await both('floors.json');
    expect(solve.code).toBe(3);
    expect(backtest.code).toBe(3);
    expect(backtest.out).toBe('');
    expect(backtest.err).toMatch(/mv-lw: infeasible: .*not walked forward/);
  });

  it('an unknown group member exits 2 with the same located message as solve, nothing on stdout', async () => {
    variant('group.json', (s) => ({
      ...s,
      constraints: { ...s.constraints, groups: [{ name: 'Core', members: ['A01', 'NOPE'], max: 0.8 }] },
    }));
    const [solve, backtest] = await both('group.json');
    expect(solve.code).toBe(2);
    expect(backtest.code).toBe(2);
    expect(backtest.out).toBe('');
    expect(solve.err).toContain("group.json: constraints.groups[0].members[1]: unknown asset 'NOPE'");
    expect(backtest.err).toBe(solve.err);
  });

  it('current naming an unknown asset is refused at its JSON path, by solve and backtest alike', async () => {
    variant('current.json', (s) => ({ ...s, current: { A01: 0.5, NOPE: 0.5 } }));
    const [solve, backtest] = await both('current.json');
    expect([solve.code, backtest.code]).toEqual([2, 2]);
    expect(solve.err).toContain("current.json: current.NOPE: unknown asset 'NOPE'");
    expect(backtest.err).toBe(solve.err);
  });

  it('a held asset the scenario leaves out is sold, not refused (it has prices)', async () => {
    variant('sold.json', (s) => ({ ...s, assets: ['A01', 'A02', 'A03'], current: { A01: 0.5, A04: 0.5 } }));
    const [solve] = await both('sold.json');
    expect(solve.err).toBe('');
    expect(solve.code).toBe(0);
  });
});
