import { spawn } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
// @ts-expect-error: a plain .mjs script without type declarations
import { appBrowser, appWindowArgs, electronRuntime, userDataDir } from '../../../scripts/start.mjs';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');

function fakeProject(withRuntime: boolean): string {
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-start-'));
  mkdirSync(join(dir, 'node_modules', 'electron', 'dist'), { recursive: true });
  writeFileSync(join(dir, 'node_modules', 'electron', 'package.json'), JSON.stringify({ version: '45.5.0' }));
  if (withRuntime) {
    writeFileSync(join(dir, 'node_modules', 'electron', 'path.txt'), 'electron');
    writeFileSync(join(dir, 'node_modules', 'electron', 'dist', 'electron'), '');
  }
  return dir;
}

describe('npm start (scripts/start.mjs)', () => {
  it('finds an Electron runtime only where one was installed, without loading the electron package', () => {
    expect(electronRuntime(fakeProject(false), {}, 'linux')).toMatchObject({ present: false });
    expect(electronRuntime(fakeProject(false), {}, 'linux').reason).toMatch(/never downloaded/);
    const present = electronRuntime(fakeProject(true), {}, 'linux');
    expect(present).toMatchObject({ present: true, version: '45.5.0' });
    const empty = mkdtempSync(join(tmpdir(), 'holdfast-no-electron-'));
    expect(electronRuntime(fakeProject(true), { ELECTRON_OVERRIDE_DIST_PATH: empty }, 'linux').present).toBe(false);
  });

  it("uses the folder Electron would use for the user's data, per platform", () => {
    expect(userDataDir({}, 'linux', '/home/a')).toBe('/home/a/.config/Holdfast');
    expect(userDataDir({ XDG_CONFIG_HOME: '/x' }, 'linux', '/home/a')).toBe('/x/Holdfast');
    expect(userDataDir({}, 'darwin', '/Users/a')).toBe('/Users/a/Library/Application Support/Holdfast');
    expect(userDataDir({ APPDATA: 'C:/Users/a/AppData/Roaming' }, 'win32', 'C:/Users/a')).toBe(
      join('C:/Users/a/AppData/Roaming', 'Holdfast'),
    );
    expect(userDataDir({ HOLDFAST_USER_DATA: '/tmp/h' }, 'linux', '/home/a')).toBe('/tmp/h');
  });

  it("picks the app window's browser: $HOLDFAST_BROWSER, else an installed Chromium or Chrome, and needs a display on Linux", () => {
    const only =
      (...paths: string[]) =>
      (p: string) =>
        paths.includes(p);
    expect(appBrowser({ DISPLAY: ':0' }, 'linux', only('/usr/bin/google-chrome'))).toEqual({
      found: true,
      path: '/usr/bin/google-chrome',
    });
    expect(appBrowser({ DISPLAY: ':0' }, 'linux', only('/usr/bin/chromium', '/usr/bin/google-chrome')).path).toBe(
      '/usr/bin/chromium',
    );
    expect(appBrowser({}, 'linux', only('/usr/bin/chromium')).reason).toMatch(/no display/);
    expect(appBrowser({ DISPLAY: ':0' }, 'linux', only()).reason).toMatch(/no Chromium or Chrome/);
    expect(appBrowser({ HOLDFAST_BROWSER: 'none', DISPLAY: ':0' }, 'linux', only('/usr/bin/chromium')).found).toBe(
      false,
    );
    expect(appBrowser({ HOLDFAST_BROWSER: '/opt/b', DISPLAY: ':0' }, 'linux', only('/opt/b')).path).toBe('/opt/b');
    expect(appBrowser({}, 'darwin', only('/Applications/Chromium.app/Contents/MacOS/Chromium')).found).toBe(true);
    expect(appWindowArgs('http://127.0.0.1:1/#token=x', '/p')).toEqual([
      '--app=http://127.0.0.1:1/#token=x',
      '--user-data-dir=/p',
      '--no-first-run',
      '--no-default-browser-check',
    ]);
  });

  it('without Electron but with a browser and a display: opens the address in an app window', async () => {
    const userData = mkdtempSync(join(tmpdir(), 'holdfast-userdata-'));
    const record = join(userData, 'browser-args.txt');
    const fake = join(userData, 'fake-browser.sh');
    writeFileSync(fake, `#!/bin/sh\nprintf '%s\\n' "$@" > '${record}'\n`);
    chmodSync(fake, 0o755);
    const child = spawn(process.execPath, [join(root, 'scripts', 'start.mjs'), '--no-build'], {
      cwd: root,
      env: {
        ...process.env,
        DISPLAY: ':99',
        HOLDFAST_BROWSER: fake,
        HOLDFAST_USER_DATA: userData,
        ELECTRON_OVERRIDE_DIST_PATH: mkdtempSync(join(tmpdir(), 'holdfast-no-electron-')),
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    child.stdout.on('data', (c) => (out += c));
    const exited = new Promise<number | null>((r) => child.on('exit', (code) => r(code)));
    for (let i = 0; i < 600 && !existsSync(record); i++) await new Promise((r) => setTimeout(r, 50));
    await new Promise((r) => setTimeout(r, 100));
    child.kill('SIGINT');
    expect(await exited).toBe(0);
    const address = /Open (http:\/\/127\.0\.0\.1:\d+\/#token=\S+)/.exec(out)?.[1];
    expect(address, out).toBeDefined();
    expect(out).toContain(`Opened an app window in ${fake}`);
    expect(readFileSync(record, 'utf8').split('\n')).toContain(`--app=${address}`);
  });

  it('without Electron: says so in one line, serves the demo store on loopback, prints the address, stops on Ctrl-C', async () => {
    if (!existsSync(join(root, 'dist', 'src-main', 'cli', 'run-cli.js')))
      throw new Error('dist/ is not built: run npm run build (npm test does) before this test');
    const userData = mkdtempSync(join(tmpdir(), 'holdfast-userdata-'));
    const child = spawn(process.execPath, [join(root, 'scripts', 'start.mjs'), '--no-build'], {
      cwd: root,
      env: {
        ...process.env,
        HOLDFAST_BROWSER: 'none',
        HOLDFAST_USER_DATA: userData,
        ELECTRON_OVERRIDE_DIST_PATH: mkdtempSync(join(tmpdir(), 'holdfast-no-electron-')),
      },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    let err = '';
    child.stdout.on('data', (c) => (out += c));
    child.stderr.on('data', (c) => (err += c));
    const exited = new Promise<number | null>((r) => child.on('exit', (code) => r(code)));
    for (let i = 0; i < 600 && !/Open http/.test(out); i++) await new Promise((r) => setTimeout(r, 50));
    try {
      expect(out.split('\n')[0]).toMatch(/^No Electron runtime here .*starting the local web host instead\.$/);
      const match = /Open (http:\/\/127\.0\.0\.1:(\d+))\/#token=(\S+)/.exec(out);
      expect(match, `${out}\n${err}`).not.toBeNull();
      const response = await fetch(`${match![1]}/api/households.list`, {
        method: 'POST',
        headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${match![3]}` },
        body: '{}',
      });
      const reply = await response.json();
      expect(reply.result.map((h: { name: string }) => h.name)).toEqual(['Maraval-Lindqvist family (invented)']);
      expect(existsSync(join(userData, 'holdfast-demo.sqlite'))).toBe(true);
    } finally {
      child.kill('SIGINT');
    }
    expect(await exited).toBe(0);
    expect(out).toContain('the store is closed');
  });

  it('an unknown option: exit 2 naming it, nothing started', async () => {
    const child = spawn(process.execPath, [join(root, 'scripts', 'start.mjs'), '--fast'], { cwd: root });
    let err = '';
    child.stderr.on('data', (c) => (err += c));
    expect(await new Promise((r) => child.on('exit', r))).toBe(2);
    expect(err).toMatch(/unknown option '--fast'/);
  });
});
