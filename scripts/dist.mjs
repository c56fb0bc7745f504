// `npm run dist`: offline installers with electron-builder (electron-builder.yml), where an
// Electron runtime and Electron's headers are available. Builds the app, then the second
// better-sqlite3 binary for Electron's ABI (never in postinstall; node_modules keeps the Node
// build), writes the generated preload, and packs. Never publishes, never downloads a runtime
// for a test. On a machine without an Electron runtime it says so and exits 1.
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { electronRuntime } from './start.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');

function run(label, command, args) {
  const result = spawnSync(command, args, { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error(`dist: ${label} failed (exit ${result.status ?? result.signal})`);
    process.exit(1);
  }
}

const runtime = electronRuntime();
if (!runtime.present) {
  console.error(`dist: no Electron runtime here (${runtime.reason}); installers are built on a machine that has one`);
  process.exit(1);
}
run('build', process.execPath, [join(root, 'scripts', 'build.mjs')]);
const { buildElectronBinding } = await import(
  pathToFileURL(join(root, 'dist/src-main/shell/build-electron-binding.js')).href
);
const binding = buildElectronBinding(root, runtime.version);
console.log(`dist: ${binding.message}`);
if (!binding.ok) process.exit(1);
const { writePreload } = await import(pathToFileURL(join(root, 'dist/src-main/shell/write-preload.js')).href);
writePreload(join(root, 'dist/src-main/shell/preload.cjs'));
run('electron-builder', process.execPath, [
  join(root, 'node_modules', 'electron-builder', 'cli.js'),
  '--config',
  'electron-builder.yml',
  '--publish',
  'never',
  ...process.argv.slice(2),
]);
