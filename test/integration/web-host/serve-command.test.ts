import { existsSync, mkdtempSync, readFileSync, readdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../../src-main/cli/run-cli.js';
import type { CliIO } from '../../../src-main/cli/command.js';
import { DEMO_SCENARIO_NAME, generateDemo } from '../../../shared-core/demo/index.js';
import { serveStore } from '../../../src-main/web-host/serve-store.js';

function fakeIO(cwd: string) {
  const controller = new AbortController();
  let out = '';
  let err = '';
  const io: CliIO = {
    stdout: (t) => (out += t),
    stderr: (t) => (err += t),
    cwd,
    env: {},
    signal: controller.signal,
  };
  return { io, stop: () => controller.abort(), out: () => out, err: () => err };
}

async function until(predicate: () => boolean, what: string): Promise<void> {
  for (let i = 0; i < 400; i++) {
    if (predicate()) return;
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error(`gave up waiting for ${what}`);
}

async function post(url: string, token: string | undefined, body: unknown) {
  const response = await fetch(url, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json', ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    body: JSON.stringify(body),
  });
  return { status: response.status, reply: await response.json() };
}

describe('holdfast serve', () => {
  it('--demo creates the demo store, prints the loopback address with its token, answers the service API, stops on Ctrl-C', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-serve-'));
    const cli = fakeIO(dir);
    const exit = runCli(['serve', '--store', 'demo.sqlite', '--demo'], cli.io);
    await until(() => cli.out().includes('#token='), 'the address');
    const url = /Open (http:\/\/127\.0\.0\.1:\d+\/#token=(\S+))/.exec(cli.out())!;
    expect(url).not.toBeNull();
    expect(cli.out()).toContain('invented demonstration data');
    const origin = new URL(url[1]).origin;
    const info = await post(`${origin}/api/app.info`, url[2], {});
    expect(info.status).toBe(200);
    expect(info.reply.result.demo).toBe(true);
    expect(info.reply.result.startAt).not.toBeNull();
    const households = await post(`${origin}/api/households.list`, url[2], {});
    expect(households.reply.result.map((h: { name: string }) => h.name)).toEqual([
      'Maraval-Lindqvist family (invented)',
    ]);
    const scenarios = await post(`${origin}/api/scenarios.list`, url[2], {
      householdId: info.reply.result.startAt.householdId,
    });
    expect(JSON.stringify(scenarios.reply)).toContain(DEMO_SCENARIO_NAME);
    // The stored holdings value in euro with the stored FX series, as the generator computed them.
    const holdings = await post(`${origin}/api/holdings.get`, url[2], {
      householdId: info.reply.result.startAt.householdId,
    });
    const demo = generateDemo();
    const stock = holdings.reply.result.positions.find((p: { asset: string }) => p.asset === 'LMI-US');
    expect(stock.valueInBase).toBeCloseTo(demo.holdings.find((h) => h.asset === 'LMI-US')!.baseAmount, 0);
    expect(holdings.reply.result.total).toBeCloseTo(
      demo.holdings.reduce((s, h) => s + h.baseAmount, 0),
      0,
    );
    expect((await post(`${origin}/api/app.info`, undefined, {})).status).toBe(401);
    cli.stop();
    expect(await exit).toBe(0);
    expect(cli.out()).toContain('the store is closed');
    await expect(fetch(`${origin}/`)).rejects.toThrow();
    expect(existsSync(join(dir, 'demo.sqlite'))).toBe(true);
  });

  it('serving an existing demo store again does not recreate it', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-serve-'));
    const first = await serveStore({ storePath: join(dir, 's.sqlite'), demo: true, staticRoot: dir });
    expect(first.createdDemo).toBe(true);
    await first.close();
    const second = await serveStore({ storePath: join(dir, 's.sqlite'), demo: true, staticRoot: dir });
    expect(second.createdDemo).toBe(false);
    expect(second.store.listHouseholds()).toHaveLength(1);
    await second.close();
  });

  it('a missing store without --demo: exit 2 naming the file, nothing created', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-serve-'));
    const cli = fakeIO(dir);
    expect(await runCli(['serve', '--store', 'nope.sqlite'], cli.io)).toBe(2);
    expect(cli.err()).toMatch(/nope\.sqlite: no such store/);
    expect(readdirSync(dir)).toEqual([]);
  });

  it('a file that is not a store, or a bad --port: exit 2 with the reason', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-serve-'));
    writeFileSync(join(dir, 'notes.sqlite'), 'just some text, not SQLite');
    const notStore = fakeIO(dir);
    expect(await runCli(['serve', '--store', 'notes.sqlite'], notStore.io)).toBe(2);
    expect(notStore.err()).toMatch(/notes\.sqlite/);
    const badPort = fakeIO(dir);
    expect(await runCli(['serve', '--store', 'x.sqlite', '--demo', '--port', '70000'], badPort.io)).toBe(2);
    expect(badPort.err()).toMatch(/--port.*0 to 65535/);
    expect(readdirSync(dir)).toEqual(['notes.sqlite']);
    expect(readFileSync(join(dir, 'notes.sqlite'), 'utf8')).toBe('just some text, not SQLite');
  });
});
