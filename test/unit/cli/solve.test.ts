import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { seededRng } from '../../../shared-core/stability/rng.js';
import { gaussian } from '../optimise/random-problems.js';
import { runCliInProcess } from '../../support/run-cli-in-process.js';

const dir = mkdtempSync(join(tmpdir(), 'holdfast-solve-'));

/** Invented prices: five assets, a common factor plus noise, 400 business days (seeded). */
function writePrices(): string {
  const rng = seededRng(9);
  const assets = ['EQ1', 'EQ2', 'BD1', 'BD2', 'ALT'];
  const vol = [0.012, 0.014, 0.004, 0.005, 0.009];
  const beta = [1, 1.1, 0.1, 0.2, 0.5];
  const p = assets.map(() => 100);
  const lines = [`date,${assets.join(',')}`];
  const d = new Date(Date.UTC(2023, 0, 2));
  for (let t = 0; t < 400; t++) {
    while (d.getUTCDay() === 0 || d.getUTCDay() === 6) d.setUTCDate(d.getUTCDate() + 1);
    const f = gaussian(rng) * 0.008;
    for (let i = 0; i < 5; i++) p[i] *= Math.exp(beta[i] * f + vol[i] * gaussian(rng));
    lines.push(`${d.toISOString().slice(0, 10)},${p.map((v) => v.toFixed(4)).join(',')}`);
    d.setUTCDate(d.getUTCDate() + 1);
  }
  const path = join(dir, 'prices.csv');
  writeFileSync(path, lines.join('\n') + '\n');
  return path;
}
const prices = writePrices();

function scenarioFile(name: string, body: object): string {
  const path = join(dir, name);
  writeFileSync(path, JSON.stringify(body, null, 2));
  return path;
}

const base = {
  format: 'holdfast-scenario@1',
  name: 'Invented household',
  baseCurrency: 'EUR',
  constraints: { weightBounds: { default: [0, 0.4] }, groups: [{ name: 'Equity', members: ['EQ1', 'EQ2'], max: 0.5 }] },
  current: { EQ1: 0.3, EQ2: 0.3, BD1: 0.4 },
  candidates: [
    { id: 'md-lw', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } },
    { id: 'mv-lw', estimator: { method: 'ledoit-wolf' }, objective: { method: 'min-variance' } },
    { id: 'erc-s', estimator: { method: 'sample' }, objective: { method: 'equal-risk-contribution' } },
  ],
};

const run = (argv: string[]) => runCliInProcess(argv, dir);

describe('holdfast solve', () => {
  it('prints one JSON object with the issue’s keys and exits 0 when every candidate is optimal', async () => {
    const s = scenarioFile('ok.json', base);
    const r = await run(['solve', '--prices', prices, '--scenario', s, '--json']);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.candidates.map((c: { id: string }) => c.id)).toEqual(['md-lw', 'mv-lw', 'erc-s']);
    for (const c of out.candidates) {
      expect(c.status).toBe('optimal');
      expect(Object.keys(c.weights)).toEqual(['EQ1', 'EQ2', 'BD1', 'BD2', 'ALT']);
      const sum = Object.values(c.weights as Record<string, number>).reduce((a, b) => a + b, 0);
      expect(sum).toBeCloseTo(1, 12);
      expect(Object.keys(c.metrics).sort()).toEqual(
        [
          'diversificationRatio',
          'effectiveBets',
          'effectiveHoldings',
          'riskContributions',
          'turnover',
          'volatility',
        ].sort(),
      );
      expect(Object.keys(c.solver).sort()).toEqual(['iterations', 'kktResidual', 'ms']);
      expect(c.solver.kktResidual).toBeLessThan(1e-10);
      expect(c.weights.EQ1 + c.weights.EQ2).toBeLessThanOrEqual(0.5 + 1e-9);
      expect(c.explanations.assets).toHaveLength(5);
    }
  });

  it('exits 3 with the JSON still printed when a candidate is infeasible', async () => {
    const s = scenarioFile('infeasible.json', {
      ...base,
      candidates: [
        ...base.candidates,
        {
          id: 'tight',
          estimator: { method: 'ledoit-wolf' },
          objective: { method: 'min-variance' },
          constraints: { weightBounds: { default: [0, 0.15] } },
        },
      ],
    });
    const r = await run(['solve', '--prices', prices, '--scenario', s, '--json']);
    expect(r.code).toBe(3);
    const tight = JSON.parse(r.stdout).candidates.find((c: { id: string }) => c.id === 'tight');
    expect(tight.status).toBe('infeasible');
    expect(tight.message).toBe('the per-asset upper bounds add to 75%, below the 100% invested');
    expect(tight.metrics).toBeNull();
  });

  it('exits 2 on an unknown objective, naming the file and JSON path, with nothing on standard output', async () => {
    const s = scenarioFile('bad.json', {
      ...base,
      candidates: [{ ...base.candidates[0], objective: { method: 'max-div' } }],
    });
    const r = await run(['solve', '--prices', prices, '--scenario', s, '--json']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('bad.json');
    expect(r.stderr).toContain('candidates[0].objective.method');
    expect(r.stderr).toContain("'max-div'");
  });

  it('exits 2 on a group member that is not an asset, naming its JSON path', async () => {
    const s = scenarioFile('member.json', {
      ...base,
      constraints: { groups: [{ name: 'Equity', members: ['EQ1', 'EQ9'], max: 0.5 }] },
    });
    const r = await run(['solve', '--prices', prices, '--scenario', s, '--json']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toContain('member.json: constraints.groups[0].members[1]: unknown asset');
  });

  it('exits 2 on a malformed price cell, naming file, line and column', async () => {
    const bad = join(dir, 'bad-prices.csv');
    writeFileSync(bad, 'date,EQ1,EQ2\n2024-01-02,100,101\n2024-01-03,abc,102\n');
    const s = scenarioFile('ok2.json', {
      ...base,
      constraints: {},
      current: undefined,
      candidates: [base.candidates[0]],
    });
    const r = await run(['solve', '--prices', bad, '--scenario', s, '--json']);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe('');
    expect(r.stderr).toMatch(/bad-prices\.csv:3:2: /);
  });

  it('without --json prints a table with the explanations and the cautions', async () => {
    const s = scenarioFile('ok3.json', base);
    const r = await run(['solve', '--prices', prices, '--scenario', s]);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/md-lw: optimal/);
    expect(r.stdout).toMatch(/threshold 1\/DR/);
    expect(r.stdout).toMatch(/past performance does not guarantee future results/);
  });

  it('a singular sample covariance (more assets than returns) is reported with the shrinkage advice', async () => {
    const short = join(dir, 'short.csv');
    writeFileSync(
      short,
      'date,EQ1,EQ2,BD1,BD2,ALT\n2024-01-02,1,1,1,1,1\n2024-01-03,1.01,1.02,0.99,1,1.01\n2024-01-04,1.02,1.01,1,1.01,1.02\n2024-01-05,1.0,1.03,1.01,1.0,1.02\n',
    );
    const s = scenarioFile('sing.json', {
      ...base,
      candidates: [{ id: 'mv-s', estimator: { method: 'sample' }, objective: { method: 'min-variance' } }],
    });
    const r = await run(['solve', '--prices', short, '--scenario', s, '--json']);
    const c = JSON.parse(r.stdout).candidates[0];
    expect(r.code).toBe(1);
    expect(c.status).toBe('error');
    expect(c.message).toMatch(/shrinkage estimator such as ledoit-wolf or oas/);
  });
});
