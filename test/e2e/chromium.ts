import { accessSync, constants, statSync } from 'node:fs';

/** Debian's Chromium and the flags that work on these machines (shared by the e2e harness and the bench). */
export const CHROMIUM_FLAGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--disable-quic',
  '--no-first-run',
] as const;

export type ChromiumLookup = { found: true; path: string } | { found: false; reason: string };

export function findChromium(env: Record<string, string | undefined> = process.env): ChromiumLookup {
  const path = env.CHROMIUM_PATH || '/usr/bin/chromium';
  try {
    accessSync(path, constants.X_OK);
    if (!statSync(path).isFile()) return { found: false, reason: `${path} is not a file` };
    return { found: true, path };
  } catch {
    return {
      found: false,
      reason: `no Chromium at ${path}${env.CHROMIUM_PATH ? ' ($CHROMIUM_PATH)' : ' (set $CHROMIUM_PATH or apt-get install chromium)'}`,
    };
  }
}
