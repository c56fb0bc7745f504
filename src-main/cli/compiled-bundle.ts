import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { join } from 'node:path';
import { Script } from 'node:vm';

/**
 * The command line as `npm run build` leaves it beside main.js (scripts/build.mjs): every module
 * of the command line in one CommonJS file, and V8's code cache for it, written at build time
 * after a run of the demonstration's commands. Compiling the file with its cache takes a few
 * milliseconds where the ES module loader resolves, reads and parses each module and V8 compiles
 * each function on its first call; a cache made by another Node version (or other V8 flags) is
 * refused by V8 and the file is compiled from its text, with the same result.
 */
export const BUNDLE_FILE = 'holdfast-cli.cjs';
export const CODE_CACHE_FILE = 'holdfast-cli.code-cache';

/** What the bundle exports (its entry is process-edge.ts). */
export type BundleExports = typeof import('./process-edge.js');

export interface CompiledBundle {
  exports: BundleExports;
  /** The compiled script, for `createCachedData()` at build time. */
  script: Script;
}

/**
 * The bundle in `dir`, compiled (with its code cache unless `withCache` is false) and run, or
 * undefined when `dir` holds no bundle (the modules as tsc emitted them, before a build).
 */
export function compileBundle(dir: string, withCache = true): CompiledBundle | undefined {
  const file = join(dir, BUNDLE_FILE);
  const source = readIfThere(file, 'utf8');
  if (source === undefined) return undefined;
  const cachedData = withCache ? readIfThere(join(dir, CODE_CACHE_FILE)) : undefined;
  // CommonJS's own wrapper, so that the bundle sees require, module and __dirname as Node gives them.
  const script = new Script(`(function (exports, require, module, __filename, __dirname) {${source}\n})`, {
    filename: file,
    cachedData,
  });
  const module = { exports: {} as BundleExports };
  (script.runInThisContext() as (...args: unknown[]) => void)(module.exports, createRequire(file), module, file, dir);
  return { exports: module.exports, script };
}

function readIfThere(file: string): Buffer | undefined;
function readIfThere(file: string, encoding: 'utf8'): string | undefined;
function readIfThere(file: string, encoding?: 'utf8'): Buffer | string | undefined {
  try {
    return readFileSync(file, encoding);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === 'ENOENT') return undefined;
    throw error;
  }
}
