import { existsSync } from 'node:fs';
import { afterAll, beforeAll, expect, it } from 'vitest';
import { generateDemo } from '../../shared-core/demo/index.js';
import { describeInBrowser, launchApp, type AppSession } from './harness.js';

describeInBrowser('local web host in Chromium', () => {
  let app: AppSession;
  const demo = generateDemo();

  beforeAll(async () => {
    app = await launchApp({ demo: true });
  });
  afterAll(async () => {
    await app?.close();
  });

  it('loads the page from the printed address and shows the invented demo household', async () => {
    const response = await app.page.goto(app.url);
    expect(response?.status()).toBe(200);
    expect(response?.headers()['content-security-policy']).toContain("default-src 'none'");
    await app.page.getByText(demo.household.name).first().waitFor({ state: 'visible', timeout: 30_000 });
    // The token leaves the visible address once the page has read it.
    expect(app.page.url()).not.toContain('token=');
    await app.screenshot('host-first-screen');
    expect(existsSync(`${process.cwd()}/test/artifacts/host-first-screen.png`)).toBe(true);
  });

  it('the page made no console error and no request to another origin', () => {
    expect(app.consoleErrors).toEqual([]);
    expect(app.foreignRequests).toEqual([]);
  });

  it("lets the page's workers compile WebAssembly (the dense kernels) but never eval", async () => {
    const verdict = await app.page.evaluate(async () => {
      // A worker inherits the page's policy; the bytes are the smallest valid module (magic, version 1).
      const source = `let wasm = false, evaluated = false;
        try { new WebAssembly.Module(new Uint8Array([0, 97, 115, 109, 1, 0, 0, 0])); wasm = true; } catch {}
        try { (0, eval)('1'); evaluated = true; } catch {}
        postMessage({ wasm, evaluated });`;
      const worker = new Worker(URL.createObjectURL(new Blob([source], { type: 'text/javascript' })));
      const reply = await new Promise<{ wasm: boolean; evaluated: boolean }>((resolve) => {
        worker.onmessage = (event) => resolve(event.data as { wasm: boolean; evaluated: boolean });
      });
      worker.terminate();
      return reply;
    });
    expect(verdict).toEqual({ wasm: true, evaluated: false });
    // The refused eval is reported on the console by the browser itself.
    app.consoleErrors.length = 0;
  });

  it('the server listens on loopback only, and an API call from the page without the token gets 401', async () => {
    expect(app.served.host.host).toBe('127.0.0.1');
    const status = await app.page.evaluate(async () => {
      const r = await fetch('/api/app.info', {
        method: 'POST',
        headers: { 'Content-Type': 'application/json' },
        body: '{}',
      });
      return r.status;
    });
    expect(status).toBe(401);
    app.consoleErrors.length = 0; // the browser logs the refused call itself
  });

  it('the policy blocks a request to another origin, and the collectors see it (so the checks above can fail)', async () => {
    await app.page.evaluate(() => fetch('https://example.org/').catch(() => 'blocked'));
    await expect.poll(() => app.consoleErrors.join('\n')).toMatch(/Content Security Policy|Refused to connect/);
    app.consoleErrors.length = 0;
    // A page without the host's policy does reach the network layer: the harness records and blocks it.
    const other = await app.newPage();
    await other.setContent('<img src="http://192.0.2.1/pixel.png">');
    await expect.poll(() => app.foreignRequests).toContain('http://192.0.2.1/pixel.png');
    await other.close();
    app.foreignRequests.length = 0;
    app.consoleErrors.length = 0;
  });
});
