// `npm start`: builds what is needed, then opens the desktop window where an Electron runtime is
// present. Where none is (offline machines: no runtime can be fetched, and this script never
// tries), it says so in one line and starts the same application as the local web host on
// 127.0.0.1 with the invented demonstration store under the user-data folder, printing the
// address to open. Options: --no-build (use dist/ as it is), --port N.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
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
  process.exitCode = await runCli(args, {
    stdout: (text) => process.stdout.write(text),
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
