// Builds what the command line and the app need: `--cli` emits the TypeScript of src-main,
// shared-core and bench to dist/ (run by `prepare`, so `npx holdfast` works right after `npm ci`);
// without flags the renderer is bundled by Vite to dist/renderer as well.
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, rmSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, join } from 'node:path';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const cliOnly = process.argv.includes('--cli');

function run(label, command, args) {
  const result = spawnSync(command, args, { cwd: root, stdio: 'inherit' });
  if (result.status !== 0) {
    console.error(`build: ${label} failed (exit ${result.status ?? result.signal})`);
    process.exit(1);
  }
}

rmSync(join(root, 'dist', 'src-main'), { recursive: true, force: true });
rmSync(join(root, 'dist', 'shared-core'), { recursive: true, force: true });
run('TypeScript emit', process.execPath, [join(root, 'node_modules/typescript/bin/tsc'), '-p', 'tsconfig.build.json']);
const bin = join(root, 'dist/src-main/cli/main.js');
if (existsSync(bin)) chmodSync(bin, 0o755);

if (!cliOnly) {
  run('renderer bundle', process.execPath, [
    join(root, 'node_modules/vite/bin/vite.js'),
    'build',
    '--config',
    'src-renderer/vite.config.ts',
    '--logLevel',
    'warn',
  ]);
}
