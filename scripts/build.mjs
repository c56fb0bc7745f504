// Builds what the command line and the app need: `--cli` emits the TypeScript of src-main,
// shared-core and bench to dist/ and bundles the command line (run by `prepare`, so `npx holdfast`
// works right after `npm ci`); without flags the renderer is bundled by Vite to dist/renderer as well.
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { fileURLToPath, pathToFileURL } from 'node:url';
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
const cliDir = join(root, 'dist/src-main/cli');
if (existsSync(join(cliDir, 'process-edge.js'))) {
  await bundleCli(cliDir);
  await writeCodeCache(cliDir);
  chmodSync(join(cliDir, 'main.js'), 0o755);
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
 * The command line in one CommonJS file beside main.js (dist/src-main/cli/holdfast-cli.cjs, its
 * entry process-edge.js), bundled by rolldown from the emitted JavaScript with zod, and compiled
 * by main.js with V8's code cache (compiled-bundle.ts, writeCodeCache below): `holdfast solve`
 * then starts without the ES module loader's work on some 20 files (resolving, reading,
 * parsing) and without compiling each function on its first call. A module reached only through
 * a command's `import()` runs when the command does (rolldown wraps it in an initialiser), and
 * so does every package and Node module it needs: each is required where it is first imported,
 * not at the top of the file (better-sqlite3 loads its native binding, pdfkit its font data,
 * node:http its own modules). The rest of dist/ is left as tsc wrote it: the main process and
 * `npm start` use it. Every `import.meta.url` keeps meaning the URL of the module's own emitted
 * file, so paths found from it (package.json, the fonts, the renderer) resolve as before.
 * The bundle is written in ASCII (other characters escaped) without comments: Node reads an
 * ASCII file into a one-byte string without decoding UTF-8, 1 ms against 6 for the 1.4 MB
 * bundle with a few dozen non-ASCII characters (a minus sign, a dash) in its text.
 */
async function bundleCli(cliDir) {
  const { build } = await import('rolldown');
  const { BUNDLE_FILE } = await import(pathToFileURL(join(cliDir, 'compiled-bundle.js')).href);
  const dist = join(root, 'dist') + sep;
  const bundled = ['zod'];
  const isPackage = (id) =>
    id.startsWith('node:') ||
    (!id.startsWith('.') && !isAbsolute(id) && !bundled.some((name) => id === name || id.startsWith(`${name}/`)));
  const onFirstUse = '\0holdfast-on-first-use:';
  const urlMarker = '__holdfastModuleUrl__';
  const toPosix = (path) => path.split(sep).join('/');
  await build({
    input: join(cliDir, 'process-edge.js'),
    platform: 'node',
    logLevel: 'warn',
    plugins: [
      {
        // A package as a CommonJS module of one require: rolldown keeps that require inside the
        // module's initialiser, where an import of an external package would go to the top.
        name: 'holdfast-packages-on-first-use',
        resolveId(id, importer) {
          if (!isPackage(id)) return null;
          if (importer?.startsWith(onFirstUse)) return { id, external: true };
          return onFirstUse + id;
        },
        load(id) {
          if (!id.startsWith(onFirstUse)) return null;
          return `module.exports = require(${JSON.stringify(id.slice(onFirstUse.length))});`;
        },
      },
      {
        name: 'holdfast-own-module-url',
        transform(code, id) {
          if (!id.startsWith(dist) || !code.includes('import.meta.url')) return null;
          return code.replaceAll('import.meta.url', `${urlMarker}(${JSON.stringify(toPosix(relative(dist, id)))})`);
        },
        renderChunk(code) {
          return code.replace(new RegExp(`${urlMarker}\\((["'])(.+?)\\1\\)`, 'g'), (_, _quote, path) => {
            const url = toPosix(relative(cliDir, join(dist, path)));
            return `require("node:url").pathToFileURL(require("node:path").join(__dirname, ${JSON.stringify(url)})).href`;
          });
        },
      },
    ],
    output: { file: join(cliDir, BUNDLE_FILE), format: 'cjs', codeSplitting: false, charset: 'ascii', comments: false },
  });
}

/**
 * V8's code cache of the bundle, taken after the demonstration's commands ran in this process
 * (so it holds the functions they compiled, not only the top level): `demo`, `solve` in both
 * outputs and `estimate`. A command that did not run here still compiles its functions on first
 * use. Output is thrown away; a failing command fails the build.
 */
async function writeCodeCache(cliDir) {
  const { compileBundle, CODE_CACHE_FILE } = await import(pathToFileURL(join(cliDir, 'compiled-bundle.js')).href);
  const bundle = compileBundle(cliDir, false);
  const work = mkdtempSync(join(tmpdir(), 'holdfast-build-'));
  const files = ['--prices', 'demo-prices.csv', '--scenario', 'demo-scenario.json', '--fx', 'demo-fx.csv'];
  let errors = '';
  const io = {
    stdout: () => {},
    stderr: (text) => (errors += text),
    cwd: work,
    env: {},
    signal: new globalThis.AbortController().signal,
  };
  try {
    for (const argv of [
      ['demo', '--out', '.'],
      ['solve', ...files, '--json'],
      ['solve', ...files],
      ['estimate', '--prices', 'demo-prices.csv', '--frequency', 'monthly', '--json'],
    ]) {
      const code = await bundle.exports.runCli(argv, io);
      if (code !== 0) {
        console.error(`build: holdfast ${argv.join(' ')} exited ${code} while writing the code cache\n${errors}`);
        process.exit(1);
      }
    }
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
  writeFileSync(join(cliDir, CODE_CACHE_FILE), bundle.script.createCachedData());
}
