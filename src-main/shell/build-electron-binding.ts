import { spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, rmSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { electronBindingRelative } from './native-binding-path.js';

/**
 * Builds better-sqlite3 a second time, for Electron's ABI, into build/electron-native/, from a
 * copy of the package's sources: node_modules keeps its Node build, so the tests and the command
 * line are never broken by the desktop build (the usual postinstall rebuild would break them).
 * node-gyp needs Electron's headers: from its cache (build/electron-gyp) or, where a network
 * exists, from Electron's header server. Run only by `npm start` (with an Electron runtime
 * present) and `npm run dist`; never by postinstall or a test.
 */
export interface BindingBuild {
  ok: boolean;
  path: string;
  /** One line: what happened, or why it could not be built. */
  message: string;
}

export function buildElectronBinding(root: string, electronVersion: string, arch = process.arch): BindingBuild {
  const target = join(root, electronBindingRelative(electronVersion, arch));
  if (existsSync(target)) return { ok: true, path: target, message: `using ${target}` };
  const work = join(root, 'build', 'electron-native', 'src');
  rmSync(work, { recursive: true, force: true });
  mkdirSync(work, { recursive: true });
  const pkg = join(root, 'node_modules', 'better-sqlite3');
  for (const part of ['binding.gyp', 'src', 'deps', 'package.json'])
    cpSync(join(pkg, part), join(work, part), { recursive: true });
  const gyp = join(root, 'node_modules', 'node-gyp', 'bin', 'node-gyp.js');
  const result = spawnSync(
    process.execPath,
    [
      gyp,
      'rebuild',
      '--release',
      `--target=${electronVersion}`,
      `--arch=${arch}`,
      '--dist-url=https://electronjs.org/headers',
      `--devdir=${join(root, 'build', 'electron-gyp')}`,
    ],
    { cwd: work, encoding: 'utf8' },
  );
  const built = join(work, 'build', 'Release', 'better_sqlite3.node');
  if (result.status !== 0 || !existsSync(built)) {
    const why =
      (result.stderr || result.stdout || '').split('\n').filter((l) => /err/i.test(l))[0] ?? 'node-gyp failed';
    return {
      ok: false,
      path: target,
      message: `cannot build better-sqlite3 for Electron ${electronVersion} (${arch}): ${why.trim()} (needs Electron's headers: a network or build/electron-gyp)`,
    };
  }
  mkdirSync(dirname(target), { recursive: true });
  cpSync(built, target);
  return { ok: true, path: target, message: `built ${target}` };
}
