import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, rmSync, rmdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { describe, it } from 'vitest';
import { serveStore, type ServedStore } from '../../src-main/web-host/serve-store.js';
import { CHROMIUM_FLAGS, findChromium } from './chromium.js';

export { CHROMIUM_FLAGS, findChromium, type ChromiumLookup } from './chromium.js';

/**
 * The end-to-end harness: the local web host on a temporary store and a free loopback port,
 * driven by the machine's own Chromium through playwright-core (never a downloaded browser).
 * It collects console errors and every request to another origin (which it also blocks), and
 * saves screenshots to test/artifacts/ for a reviewer.
 *
 * Chromium: $CHROMIUM_PATH, else /usr/bin/chromium. Where CI=true and none is found, every e2e
 * suite fails; elsewhere each suite is skipped with one loud line saying why.
 */
const root = resolve(dirname(fileURLToPath(import.meta.url)), '../..');
export const ARTIFACTS = join(root, 'test', 'artifacts');
const RENDERER = join(root, 'dist', 'renderer');

/** `describe` for browser tests: runs with Chromium, fails without it on CI, skips loudly elsewhere. */
export function describeInBrowser(name: string, body: () => void): void {
  const lookup = findChromium();
  if (lookup.found) {
    describe(name, body);
    return;
  }
  if (process.env.CI === 'true') {
    describe(name, () => {
      it('needs Chromium on CI', () => {
        throw new Error(`CI=true but ${lookup.reason}: the browser end-to-end tests cannot run`);
      });
    });
    return;
  }
  console.warn(`\n!!! SKIPPING browser end-to-end tests "${name}": ${lookup.reason} !!!\n`);
  describe.skip(name, body);
}

/** Builds dist/renderer once when it is missing (one builder at a time across test workers). */
export function ensureRenderer(): string {
  if (existsSync(join(RENDERER, 'index.html'))) return RENDERER;
  mkdirSync(join(root, 'dist'), { recursive: true });
  const lock = join(root, 'dist', '.renderer-build.lock');
  for (let waited = 0; ; waited++) {
    try {
      mkdirSync(lock);
      break;
    } catch {
      if (waited > 1200) throw new Error(`waited 10 minutes for another renderer build (remove ${lock} if stale)`);
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 500);
    }
  }
  try {
    if (!existsSync(join(RENDERER, 'index.html'))) {
      const vite = join(root, 'node_modules', 'vite', 'bin', 'vite.js');
      const built = spawnSync(
        process.execPath,
        [vite, 'build', '--config', 'src-renderer/vite.config.ts', '--logLevel', 'warn'],
        { cwd: root, encoding: 'utf8' },
      );
      if (built.status !== 0)
        throw new Error(`the renderer does not build (npm run build):\n${built.stderr || built.stdout}`);
    }
  } finally {
    rmdirSync(lock);
  }
  return RENDERER;
}

export interface AppSession {
  served: ServedStore;
  /** The printed address, with its token. */
  url: string;
  origin: string;
  browser: Browser;
  context: BrowserContext;
  page: Page;
  /** Console errors and uncaught page errors, in order. */
  consoleErrors: string[];
  /** Requests the page tried to make to any origin but the host's (each was blocked). */
  foreignRequests: string[];
  /** Saves a full-page PNG to test/artifacts/NAME.png and returns its path. */
  screenshot(name: string, page?: Page): Promise<string>;
  /** Opens another page in the same browser context, with the same collectors. */
  newPage(): Promise<Page>;
  close(): Promise<void>;
}

export interface LaunchOptions {
  /** Serve the invented demonstration store (created fresh). Default true. */
  demo?: boolean;
  /** Serve this store instead of a fresh temporary one. */
  storePath?: string;
  /** Serve this folder instead of dist/renderer. */
  staticRoot?: string;
}

export async function launchApp(options: LaunchOptions = {}): Promise<AppSession> {
  const lookup = findChromium();
  if (!lookup.found) throw new Error(lookup.reason);
  const staticRoot = options.staticRoot ?? ensureRenderer();
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-e2e-'));
  const served = await serveStore({
    storePath: options.storePath ?? join(dir, 'store.sqlite'),
    demo: options.demo ?? true,
    staticRoot,
  });
  const origin = served.host.origin;
  // playwright-core's launch() gives every browser a fresh temporary profile (user-data dir),
  // deleted on close; a user-data dir passed in the flags is refused by design.
  const browser = await chromium.launch({ executablePath: lookup.path, args: [...CHROMIUM_FLAGS] });
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 }, serviceWorkers: 'block' });
  const consoleErrors: string[] = [];
  const foreignRequests: string[] = [];
  const isOwn = (url: string) => {
    if (url.startsWith('data:') || url.startsWith('blob:') || url === 'about:blank') return true;
    try {
      return new URL(url).origin === origin;
    } catch {
      return false;
    }
  };
  await context.route('**/*', async (route) => {
    const url = route.request().url();
    if (isOwn(url)) await route.continue();
    else {
      foreignRequests.push(url);
      await route.abort('blockedbyclient');
    }
  });
  const watch = (page: Page) => {
    page.on('console', (message) => {
      if (message.type() === 'error') consoleErrors.push(message.text());
    });
    page.on('pageerror', (error) => consoleErrors.push(`uncaught: ${error.message}`));
    return page;
  };
  const page = watch(await context.newPage());
  mkdirSync(ARTIFACTS, { recursive: true });
  return {
    served,
    url: served.host.url,
    origin,
    browser,
    context,
    page,
    consoleErrors,
    foreignRequests,
    async screenshot(name, which = page) {
      const path = join(ARTIFACTS, `${name}.png`);
      await which.screenshot({ path, fullPage: true });
      return path;
    },
    newPage: async () => watch(await context.newPage()),
    async close() {
      await browser.close().catch(() => undefined);
      await served.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
