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
