import { app, BrowserWindow, dialog, ipcMain, Menu, protocol, screen, session, shell } from 'electron';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { serviceApi } from '../../shared-core/contract/service-api.js';
import { DEMO_NOTICE } from '../../shared-core/demo/index.js';
import { createDemoStore } from '../demo/create-demo-store.js';
import { createService, type Service } from '../service/index.js';
import { setNativeBinding } from '../store/native-binding.js';
import { openStore, type Store } from '../store/store.js';
import { menuTemplate } from './app-menu.js';
import { APP_ENTRY, APP_SCHEME, appResponse, isAppUrl } from './app-protocol.js';
import { checkDialogRequest, DIALOG_CHANNELS, MEMO_VIEWER_CHANNEL, MENU_CHANNEL } from './dialog-channels.js';
import { openMemoInViewer } from './memo-viewer.js';
import { ipcHandlers } from './ipc-table.js';
import { electronBindingRelative, unpackedPath } from './native-binding-path.js';
import { decideDeviceAccess, decidePermission } from './permission-handler.js';
import { mayNavigate, shouldCancelRequest } from './request-filter.js';
import { parseWindowState, restoreBounds } from './window-state.js';
import { windowOptions } from './window-options.js';

/**
 * The Electron main process: one window, one store under the user-data folder, the service API
 * over IPC. It runs only inside Electron (never in a test); every decision it makes is one of the
 * plain functions beside it, which the tests check.
 */
const here = dirname(fileURLToPath(import.meta.url));
const projectRoot = join(here, '..', '..', '..');
const development = !app.isPackaged && process.env.HOLDFAST_DEV === '1';
const demo = process.argv.includes('--demo');

protocol.registerSchemesAsPrivileged([
  { scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true } },
]);

let store: Store | undefined;
let service: Service | undefined;
let window: BrowserWindow | undefined;

if (!app.requestSingleInstanceLock()) app.quit();
else {
  app.on('second-instance', () => {
    if (!window) return;
    if (window.isMinimized()) window.restore();
    window.focus();
  });
  app.whenReady().then(start, (error: unknown) => fail(error));
}

function fail(error: unknown): void {
  dialog.showErrorBox('Holdfast could not start', (error as Error).stack ?? String(error));
  app.exit(1);
}

async function start(): Promise<void> {
  try {
    const binding = unpackedPath(join(projectRoot, electronBindingRelative(process.versions.electron, process.arch)));
    if (!existsSync(binding)) throw new Error(`the better-sqlite3 binary for Electron is missing: ${binding}`);
    setNativeBinding(binding);

    const userData = app.getPath('userData');
    mkdirSync(userData, { recursive: true });
    const storePath = join(userData, demo ? 'holdfast-demo.sqlite' : 'holdfast.sqlite');
    if (demo && !existsSync(storePath)) await createDemoStore(storePath);
    store = openStore(storePath);
    service = createService(store, { demo, settingsPath: join(userData, 'settings.json') });

    const rendererRoot = join(projectRoot, 'dist', 'renderer');
    protocol.handle(APP_SCHEME, (request) => appResponse(request.url, rendererRoot));
    harden();

    for (const [channel, handler] of ipcHandlers(serviceApi, service, isAppUrl))
      ipcMain.handle(channel, (event, payload) => handler(event.senderFrame?.url, payload));
    ipcMain.handle(DIALOG_CHANNELS.open, async (event, payload) => {
      if (!isAppUrl(event.senderFrame?.url)) return { ok: false, error: { code: 'bad-request', message: 'refused' } };
      const checked = checkDialogRequest('open', payload);
      if (!checked.ok) return checked.answer;
      const answer = await dialog.showOpenDialog(window!, {
        title: checked.value.title,
        filters: checked.value.filters,
        properties: ['openFile'],
      });
      return { ok: true, path: answer.canceled ? null : (answer.filePaths[0] ?? null) };
    });
    ipcMain.handle(DIALOG_CHANNELS.save, async (event, payload) => {
      if (!isAppUrl(event.senderFrame?.url)) return { ok: false, error: { code: 'bad-request', message: 'refused' } };
      const checked = checkDialogRequest('save', payload);
      if (!checked.ok) return checked.answer;
      const answer = await dialog.showSaveDialog(window!, {
        title: checked.value.title,
        defaultPath: checked.value.defaultName,
        filters: checked.value.filters,
      });
      return { ok: true, path: answer.canceled ? null : (answer.filePath ?? null) };
    });

    ipcMain.handle(MEMO_VIEWER_CHANNEL, async (event, payload) => {
      if (!isAppUrl(event.senderFrame?.url)) return { ok: false, error: { code: 'bad-request', message: 'refused' } };
      return openMemoInViewer(service!, payload, join(userData, 'memos'), (path) => shell.openPath(path));
    });

    Menu.setApplicationMenu(
      Menu.buildFromTemplate(
        menuTemplate(
          process.platform,
          {
            send: (action) => window?.webContents.send(MENU_CHANNEL, action),
            quit: () => app.quit(),
            about: () =>
              void dialog.showMessageBox({
                type: 'info',
                title: 'About Holdfast',
                message: `Holdfast ${app.getVersion()}`,
                detail:
                  'Estimates come from past data; past performance does not guarantee future results. Output is decision ' +
                  'support, not advice, until a licensed adviser reviews it under the local rules.' +
                  (demo ? `\n\n${DEMO_NOTICE}` : ''),
              }),
          },
          { development },
        ),
      ),
    );
    openWindow(join(userData, 'window-state.json'));
  } catch (error) {
    fail(error);
  }
}

/** Session-wide hardening: nothing leaves the machine, no permission is granted. */
function harden(): void {
  const s = session.defaultSession;
  s.webRequest.onBeforeRequest((details, callback) =>
    callback({ cancel: shouldCancelRequest(details.url, { development }) }),
  );
  s.setPermissionRequestHandler((_contents, permission, callback) => callback(decidePermission(permission)));
  s.setPermissionCheckHandler((_contents, permission) => decidePermission(permission));
  s.setDevicePermissionHandler((details) => decideDeviceAccess(details.deviceType));
  app.on('web-contents-created', (_event, contents) => {
    contents.setWindowOpenHandler(() => ({ action: 'deny' }));
    contents.on('will-navigate', (event, url) => {
      if (!mayNavigate(url)) event.preventDefault();
    });
    contents.on('will-redirect', (event, url) => {
      if (!mayNavigate(url)) event.preventDefault();
    });
    contents.on('will-attach-webview', (event) => event.preventDefault());
  });
}

function openWindow(statePath: string): void {
  const saved = parseWindowState(existsSync(statePath) ? readFileSync(statePath, 'utf8') : undefined);
  const state = restoreBounds(
    saved,
    screen.getAllDisplays().map((d) => d.workArea),
  );
  window = new BrowserWindow(
    windowOptions({ bounds: state.bounds, preloadPath: join(here, 'preload.cjs'), development }),
  );
  if (state.maximized) window.maximize();
  window.once('ready-to-show', () => window?.show());
  window.on('close', () => {
    if (!window) return;
    writeFileSync(statePath, JSON.stringify({ bounds: window.getNormalBounds(), maximized: window.isMaximized() }));
  });
  window.on('closed', () => {
    window = undefined;
  });
  void window.loadURL(APP_ENTRY);
}

app.on('window-all-closed', () => app.quit());
app.on('will-quit', () => {
  // Flush and close the store cleanly: running imports stop, WAL is checkpointed on close.
  service?.dispose();
  store?.close();
  store = undefined;
});
