import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '../../..');
const require = createRequire(import.meta.url);
// electron-builder's own YAML reader and configuration validator (app-builder-lib, shipped with
// electron-builder 26.17.0): the check is the packager's schema, not ours.
const yaml = require('js-yaml') as { load(text: string): Record<string, unknown> };
const { validateConfiguration } = require('app-builder-lib/out/util/config/config') as {
  validateConfiguration(config: unknown, logger: unknown): Promise<void>;
};
const { DebugLogger } = require('builder-util') as { DebugLogger: new (enabled: boolean) => unknown };

const config = yaml.load(readFileSync(join(root, 'electron-builder.yml'), 'utf8'));

describe('electron-builder.yml', () => {
  it("passes electron-builder's own configuration schema", async () => {
    await expect(validateConfiguration(config, new DebugLogger(false))).resolves.toBeUndefined();
    // The validator does refuse a wrong file, so the line above can fail.
    await expect(validateConfiguration({ ...config, asarUnpacked: true }, new DebugLogger(false))).rejects.toThrow(
      /asarUnpacked/,
    );
  });

  it('names the app, packs into asar with the native module unpacked, and makes AppImage, deb, NSIS and dmg', () => {
    expect(config.appId).toMatch(/^[a-z]+(\.[a-z]+)+$/);
    expect(config.productName).toBe('Holdfast');
    expect(config.asar).toBe(true);
    expect(config.asarUnpack).toEqual(expect.arrayContaining(['build/electron-native/**', '**/*.node']));
    expect((config.linux as { target: string[] }).target).toEqual(['AppImage', 'deb']);
    expect((config.win as { target: string[] }).target).toEqual(['nsis']);
    expect((config.mac as { target: string[] }).target).toEqual(['dmg']);
  });

  it('publishes nowhere and has no auto-update; node_modules is not rebuilt for Electron', () => {
    expect(config.publish).toBeNull();
    expect(config.npmRebuild).toBe(false);
    const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'));
    const deps = { ...pkg.dependencies, ...pkg.devDependencies };
    expect(Object.keys(deps).filter((d) => /updater/.test(d))).toEqual([]);
    expect(pkg.scripts.postinstall).toBeUndefined();
  });
});
