import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { flat, loadFixture, relativeError } from '../estimators/fixtures.js';
import { runCliInProcess } from '../../support/run-cli-in-process.js';

const dir = mkdtempSync(join(tmpdir(), 'holdfast-estimate-'));

function write(name: string, text: string): string {
  writeFileSync(join(dir, name), text);
  return name;
}

const run = (...argv: string[]) => runCliInProcess(['estimate', ...argv], dir);

interface Prices {
  assets: string[];
  dates: string[];
  closes: number[][];
}
const eu = loadFixture<Prices>('eustockmarkets');
const euCsv = ['date,' + eu.assets.join(','), ...eu.dates.map((d, i) => `${d},${eu.closes[i].join(',')}`)].join('\n');
write('eu.csv', euCsv + '\n');

/** A small invented price file with a late starter. */
const small = [
  'date,ALPHA,BETA,GAMMA',
  '2024-01-01,100,50,',
  '2024-01-02,101,50.5,',
  '2024-01-03,100.5,51,',
  '2024-01-04,102,50.8,',
  '2024-01-05,101.2,51.3,',
  '2024-01-08,103,51.1,20',
  '2024-01-09,102.4,51.9,20.4',
  '2024-01-10,102.9,51.6,20.1',
  '2024-01-11,103.5,51.2,20.6',
  '2024-01-12,103.1,51.8,20.2',
].join('\n');
write('small.csv', small);

describe('holdfast estimate (the public interface of the estimators issue)', () => {
  it('defaults: ledoit-wolf scaled-identity, daily log returns, annualised x 252; matches sklearn LedoitWolf on EuStockMarkets', async () => {
    const { code, stdout } = await run('--prices', 'eu.csv', '--json');
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(Object.keys(out)).toEqual([
      'assets',
      'periodsPerYear',
      'observations',
      'covariance',
      'shrinkage',
      'diagnostics',
    ]);
    expect(out.assets).toEqual(['EU1', 'EU2', 'EU3', 'EU4']);
    expect(out.periodsPerYear).toBe(252);
    expect(out.observations).toBe(1859);
    const ref = loadFixture('eustock').ledoitWolf.scaledIdentity;
    const annual = flat(ref.covariance).map((v) => v * 252);
    expect(relativeError(Float64Array.from(out.covariance.flat()), annual)).toBeLessThan(1e-10);
    expect(relativeError([out.shrinkage], [ref.shrinkage])).toBeLessThan(1e-10);
    expect(out.diagnostics).toMatchObject({
      method: 'ledoit-wolf',
      target: 'scaled-identity',
      frequency: 'daily',
      returns: 'log',
    });
  });

  it('--method, --target, --lambda and --half-life select the estimator and its options', async () => {
    const cc = JSON.parse(
      (await run('--prices', 'eu.csv', '--json', '--method', 'ledoit-wolf', '--target', 'constant-correlation')).stdout,
    );
    expect(
      relativeError([cc.shrinkage], [loadFixture('eustock').ledoitWolf.constantCorrelation.shrinkage]),
    ).toBeLessThan(1e-10);
    const ewma = JSON.parse((await run('--prices', 'eu.csv', '--json', '--method', 'ewma', '--lambda', '0.94')).stdout);
    const ref = flat(loadFixture('eustock').ewma['lambda0.94'].covariance).map((v) => v * 252);
    expect(relativeError(Float64Array.from(ewma.covariance.flat()), ref)).toBeLessThan(1e-10);
    expect(ewma.shrinkage).toBeNull();
    const hl = JSON.parse((await run('--prices', 'eu.csv', '--json', '--method', 'ewma', '--half-life', '30')).stdout);
    expect(hl.diagnostics.lambda).toBeCloseTo(0.5 ** (1 / 30), 15);
    const sample = JSON.parse(
      (await run('--prices', 'eu.csv', '--json', '--method', 'sample', '--returns', 'simple', '--frequency', 'weekly'))
        .stdout,
    );
    expect(sample.periodsPerYear).toBe(52);
    expect(sample.diagnostics).toMatchObject({ frequency: 'weekly', returns: 'simple', method: 'sample' });
  });

  it('the window and late inceptions: --from/--to bound it, and the late starter is named on standard error', async () => {
    const { code, stdout, stderr } = await run('--prices', 'small.csv', '--json', '--method', 'sample');
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(out.observations).toBe(4);
    expect(out.diagnostics.window).toEqual({ from: '2024-01-09', to: '2024-01-12' });
    expect(stderr).toMatch(/warning: GAMMA starts on 2024-01-08, after the window start 2024-01-01/);
    expect(out.diagnostics.coverage[0]).toMatchObject({ asset: 'ALPHA', firstDate: '2024-01-01', datesDropped: 5 });
    const bounded = JSON.parse(
      (await run('--prices', 'small.csv', '--json', '--method', 'sample', '--to', '2024-01-11')).stdout,
    );
    expect(bounded.observations).toBe(3);
    expect(bounded.diagnostics.window).toEqual({ from: '2024-01-09', to: '2024-01-11' });
  });

  it('without --json prints a readable table with volatilities, correlations and the cautions', async () => {
    const { code, stdout } = await run('--prices', 'eu.csv', '--method', 'oas');
    expect(code).toBe(0);
    expect(stdout).toMatch(/^Covariance by oas, daily log returns 1991-07-02 to 1998-08-14, annualised x 252/);
    expect(stdout).toMatch(/shrinkage intensity 0\.0025/);
    expect(stdout).toMatch(/\nEU1 +\d+\.\d\d +1\.00 /);
    expect(stdout).toMatch(/past performance does not\nguarantee future results/);
  });

  it('--desmooth fits the smoothing profile of the named asset and reports it (Getmansky, Lo and Makarov 2004)', async () => {
    const smoothed = loadFixture<{ observed: number[]; theta: number[] }>('desmoothing');
    const lines = ['date,FUND,LIQUID'];
    let fund = 100;
    let liquid = 50;
    for (let k = 0; k <= smoothed.observed.length; k++) {
      if (k > 0) {
        fund *= Math.exp(smoothed.observed[k - 1]);
        liquid *= Math.exp(0.03 * Math.sin(3 * k));
      }
      const y = 2000 + Math.floor(k / 12);
      const m = (k % 12) + 1;
      const day = new Date(Date.UTC(y, m, 0)).getUTCDate();
      lines.push(`${y}-${String(m).padStart(2, '0')}-${day},${fund},${liquid}`);
    }
    write('nav.csv', lines.join('\n'));
    const plain = JSON.parse(
      (await run('--prices', 'nav.csv', '--json', '--method', 'sample', '--frequency', 'monthly')).stdout,
    );
    const { code, stdout, stderr } = await run(
      '--prices',
      'nav.csv',
      '--json',
      '--method',
      'sample',
      '--frequency',
      'monthly',
      '--desmooth',
      'FUND',
    );
    expect(code).toBe(0);
    const out = JSON.parse(stdout);
    expect(out.periodsPerYear).toBe(12);
    expect(out.diagnostics.desmoothing[0].asset).toBe('FUND');
    out.diagnostics.desmoothing[0].theta.forEach((v: number, j: number) =>
      expect(Math.abs(v - smoothed.theta[j])).toBeLessThan(1e-5),
    );
    // Desmoothing raises the volatility the smoothing hid; the other asset is untouched.
    expect(out.covariance[0][0]).toBeGreaterThan(1.5 * plain.covariance[0][0]);
    expect(out.covariance[1][1]).toBe(plain.covariance[1][1]);
    expect(stderr).toMatch(/desmoothed FUND/);
    const daily = await run('--prices', 'nav.csv', '--json');
    expect(daily.code).toBe(2);
    expect(daily.stderr).toMatch(/^holdfast estimate: nav\.csv:3:2: FUND is priced monthly .* use frequency monthly/);
    expect((await run('--prices', 'nav.csv', '--desmooth', 'NOPE')).stderr).toMatch(
      /--desmooth: no asset 'NOPE' in nav\.csv/,
    );
  });

  const bad: [string, string, string[], RegExp][] = [
    [
      'a non-positive price',
      'date,A,B\n2024-01-01,1,2\n2024-01-02,0,2\n',
      [],
      /^holdfast estimate: f\.csv:3:2: A: a price must be above zero\n$/,
    ],
    [
      'a date that does not parse',
      'date,A\n2024-01-01,1\n2024-1-02,2\n',
      [],
      /^holdfast estimate: f\.csv:3:1: '2024-1-02' is not a date \(expected YYYY-MM-DD/,
    ],
    [
      'a date in no calendar',
      'date,A\n2024-01-02,1\n2023-02-29,2\n',
      [],
      /^holdfast estimate: f\.csv:3:1: no such calendar date\n$/,
    ],
    [
      'a repeated date',
      'date,A\n2024-01-02,1\n2024-01-02,2\n',
      [],
      /^holdfast estimate: f\.csv:3:1: date 2024-01-02 repeats/,
    ],
    [
      'a non-numeric cell',
      'date,A,B\n2024-01-01,1,x\n',
      [],
      /^holdfast estimate: f\.csv:2:3: B: 'x' is not a number \(like 101\.25\)\n$/,
    ],
    [
      'a constant series',
      'date,A,B\n2024-01-01,1,2\n2024-01-02,1.1,2\n2024-01-03,1.2,2\n2024-01-04,1.1,2\n',
      [],
      /^holdfast estimate: f\.csv:2:3: prices of B are constant/,
    ],
    [
      'fewer than 3 common observations',
      'date,A,B\n2024-01-01,1,\n2024-01-02,1.1,\n2024-01-03,1.2,3\n2024-01-04,1.1,3.1\n2024-01-05,1.3,3.2\n',
      [],
      /^holdfast estimate: f\.csv:4:3: only 2 common daily return\(s\) .*\(B starts on 2024-01-03\)/,
    ],
    [
      'a robust estimate with more assets than periods',
      'date,A,B,C,D\n2024-01-01,1,2,3,4\n2024-01-02,1.1,2.1,3.2,4.1\n2024-01-03,1.2,2.05,3.1,4.3\n2024-01-04,1.1,2.2,3.3,4.2\n',
      ['--method', 'robust'],
      /^holdfast estimate: f\.csv:1:1: robust: Tyler's shape estimator needs more periods than assets/,
    ],
  ];
  it.each(bad)(
    'bad input (%s): exit 2, one message with file:line:column, nothing on standard output',
    async (_what, text, extra, message) => {
      write('f.csv', text);
      const { code, stdout, stderr } = await run('--prices', 'f.csv', '--json', ...extra);
      expect(code).toBe(2);
      expect(stdout).toBe('');
      expect(stderr).toMatch(message);
      expect(stderr.trim().split('\n')).toHaveLength(1);
    },
  );

  it.each([
    [
      ['--prices', 'eu.csv', '--method', 'sample', '--target', 'single-index'],
      /--target applies to --method ledoit-wolf/,
    ],
    [['--prices', 'eu.csv', '--method', 'ewma', '--lambda', '1.2'], /--lambda must lie strictly between 0 and 1/],
    [
      ['--prices', 'eu.csv', '--method', 'ewma', '--lambda', '0.9', '--half-life', '20'],
      /give --lambda or --half-life, not both/,
    ],
    [['--prices', 'eu.csv', '--from', '2024-02-30'], /--from needs a date YYYY-MM-DD/],
    [['--prices', 'missing.csv'], /missing\.csv: no such file/],
    [['--method', 'oas'], /needs --prices/],
  ])('usage errors exit 2 with nothing on standard output: %j', async (argv, message) => {
    const { code, stdout, stderr } = await run(...argv);
    expect(code).toBe(2);
    expect(stdout).toBe('');
    expect(stderr).toMatch(message);
  });
});
