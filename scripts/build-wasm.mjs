// Compiles the dense kernels' C sources (shared-core/linalg/wasm/*.c) into two WebAssembly modules
// with SIMD, one on a memory of its own and one on a shared memory (the command line's two threads),
// and writes them into shared-core/linalg/wasm/kernel-binary.ts as base64 beside the
// SHA-256 of the sources it came from (test/unit/linalg/wasm-kernels.test.ts checks that digest,
// so a source changed without rebuilding fails the tests). Needs Debian's clang and lld (the
// wasm32 target); the build and the tests read only the committed module, so they do not.
// Run after changing a kernel: `npm run build:wasm`.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { kernelSourceDigest } from './kernel-source-digest.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const folder = join(root, 'shared-core/linalg/wasm');
const sources = readdirSync(folder)
  .filter((name) => name.endsWith('.c'))
  .sort();
const scratch = mkdtempSync(join(tmpdir(), 'holdfast-wasm-'));
const common = ['--target=wasm32', '-O3', '-msimd128', '-nostdlib', '-Wall', '-Werror', '-Wl,--no-entry'];
const link = ['-Wl,--import-memory', '-Wl,--strip-all', '-Wl,--export=__heap_base'];
// The second module imports a shared memory of at most 2 GiB (32768 pages, MAX_SHARED_PAGES in
// wasm-kernels.ts), for the command line's kernel team; it exports the stack pointer so the
// helper thread's instance can be given a stack of its own in that memory.
const shared = [
  '-matomics',
  '-mbulk-memory',
  '-mmutable-globals',
  '-Wl,--shared-memory',
  '-Wl,--max-memory=2147483648',
  '-Wl,--export=__stack_pointer',
];
const compile = (name, flags) => {
  const out = join(scratch, name);
  const clang = spawnSync('clang', [...common, ...flags, ...link, '-o', out, ...sources.map((s) => join(folder, s))], {
    stdio: 'inherit',
  });
  if (clang.error || clang.status !== 0) {
    console.error(
      `build-wasm: clang failed (${clang.error?.message ?? `exit ${clang.status}`}); install clang and lld`,
    );
    process.exit(1);
  }
  return readFileSync(out);
};
const plain = compile('kernels.wasm', []);
const sharedModule = compile('kernels-shared.wasm', shared);
const version = spawnSync('clang', ['--version'], { encoding: 'utf8' }).stdout.split('\n')[0].trim();
rmSync(scratch, { recursive: true, force: true });
const asLines = (bytes) =>
  bytes
    .toString('base64')
    .match(/.{1,96}/g)
    .map((line) => `  '${line}',`)
    .join('\n');
const target = join(folder, 'kernel-binary.ts');
writeFileSync(
  target,
  `// Written by scripts/build-wasm.mjs from ${sources.join(', ')} (${version}); do not edit.\n` +
    `\n/** SHA-256 of the C sources these modules were compiled from (see kernel-source-digest.mjs). */\n` +
    `export const KERNEL_SOURCE_DIGEST = '${kernelSourceDigest(folder)}';\n` +
    `\n/** The dense kernels on a memory of their own, ${plain.length} bytes in base64. */\n` +
    `export const KERNEL_MODULE_BASE64 = [\n${asLines(plain)}\n].join('');\n` +
    `\n/** The same kernels on a shared memory (two threads), ${sharedModule.length} bytes in base64. */\n` +
    `export const KERNEL_SHARED_MODULE_BASE64 = [\n${asLines(sharedModule)}\n].join('');\n`,
);
spawnSync(process.execPath, [join(root, 'node_modules/prettier/bin/prettier.cjs'), '--write', target], {
  stdio: 'inherit',
});
console.log(`build-wasm: ${plain.length} and ${sharedModule.length} bytes from ${sources.length} source(s)`);
