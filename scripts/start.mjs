// `npm start`: builds what is needed, then opens the desktop window where an Electron runtime is
// present. Where none is (offline machines: no runtime can be fetched, and this script never
// tries), it says so in one line and starts the same application as the local web host on
// 127.0.0.1 with the invented demonstration store under the user-data folder, prints the address
// and opens it in an app window (`--app=URL`: no tabs, no address bar) of the machine's Chromium
// or Chrome where one is installed and a display is there to show it. Options: --no-build (use
// dist/ as it is), --port N. $HOLDFAST_BROWSER names the browser to use, or `none` for none.
import { spawn, spawnSync } from 'node:child_process';
import { accessSync, constants, existsSync, readFileSync, statSync } from 'node:fs';
import { homedir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');

/**
 * Finds an installed Electron runtime without loading the `electron` package (its index.js would
 * try to download one). Honours ELECTRON_OVERRIDE_DIST_PATH as that package does.
 */
export function electronRuntime(projectRoot = root, env = process.env, platform = process.platform) {
  const pkg = join(projectRoot, 'node_modules', 'electron');
  if (!existsSync(join(pkg, 'package.json')))
    return { present: false, reason: 'the electron package is not installed' };
  const version = JSON.parse(readFileSync(join(pkg, 'package.json'), 'utf8')).version;
  if (env.ELECTRON_OVERRIDE_DIST_PATH) {
    const name =
      platform === 'win32'
        ? 'electron.exe'
        : platform === 'darwin'
          ? 'Electron.app/Contents/MacOS/Electron'
          : 'electron';
    const path = join(env.ELECTRON_OVERRIDE_DIST_PATH, name);
    return existsSync(path) ? { present: true, path, version } : { present: false, reason: `no Electron at ${path}` };
  }
  const pathFile = join(pkg, 'path.txt');
  if (!existsSync(pathFile)) return { present: false, reason: `Electron ${version}'s runtime was never downloaded` };
  const path = join(pkg, 'dist', readFileSync(pathFile, 'utf8').trim());
  return existsSync(path) ? { present: true, path, version } : { present: false, reason: `no Electron at ${path}` };
}

/** The folder Electron's app.getPath('userData') gives for productName Holdfast, or $HOLDFAST_USER_DATA. */
export function userDataDir(env = process.env, platform = process.platform, home = homedir()) {
  if (env.HOLDFAST_USER_DATA) return env.HOLDFAST_USER_DATA;
  if (platform === 'win32') return join(env.APPDATA || join(home, 'AppData', 'Roaming'), 'Holdfast');
  if (platform === 'darwin') return join(home, 'Library', 'Application Support', 'Holdfast');
  return join(env.XDG_CONFIG_HOME || join(home, '.config'), 'Holdfast');
}

/** Where Chromium and Chrome install themselves, per platform (the first found is used). */
const BROWSER_PATHS = {
  linux: [
    '/usr/bin/chromium',
    '/usr/bin/chromium-browser',
    '/usr/bin/google-chrome',
    '/usr/bin/google-chrome-stable',
    '/snap/bin/chromium',
  ],
  darwin: [
    '/Applications/Chromium.app/Contents/MacOS/Chromium',
    '/Applications/Google Chrome.app/Contents/MacOS/Google Chrome',
  ],
  win32: [
    'C:/Program Files/Google/Chrome/Application/chrome.exe',
    'C:/Program Files (x86)/Google/Chrome/Application/chrome.exe',
  ],
};

function isExecutable(path) {
  try {
    accessSync(path, constants.X_OK);
    return statSync(path).isFile();
  } catch {
    return false;
  }
}

/**
 * The browser for the app window: $HOLDFAST_BROWSER (`none`: no window), else the first installed
 * Chromium or Chrome. On Linux a window needs a display ($DISPLAY or $WAYLAND_DISPLAY).
 */
export function appBrowser(env = process.env, platform = process.platform, executable = isExecutable) {
  if (env.HOLDFAST_BROWSER === 'none') return { found: false, reason: 'HOLDFAST_BROWSER=none' };
  if (platform === 'linux' && !env.DISPLAY && !env.WAYLAND_DISPLAY)
    return { found: false, reason: 'no display to open a window on' };
  if (env.HOLDFAST_BROWSER)
    return executable(env.HOLDFAST_BROWSER)
      ? { found: true, path: env.HOLDFAST_BROWSER }
      : { found: false, reason: `HOLDFAST_BROWSER=${env.HOLDFAST_BROWSER} is not an executable file` };
  const path = (BROWSER_PATHS[platform] ?? []).find((p) => executable(p));
  return path ? { found: true, path } : { found: false, reason: 'no Chromium or Chrome installed' };
}

/** An app window on its own profile, so it opens even while the user's browser runs. */
export function appWindowArgs(url, profileDir) {
  return [`--app=${url}`, `--user-data-dir=${profileDir}`, '--no-first-run', '--no-default-browser-check'];
}

function build() {
  const result = spawnSync(process.execPath, [join(root, 'scripts', 'build.mjs')], { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error('npm start: the build failed (see above); nothing was started');
    process.exit(1);
  }
}

async function startDesktop(runtime) {
  const { buildElectronBinding } = await import(
    pathToFileURL(join(root, 'dist/src-main/shell/build-electron-binding.js')).href
  );
  const binding = buildElectronBinding(root, runtime.version);
  if (!binding.ok) return binding.message;
  const { writePreload } = await import(pathToFileURL(join(root, 'dist/src-main/shell/write-preload.js')).href);
  writePreload(join(root, 'dist/src-main/shell/preload.cjs'));
  const child = spawn(runtime.path, [join(root, 'dist/src-main/shell/electron-main.js'), '--demo'], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, HOLDFAST_DEV: '1' },
  });
  child.on('exit', (code) => process.exit(code ?? 0));
  return undefined;
}

async function startWebHost(port) {
  const { runCli } = await import(pathToFileURL(join(root, 'dist/src-main/cli/run-cli.js')).href);
  const controller = new globalThis.AbortController();
  process.once('SIGINT', () => controller.abort());
  process.once('SIGTERM', () => controller.abort());
  const store = join(userDataDir(), 'holdfast-demo.sqlite');
  const { mkdirSync } = await import('node:fs');
  mkdirSync(dirname(store), { recursive: true });
  const args = ['serve', '--store', store, '--demo', ...(port ? ['--port', port] : [])];
  let opened = false;
  const openWindow = (text) => {
    const address = /Open (http:\/\/127\.0\.0\.1:\d+\/\S*)/.exec(text)?.[1];
    if (!address || opened) return;
    opened = true;
    const browser = appBrowser();
    if (!browser.found) {
      process.stdout.write(`No app window (${browser.reason}): open the address above in a browser.\n`);
      return;
    }
    const window = spawn(browser.path, appWindowArgs(address, join(userDataDir(), 'app-window')), {
      stdio: 'ignore',
      detached: true,
    });
    window.on('error', (error) => process.stdout.write(`The app window did not open (${error.message}).\n`));
    window.unref();
    process.stdout.write(`Opened an app window in ${browser.path}.\n`);
  };
  process.exitCode = await runCli(args, {
    stdout: (text) => {
      process.stdout.write(text);
      openWindow(text);
    },
    stderr: (text) => process.stderr.write(text),
    cwd: process.cwd(),
    env: process.env,
    signal: controller.signal,
  });
}

async function main() {
  const argv = process.argv.slice(2);
  const unknown = argv.filter((a, i) => a !== '--no-build' && a !== '--port' && argv[i - 1] !== '--port');
  if (unknown.length > 0) {
    console.error(`npm start: unknown option '${unknown[0]}' (known: --no-build, --port N)`);
    process.exit(2);
  }
  const port = argv.includes('--port') ? argv[argv.indexOf('--port') + 1] : undefined;
  if (!argv.includes('--no-build')) build();
  const runtime = electronRuntime();
  if (runtime.present) {
    const problem = await startDesktop(runtime);
    if (problem === undefined) return;
    console.log(`${problem}; starting the local web host instead.`);
  } else {
    console.log(
      `No Electron runtime here (${runtime.reason}; none is fetched offline): starting the local web host instead.`,
    );
  }
  await startWebHost(port);
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) await main();
