import { mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../../src-main/cli/run-cli.js';
import type { CliIO } from '../../../src-main/cli/command.js';

function fakeIO(cwd: string) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIO = {
    stdout: (t) => out.push(t),
    stderr: (t) => err.push(t),
    cwd,
    env: {},
    signal: new AbortController().signal,
  };
  return { io, out, err };
}

describe('holdfast demo', () => {
  it('writes the price CSV, the FX CSV, the scenario and the household, the same bytes each time', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-demo-'));
    const first = fakeIO(dir);
    expect(await runCli(['demo', '--out', 'a'], first.io)).toBe(0);
    expect(await runCli(['demo', '--out', 'b'], fakeIO(dir).io)).toBe(0);
    const names = readdirSync(join(dir, 'a')).sort();
    expect(names).toEqual(
      ['README-DEMO.txt', 'demo-fx.csv', 'demo-household.json', 'demo-prices.csv', 'demo-scenario.json'].sort(),
    );
    for (const n of names) expect(readFileSync(join(dir, 'b', n))).toEqual(readFileSync(join(dir, 'a', n)));
    const header = readFileSync(join(dir, 'a', 'demo-prices.csv'), 'utf8')
      .split('\n')[0]
      .split(',');
    expect(header[0]).toBe('date');
    expect(header.length).toBeGreaterThan(20);
    expect(first.out.join('')).toContain('invented demonstration data');
  });

  it('a different --seed gives different prices', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-demo-'));
    await runCli(['demo', '--out', 'a'], fakeIO(dir).io);
    expect(await runCli(['demo', '--out', 'b', '--seed', '11'], fakeIO(dir).io)).toBe(0);
    expect(readFileSync(join(dir, 'b', 'demo-prices.csv'))).not.toEqual(
      readFileSync(join(dir, 'a', 'demo-prices.csv')),
    );
  });

  it('refuses an --out that is a file, naming it, with exit code 2 and nothing written', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-demo-'));
    writeFileSync(join(dir, 'taken'), 'x');
    const { io, err } = fakeIO(dir);
    expect(await runCli(['demo', '--out', 'taken'], io)).toBe(2);
    expect(err.join('')).toMatch(/taken.*not a directory/);
    expect(readdirSync(dir)).toEqual(['taken']);
  });

  it('refuses a seed that is not a whole number and a missing --out, with exit code 2', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-demo-'));
    const bad = fakeIO(dir);
    expect(await runCli(['demo', '--out', 'x', '--seed', '1.5'], bad.io)).toBe(2);
    expect(bad.err.join('')).toMatch(/--seed.*whole number/);
    const missing = fakeIO(dir);
    expect(await runCli(['demo'], missing.io)).toBe(2);
    expect(missing.err.join('')).toMatch(/--out/);
    expect(readdirSync(dir)).toEqual([]);
  });
});
