import { mkdtempSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { setNativeBinding } from '../../../src-main/store/native-binding.js';
import { openStore } from '../../../src-main/store/store.js';

// The Electron shell loads a second better-sqlite3 binary through the `nativeBinding` option;
// these tests prove the store honours the setting (with Node's own binary, as Electron cannot run here).
const nodeAddon = join(
  dirname(createRequire(import.meta.url).resolve('better-sqlite3/package.json')),
  'build',
  'Release',
  'better_sqlite3.node',
);

afterEach(() => setNativeBinding(undefined));

describe('store: the native addon is chosen by the process', () => {
  it('opens a store through an explicitly named addon binary', () => {
    setNativeBinding(nodeAddon);
    const store = openStore(join(mkdtempSync(join(tmpdir(), 'holdfast-native-')), 's.sqlite'));
    expect(store.check()).toEqual([]);
    store.close();
  });

  it('a named binary that does not exist fails, naming it: the option is really used', () => {
    setNativeBinding('/nowhere/electron-abi/better_sqlite3.node');
    expect(() => openStore(join(mkdtempSync(join(tmpdir(), 'holdfast-native-')), 's.sqlite'))).toThrow(
      /nowhere\/electron-abi/,
    );
  });
});
