// Compiles the dense kernels' C sources (shared-core/linalg/wasm/*.c) into one WebAssembly module
// with SIMD, and writes it into shared-core/linalg/wasm/kernel-binary.ts as base64 beside the
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
const out = join(scratch, 'kernels.wasm');
const clang = spawnSync(
  'clang',
  [
    '--target=wasm32',
    '-O3',
    '-msimd128',
    '-nostdlib',
    '-Wall',
    '-Werror',
    '-Wl,--no-entry',
    '-Wl,--import-memory',
    '-Wl,--strip-all',
    '-Wl,--export=__heap_base',
    '-o',
    out,
    ...sources.map((name) => join(folder, name)),
  ],
  { stdio: 'inherit' },
);
if (clang.error || clang.status !== 0) {
  console.error(`build-wasm: clang failed (${clang.error?.message ?? `exit ${clang.status}`}); install clang and lld`);
  process.exit(1);
}
const version = spawnSync('clang', ['--version'], { encoding: 'utf8' }).stdout.split('\n')[0].trim();
const bytes = readFileSync(out);
rmSync(scratch, { recursive: true, force: true });
const base64 = bytes.toString('base64');
const lines = base64.match(/.{1,96}/g).map((line) => `  '${line}',`);
const target = join(folder, 'kernel-binary.ts');
writeFileSync(
  target,
  `// Written by scripts/build-wasm.mjs from ${sources.join(', ')} (${version}); do not edit.\n` +
    `\n/** SHA-256 of the C sources this module was compiled from (see kernel-source-digest.mjs). */\n` +
    `export const KERNEL_SOURCE_DIGEST = '${kernelSourceDigest(folder)}';\n` +
    `\n/** The WebAssembly module of the dense kernels, ${bytes.length} bytes in base64. */\n` +
    `export const KERNEL_MODULE_BASE64 = [\n${lines.join('\n')}\n].join('');\n`,
);
spawnSync(process.execPath, [join(root, 'node_modules/prettier/bin/prettier.cjs'), '--write', target], {
  stdio: 'inherit',
});
console.log(`build-wasm: ${bytes.length} bytes from ${sources.length} source(s)`);
