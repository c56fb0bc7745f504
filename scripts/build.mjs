// Builds what the command line and the app need: `--cli` emits the TypeScript of src-main,
// shared-core and bench to dist/ and bundles the command line (run by `prepare`, so `npx holdfast`
// works right after `npm ci`); without flags the renderer is bundled by Vite to dist/renderer as well.
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, rmSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { dirname, isAbsolute, join, relative, sep } from 'node:path';

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
if (existsSync(bin)) {
  await bundleCli(bin);
  chmodSync(bin, 0o755);
}

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

/**
 * The command line as one entry file and a few chunks (dist/src-main/cli/main.js, chunks/), bundled
 * by rolldown from the emitted JavaScript: a command then loads about ten files instead of some 150
 * modules (zod alone is 94) that the ESM loader resolves, reads and compiles one by one, which
 * starts `holdfast solve` about 0.1 s sooner. Each command's module stays a chunk of its own,
 * imported when the command runs. Packages other than zod stay outside (better-sqlite3 loads its
 * native binding, pdfkit its font data, both from their own folders). The rest of dist/ is left as
 * tsc wrote it: the main process and `npm start` use it. Every `import.meta.url` keeps meaning the
 * URL of the module's own emitted file, so paths found from it (package.json, the fonts, the
 * renderer) resolve as before.
 */
async function bundleCli(entry) {
  const { build } = await import('rolldown');
  const outDir = dirname(entry);
  const dist = join(root, 'dist') + sep;
  const bundled = ['zod'];
  const urlMarker = '__holdfastModuleUrl__';
  const toPosix = (path) => path.split(sep).join('/');
  await build({
    input: entry,
    platform: 'node',
    logLevel: 'warn',
    external: (id) =>
      id.startsWith('node:') ||
      (!id.startsWith('.') && !isAbsolute(id) && !bundled.some((name) => id === name || id.startsWith(`${name}/`))),
    plugins: [
      {
        name: 'holdfast-own-module-url',
        transform(code, id) {
          if (!id.startsWith(dist) || !code.includes('import.meta.url')) return null;
          return code.replaceAll('import.meta.url', `${urlMarker}(${JSON.stringify(toPosix(relative(dist, id)))})`);
        },
        renderChunk(code, chunk) {
          const chunkDir = dirname(join(outDir, chunk.fileName));
          return code.replace(new RegExp(`${urlMarker}\\((["'])(.+?)\\1\\)`, 'g'), (_, _quote, path) => {
            const url = toPosix(relative(chunkDir, join(dist, path)));
            return `new URL(${JSON.stringify(url)}, import.meta.url).href`;
          });
        },
      },
    ],
    output: {
      dir: outDir,
      format: 'esm',
      entryFileNames: 'main.js',
      chunkFileNames: 'chunks/[name]-[hash].js',
    },
  });
}
