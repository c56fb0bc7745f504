import { readFileSync, readdirSync } from 'node:fs';
import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { runInNewContext } from 'node:vm';
import { describe, expect, it } from 'vitest';
import type { ImplementationOf, ServiceReply } from '../../../shared-core/contract/define.js';
import { serviceApi, type ServiceApiTable } from '../../../shared-core/contract/service-api.js';
import { menuTemplate } from '../../../src-main/shell/app-menu.js';
import { APP_ENTRY, appFileOf, appResponse, isAppUrl } from '../../../src-main/shell/app-protocol.js';
import {
  checkDialogRequest,
  DIALOG_CHANNELS,
  MEMO_VIEWER_CHANNEL,
  MENU_CHANNEL,
} from '../../../src-main/shell/dialog-channels.js';
import { channelOf, ipcHandlers, ipcRoutes } from '../../../src-main/shell/ipc-table.js';
import { electronBindingRelative, unpackedPath } from '../../../src-main/shell/native-binding-path.js';
import { decideDeviceAccess, decidePermission } from '../../../src-main/shell/permission-handler.js';
import { preloadSource } from '../../../src-main/shell/preload-source.js';
import { mayNavigate, shouldCancelRequest } from '../../../src-main/shell/request-filter.js';
import { windowOptions } from '../../../src-main/shell/window-options.js';
import { parseWindowState, restoreBounds } from '../../../src-main/shell/window-state.js';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');

/** An implementation that records what reached it (so a refused payload provably did not). */
function recordingImplementation() {
  const calls: string[] = [];
  const impl = new Proxy(
    {},
    {
      get: (_t, name: string) => async () => {
        calls.push(name);
        return { version: '0', storePath: '/x', demo: false, dataVersion: 0, startAt: null };
      },
    },
  ) as ImplementationOf<ServiceApiTable>;
  return { impl, calls };
}

describe('shell: the request filter (nothing may leave the machine)', () => {
  it('cancels https://example.org and every other remote or local-file request', () => {
    for (const url of [
      'https://example.org/',
      'http://example.org/x.js',
      'http://127.0.0.1:8080/api/app.info',
      'http://localhost/',
      'ws://example.org/socket',
      'wss://example.org/socket',
      'ftp://example.org/file',
      'file:///etc/passwd',
      'holdfast://elsewhere/index.html',
      'chrome-extension://abc/page.html',
      'devtools://devtools/bundled/inspector.html',
    ])
      expect(shouldCancelRequest(url, { development: false }), url).toBe(true);
  });

  it("allows the app's own files and the page's own data: and blob: URLs", () => {
    for (const url of [
      APP_ENTRY,
      'holdfast://app/assets/index-abc.js',
      'data:image/png;base64,AAAA',
      'blob:holdfast://app/1-2',
    ])
      expect(shouldCancelRequest(url, { development: false }), url).toBe(false);
  });

  it('allows devtools pages only in a development build', () => {
    expect(shouldCancelRequest('devtools://devtools/bundled/inspector.html', { development: true })).toBe(false);
    expect(shouldCancelRequest('https://example.org/', { development: true })).toBe(true);
  });

  it('navigation is allowed only to the app itself', () => {
    expect(mayNavigate(APP_ENTRY)).toBe(true);
    expect(mayNavigate('https://example.org/')).toBe(false);
    expect(mayNavigate('file:///home/user/')).toBe(false);
  });
});

describe('shell: permissions', () => {
  it("denies every permission Electron's typings name, and device access", () => {
    const dts = readFileSync(join(root, 'node_modules/electron/electron.d.ts'), 'utf8');
    const line = dts.split('\n').find((l) => l.includes('setPermissionRequestHandler(handler'))!;
    const names = [...line.slice(line.indexOf('permission:'), line.indexOf('callback:')).matchAll(/'([^']+)'/g)].map(
      (m) => m[1],
    );
    expect(names.length).toBeGreaterThan(20);
    for (const name of names) expect(decidePermission(name, APP_ENTRY), name).toBe(false);
    for (const kind of ['hid', 'serial', 'usb']) expect(decideDeviceAccess(kind)).toBe(false);
  });
});

describe('shell: the window', () => {
  it('is hardened: isolation, sandbox, no Node, web security; devtools only in development', () => {
    const options = windowOptions({
      bounds: { x: 10, y: 20, width: 1200, height: 800 },
      preloadPath: '/app/preload.cjs',
      development: false,
    });
    expect(options.webPreferences).toMatchObject({
      contextIsolation: true,
      sandbox: true,
      nodeIntegration: false,
      nodeIntegrationInWorker: false,
      nodeIntegrationInSubFrames: false,
      webSecurity: true,
      allowRunningInsecureContent: false,
      webviewTag: false,
      devTools: false,
      preload: '/app/preload.cjs',
    });
    expect(options).toMatchObject({ x: 10, y: 20, width: 1200, height: 800 });
    const dev = windowOptions({ bounds: { x: 0, y: 0, width: 1, height: 1 }, preloadPath: 'p', development: true });
    expect(dev.webPreferences?.devTools).toBe(true);
  });

  it('restores saved bounds that are on a display, and recentres ones left on an unplugged monitor', () => {
    const displays = [{ x: 0, y: 0, width: 1920, height: 1040 }];
    const saved = { bounds: { x: 100, y: 80, width: 1300, height: 850 }, maximized: true };
    expect(restoreBounds(saved, displays)).toEqual(saved);
    const lost = restoreBounds({ bounds: { x: 3000, y: 80, width: 1300, height: 850 }, maximized: false }, displays);
    expect(lost.bounds.x).toBeGreaterThanOrEqual(0);
    expect(lost.bounds.x + lost.bounds.width).toBeLessThanOrEqual(1920);
    expect(restoreBounds(undefined, displays).bounds.width).toBeLessThanOrEqual(1920);
    expect(parseWindowState('{"bounds":{"x":1,"y":2,"width":3,"height":4},"maximized":false}')).toEqual({
      bounds: { x: 1, y: 2, width: 3, height: 4 },
      maximized: false,
    });
    expect(parseWindowState('{"bounds":{"x":"1"}}')).toBeUndefined();
    expect(parseWindowState('not json')).toBeUndefined();
  });

  it('the menu has the usual shortcuts, and the devtools item only in development', () => {
    const sent: string[] = [];
    const handlers = { send: (a: string) => sent.push(a), quit: () => sent.push('quit'), about: () => undefined };
    const flat = (t: ReturnType<typeof menuTemplate>) =>
      t.flatMap((m) => (Array.isArray(m.submenu) ? m.submenu : [])) as ReturnType<typeof menuTemplate>;
    for (const platform of ['linux', 'win32', 'darwin'] as const) {
      const items = flat(menuTemplate(platform, handlers, { development: false }));
      const accelerators = items.map((i) => i.accelerator).filter(Boolean);
      for (const a of ['CmdOrCtrl+N', 'CmdOrCtrl+S', 'CmdOrCtrl+I', 'CmdOrCtrl+P', 'CmdOrCtrl+Z'])
        expect(accelerators, platform).toContain(a);
      expect(accelerators).toContain(platform === 'darwin' ? 'Cmd+Q' : 'Ctrl+Q');
      expect(items.some((i) => i.role === 'toggleDevTools')).toBe(false);
      items.find((i) => i.accelerator === 'CmdOrCtrl+S')!.click!(undefined as never, undefined, undefined as never);
    }
    expect(sent).toEqual(['save-revision', 'save-revision', 'save-revision']);
    expect(flat(menuTemplate('linux', handlers, { development: true })).some((i) => i.role === 'toggleDevTools')).toBe(
      true,
    );
  });
});

describe('shell: IPC, one channel per service method', () => {
  it('every service method has exactly one channel, and no channel exists without its method', () => {
    const routes = ipcRoutes(serviceApi);
    expect(routes.map((r) => r.method).sort()).toEqual(Object.keys(serviceApi).sort());
    expect(new Set(routes.map((r) => r.channel)).size).toBe(routes.length);
    const { impl } = recordingImplementation();
    const handlers = ipcHandlers(serviceApi, impl, isAppUrl);
    expect([...handlers.keys()].sort()).toEqual(Object.keys(serviceApi).map(channelOf).sort());
  });

  it('a malformed payload is rejected in the main process with a clear error, before the implementation', async () => {
    const { impl, calls } = recordingImplementation();
    const handlers = ipcHandlers(serviceApi, impl, isAppUrl);
    const reply = (await handlers.get(channelOf('households.get'))!(APP_ENTRY, { householdId: 42 })) as ServiceReply;
    expect(reply.ok).toBe(false);
    if (!reply.ok) {
      expect(reply.error.code).toBe('bad-request');
      expect(reply.error.message).toMatch(/^households\.get: /);
      expect(reply.error.where).toBe('householdId');
    }
    const extra = await handlers.get(channelOf('app.info'))!(APP_ENTRY, { anything: true });
    expect(extra.ok).toBe(false);
    expect(calls).toEqual([]);
    expect((await handlers.get(channelOf('app.info'))!(APP_ENTRY, {})).ok).toBe(true);
    expect(calls).toEqual(['app.info']);
  });

  it('a call from a frame that is not the app is refused', async () => {
    const { impl, calls } = recordingImplementation();
    const handlers = ipcHandlers(serviceApi, impl, isAppUrl);
    const reply = await handlers.get(channelOf('app.info'))!('https://example.org/', {});
    expect(reply.ok).toBe(false);
    expect(calls).toEqual([]);
  });
});

describe('shell: the preload exposes the one service API and nothing else', () => {
  function loadPreload() {
    const invoked: [string, unknown][] = [];
    const exposed: Record<string, unknown> = {};
    const electron = {
      contextBridge: { exposeInMainWorld: (key: string, api: unknown) => (exposed[key] = api) },
      ipcRenderer: {
        invoke: async (channel: string, payload: unknown) => {
          invoked.push([channel, payload]);
          return { ok: true, result: null };
        },
        on: () => undefined,
        removeListener: () => undefined,
      },
    };
    const required: string[] = [];
    runInNewContext(preloadSource(ipcRoutes(serviceApi)), {
      require: (name: string) => {
        required.push(name);
        if (name !== 'electron') throw new Error(`a sandboxed preload cannot require ${name}`);
        return electron;
      },
      Object,
      Promise,
      String,
      JSON,
    });
    return { invoked, exposed, required };
  }

  it('`call` sends each method on its own channel; an unknown name never reaches IPC', async () => {
    const { invoked, exposed, required } = loadPreload();
    expect(required).toEqual(['electron']);
    expect(Object.keys(exposed)).toEqual(['holdfast']);
    const api = exposed.holdfast as Record<string, (...a: unknown[]) => Promise<ServiceReply>>;
    expect(Object.keys(api).sort()).toEqual(['call', 'chooseFileToOpen', 'chooseFileToSave', 'onMenu', 'openMemo']);
    await api.call('households.list', {});
    expect(invoked).toEqual([['holdfast:households.list', {}]]);
    const refused = await api.call('__proto__', {});
    expect(refused.ok).toBe(false);
    const unknown = await api.call('shell.exec', { command: 'rm' });
    expect(unknown).toMatchObject({ ok: false, error: { code: 'unknown-method' } });
    expect(invoked).toHaveLength(1);
    await api.chooseFileToOpen({});
    expect(invoked[1][0]).toBe(DIALOG_CHANNELS.open);
    await api.openMemo('7');
    expect(invoked[2]).toEqual([MEMO_VIEWER_CHANNEL, { memoId: '7' }]);
  });

  it('the menu channel and the dialog channels are not service channels', () => {
    const channels = ipcRoutes(serviceApi).map((r) => r.channel);
    for (const c of [MENU_CHANNEL, MEMO_VIEWER_CHANNEL, DIALOG_CHANNELS.open, DIALOG_CHANNELS.save])
      expect(channels).not.toContain(c);
  });

  it('dialog requests are validated: a path where a file name belongs is refused, naming the field', () => {
    expect(checkDialogRequest('save', { defaultName: 'memo.pdf' }).ok).toBe(true);
    const bad = checkDialogRequest('save', { defaultName: '/etc/passwd' });
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(JSON.stringify(bad.answer)).toMatch(/defaultName: a file name, not a path/);
    expect(checkDialogRequest('open', { filters: [{ name: 'Prices', extensions: ['csv'] }] }).ok).toBe(true);
    expect(checkDialogRequest('open', { command: 'x' }).ok).toBe(false);
  });
});

describe('shell: the app protocol serves only the renderer folder, with the policy', () => {
  it('maps app URLs inside the folder and refuses escapes', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'holdfast-app-'));
    mkdirSync(join(dir, 'renderer'));
    writeFileSync(join(dir, 'renderer', 'index.html'), '<title>Holdfast</title>');
    writeFileSync(join(dir, 'secret.txt'), 'no');
    const rendererRoot = join(dir, 'renderer');
    expect(appFileOf(APP_ENTRY, rendererRoot)).toBe(join(rendererRoot, 'index.html'));
    for (const url of [
      'holdfast://app/../secret.txt',
      'holdfast://app/%2e%2e/secret.txt',
      'holdfast://app/..%2fsecret.txt',
    ]) {
      const file = appFileOf(url, rendererRoot);
      if (file !== undefined) expect(file.startsWith(join(rendererRoot, '/')), url).toBe(true);
      expect((await appResponse(url, rendererRoot)).status, url).toBe(404);
    }
    expect(appFileOf('https://example.org/index.html', rendererRoot)).toBeUndefined();
    const page = await appResponse(APP_ENTRY, rendererRoot);
    expect(page.status).toBe(200);
    expect(page.headers.get('content-security-policy')).toContain("default-src 'none'");
    expect(await page.text()).toContain('Holdfast');
    expect((await appResponse('holdfast://app/%2e%2e/secret.txt', rendererRoot)).status).toBe(404);
  });
});

describe('shell: nothing a test loads starts Electron', () => {
  it("the shell's plain modules import electron for its types only; only electron-main.ts loads it", () => {
    const dir = join(root, 'src-main', 'shell');
    const offenders: string[] = [];
    for (const name of readdirSync(dir).filter((n) => n.endsWith('.ts'))) {
      const text = readFileSync(join(dir, name), 'utf8');
      const runtime = /^import\s+(?!type\b)[^;]*from\s+'electron'/m.test(text) || /require\('electron'\)/.test(text);
      if (runtime && name !== 'electron-main.ts' && name !== 'preload-source.ts') offenders.push(name);
    }
    expect(offenders).toEqual([]);
  });

  it("the Electron-ABI binary lives under build/ and is read from app.asar's unpacked copy", () => {
    expect(electronBindingRelative('45.5.0', 'x64')).toBe(
      join('build', 'electron-native', 'electron-45.5.0-x64', 'better_sqlite3.node'),
    );
    expect(unpackedPath('/opt/Holdfast/resources/app.asar/build/x.node')).toBe(
      '/opt/Holdfast/resources/app.asar.unpacked/build/x.node',
    );
  });
});
