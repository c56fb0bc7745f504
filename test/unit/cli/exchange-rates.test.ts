import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { inBaseCurrency } from '../../../shared-core/returns/exchange-rate.js';
import { seededRng } from '../../../shared-core/stability/rng.js';
import { holdfast } from '../../integration/import/cli-io.js';
import { gaussian } from '../optimise/random-problems.js';

/**
 * `--fx FILE.csv` on the file forms of solve and backtest: an asset priced in USD is converted
 * into the EUR base with the rate of the same day, so the answer equals the one from a price
 * file converted by hand. Invented prices and rates (seeded).
 */
const dir = mkdtempSync(join(tmpdir(), 'holdfast-fx-'));
const assets = ['EQ1', 'USX', 'BD1'];
const rows: { date: string; closes: number[]; rate: number }[] = [];
{
  const rng = seededRng(4);
  const p = [100, 50, 100];
  let rate = 0.9;
  const d = new Date(Date.UTC(2021, 0, 4));
  for (let t = 0; t < 700; t++) {
    while (d.getUTCDay() === 0 || d.getUTCDay() === 6) d.setUTCDate(d.getUTCDate() + 1);
    const f = gaussian(rng) * 0.008;
    p[0] *= Math.exp(f + 0.006 * gaussian(rng));
    p[1] *= Math.exp(1.2 * f + 0.01 * gaussian(rng));
    p[2] *= Math.exp(0.1 * f + 0.003 * gaussian(rng));
    rate *= Math.exp(0.005 * gaussian(rng));
    rows.push({ date: d.toISOString().slice(0, 10), closes: [...p], rate });
    d.setUTCDate(d.getUTCDate() + 1);
  }
}
function write(name: string, text: string): string {
  writeFileSync(join(dir, name), text);
  return name;
}
const csv = (convert: boolean) =>
  `date,${assets.join(',')}\n` +
  rows
    .map((r) => `${r.date},${r.closes.map((c, i) => (convert && i === 1 ? c * r.rate : c).toFixed(8)).join(',')}`)
    .join('\n') +
  '\n';
// The converted file multiplies the printed USD close by the rate as printed, so both routes
// start from the same decimal numbers.
const localPrices = write('local.csv', csv(false));
const fxFile = write('fx.csv', `date,USD\n${rows.map((r) => `${r.date},${r.rate.toFixed(8)}`).join('\n')}\n`);
const byHand = write(
  'by-hand.csv',
  `date,${assets.join(',')}\n` +
    rows
      .map((r) => {
        const printed = r.closes.map((c) => Number(c.toFixed(8)));
        printed[1] *= Number(r.rate.toFixed(8));
        return `${r.date},${printed.map((c) => String(c)).join(',')}`;
      })
      .join('\n') +
    '\n',
);
const scenario = {
  format: 'holdfast-scenario@1',
  name: 'Invented FX check',
  baseCurrency: 'EUR',
  assetInfo: { USX: { currency: 'USD' } },
  constraints: { weightBounds: { default: [0, 0.7] } },
  candidates: [
    { id: 'md', estimator: { method: 'ledoit-wolf' }, objective: { method: 'max-diversification' } },
    { id: 'mv', estimator: { method: 'sample' }, objective: { method: 'min-variance' } },
  ],
  backtest: { estimationWindow: 120, rebalance: 'quarterly', costBps: 10 },
};
const scenarioPath = write('scenario.json', JSON.stringify(scenario));

const run = (argv: string[]) => holdfast(dir, ...argv);

function close(a: Record<string, number>, b: Record<string, number>, tol: number): void {
  for (const k of Object.keys(b)) expect(Math.abs(a[k] - b[k])).toBeLessThan(tol);
}

describe('exchange rates on the command line (--fx)', () => {
  it('solve --fx equals solve on the prices converted by hand, and differs from the unconverted run', async () => {
    const withFx = await run(['solve', '--prices', localPrices, '--fx', fxFile, '--scenario', scenarioPath, '--json']);
    const hand = await run(['solve', '--prices', byHand, '--scenario', scenarioPath, '--json']);
    const none = await run(['solve', '--prices', localPrices, '--scenario', scenarioPath, '--json']);
    expect([withFx.code, hand.code, none.code]).toEqual([0, 0, 0]);
    const a = JSON.parse(withFx.stdout).candidates;
    const b = JSON.parse(hand.stdout).candidates;
    const c = JSON.parse(none.stdout).candidates;
    for (let k = 0; k < a.length; k++) {
      close(a[k].weights, b[k].weights, 1e-9);
      expect(Math.abs(a[k].metrics.volatility - b[k].metrics.volatility)).toBeLessThan(1e-12);
      expect(Math.abs(a[k].metrics.volatility - c[k].metrics.volatility)).toBeGreaterThan(1e-6);
    }
  });

  it('backtest --fx equals the backtest of the prices converted by hand', async () => {
    const withFx = await run([
      'backtest',
      '--prices',
      localPrices,
      '--fx',
      fxFile,
      '--scenario',
      scenarioPath,
      '--json',
    ]);
    const hand = await run(['backtest', '--prices', byHand, '--scenario', scenarioPath, '--json']);
    expect([withFx.code, hand.code]).toEqual([0, 0]);
    const a = JSON.parse(withFx.stdout).candidates;
    const b = JSON.parse(hand.stdout).candidates;
    for (let k = 0; k < a.length; k++) {
      expect(Math.abs(a[k].metrics.volatility - b[k].metrics.volatility)).toBeLessThan(1e-10);
      expect(a[k].rebalances.length).toBe(b[k].rebalances.length);
      close(a[k].rebalances.at(-1).weights, b[k].rebalances.at(-1).weights, 1e-8);
    }
  });

  it('a rate series without the asset’s currency is bad input: exit 2, nothing on standard output', async () => {
    const chf = write('chf.csv', `date,CHF\n${rows.map((r) => `${r.date},1.05`).join('\n')}\n`);
    for (const command of ['solve', 'backtest']) {
      const r = await run([command, '--prices', localPrices, '--fx', chf, '--scenario', scenarioPath, '--json']);
      expect(r.code).toBe(2);
      expect(r.stdout).toBe('');
      expect(r.stderr).toMatch(/USX is priced in USD but there is no USD rate series in EUR/);
    }
  });
});

describe('prices in the base currency (the walk-forward converts once)', () => {
  const table = {
    dates: ['2024-01-01', '2024-01-02', '2024-01-03', '2024-01-10'],
    assets: ['A', 'B'],
    closes: [Float64Array.of(10, 11, 12, 13), Float64Array.of(1, 2, 3, 4)],
    currencies: ['EUR', 'USD'],
  };
  const fx = {
    dates: ['2024-01-01', '2024-01-03', '2024-01-04'],
    assets: ['USD'],
    closes: [Float64Array.of(0.5, 0.8, 2)],
  };

  it('uses the rate of the day or the last one before it, never a later one', () => {
    const out = inBaseCurrency(table, 'EUR', fx, 6);
    expect(Array.from(out.closes[0])).toEqual([10, 11, 12, 13]);
    // 2024-01-02 has no rate: the 1st's (0.5), not the 3rd's; 2024-01-10 takes the 4th's, 6 days old.
    expect(Array.from(out.closes[1])).toEqual([1 * 0.5, 2 * 0.5, 3 * 0.8, 4 * 2]);
    expect(out.currencies).toBeUndefined();
  });

  it('a rate older than the fill limit is an error naming the asset, the currency and the date', () => {
    expect(() => inBaseCurrency(table, 'EUR', fx, 5)).toThrow(/no USD rate in EUR for B on 2024-01-10/);
  });
});
