import { join } from 'node:path';

/**
 * Where the second better-sqlite3 binary, built for Electron's ABI, lives: under build/ in the
 * project (start and dist paths build it there), unpacked beside app.asar in a packaged app.
 * The Node binary in node_modules stays untouched for the tests and the command line.
 */
export function electronBindingRelative(electronVersion: string, arch: string): string {
  return join('build', 'electron-native', `electron-${electronVersion}-${arch}`, 'better_sqlite3.node');
}

/** A path inside app.asar names its unpacked copy (native modules cannot load from the archive). */
export function unpackedPath(path: string): string {
  return path.replace(/([/\\])app\.asar([/\\])/, '$1app.asar.unpacked$2');
}
