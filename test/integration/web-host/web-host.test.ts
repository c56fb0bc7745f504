import { mkdtempSync, mkdirSync, writeFileSync } from 'node:fs';
import { request as httpRequest } from 'node:http';
import { connect } from 'node:net';
import { networkInterfaces, tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { method, ServiceFailure, type ImplementationOf } from '../../../shared-core/contract/define.js';
import { startWebHost, type WebHost } from '../../../src-main/web-host/web-host.js';

// A small table of our own: the host must work for any table, without knowing its methods.
const table = {
  'sum.of': method(
    'Adds two numbers.',
    z.strictObject({ a: z.number(), b: z.number() }),
    z.object({ sum: z.number() }),
  ),
  'thing.get': method('Fails with not-found.', z.strictObject({ id: z.string() }), z.object({})),
};
const implementation: ImplementationOf<typeof table> = {
  'sum.of': async ({ a, b }) => ({ sum: a + b }),
  'thing.get': async ({ id }) => {
    throw new ServiceFailure('not-found', `no thing '${id}'`);
  },
};

interface Answer {
  status: number;
  headers: Record<string, string | string[] | undefined>;
  body: string;
}

/** A raw HTTP request, so the Host and Origin headers are exactly what the test says. */
function call(
  host: WebHost,
  path: string,
  options: { method?: string; headers?: Record<string, string>; body?: string } = {},
): Promise<Answer> {
  return new Promise((resolve, reject) => {
    const req = httpRequest(
      { host: '127.0.0.1', port: host.port, path, method: options.method ?? 'GET', headers: options.headers },
      (res) => {
        let body = '';
        res.setEncoding('utf8');
        res.on('data', (c) => (body += c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, body }));
      },
    );
    req.on('error', reject);
    if (options.body !== undefined) req.write(options.body);
    req.end();
  });
}

const api = (host: WebHost, name: string, body: string, headers: Record<string, string> = {}) =>
  call(host, `/api/${name}`, {
    method: 'POST',
    body,
    headers: { 'Content-Type': 'application/json', Authorization: `Bearer ${host.token}`, ...headers },
  });

let host: WebHost;
let bare: WebHost;

beforeAll(async () => {
  const root = mkdtempSync(join(tmpdir(), 'holdfast-renderer-'));
  writeFileSync(
    join(root, 'index.html'),
    '<!doctype html><title>Holdfast</title><script type="module" src="./app.js"></script>',
  );
  mkdirSync(join(root, 'assets'));
  writeFileSync(join(root, 'assets', 'app.js'), 'export {};');
  writeFileSync(join(root, '..', 'outside-the-root.txt'), 'secret');
  host = await startWebHost({ table, implementation, staticRoot: root });
  bare = await startWebHost({ table, implementation, staticRoot: mkdtempSync(join(tmpdir(), 'holdfast-empty-')) });
});
afterAll(async () => {
  await host.close();
  await bare.close();
});

describe('local web host: access', () => {
  it('prints a loopback address with a random per-launch token in the fragment', async () => {
    expect(host.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/#token=[A-Za-z0-9_-]{43}$/);
    expect(host.token).not.toBe(bare.token);
  });

  it('refuses every API request without the token, or with a wrong one, with 401', async () => {
    const body = JSON.stringify({ a: 1, b: 2 });
    const none = await call(host, '/api/sum.of', {
      method: 'POST',
      body,
      headers: { 'Content-Type': 'application/json' },
    });
    expect(none.status).toBe(401);
    expect(JSON.parse(none.body).error.message).toMatch(/access token/);
    const wrong = await api(host, 'sum.of', body, { Authorization: `Bearer ${'x'.repeat(43)}` });
    expect(wrong.status).toBe(401);
    const unknownWithout = await call(host, '/api/no.such', { method: 'POST', body });
    expect(unknownWithout.status).toBe(401);
  });

  it('answers a call with the token through dispatch, in the reply envelope', async () => {
    const ok = await api(host, 'sum.of', JSON.stringify({ a: 2, b: 3.5 }));
    expect(ok.status).toBe(200);
    expect(JSON.parse(ok.body)).toEqual({ ok: true, result: { sum: 5.5 } });
    const missing = await api(host, 'thing.get', JSON.stringify({ id: 'x' }));
    expect(missing.status).toBe(404);
    expect(JSON.parse(missing.body).error).toEqual({ code: 'not-found', message: "no thing 'x'" });
  });

  it('listens on 127.0.0.1 only: no other interface of this machine accepts a connection', async () => {
    expect(host.host).toBe('127.0.0.1');
    const others = Object.values(networkInterfaces())
      .flat()
      .filter((i) => i && !i.internal && i.family === 'IPv4')
      .map((i) => i!.address);
    for (const address of others) {
      const outcome = await new Promise<string>((resolve) => {
        const socket = connect({ host: address, port: host.port });
        socket.once('connect', () => {
          socket.destroy();
          resolve('connected');
        });
        socket.once('error', (e: NodeJS.ErrnoException) => resolve(e.code ?? 'error'));
      });
      expect(outcome, address).toBe('ECONNREFUSED');
    }
  });

  it('refuses a request whose Host is another name (DNS rebinding) and a cross-origin API call', async () => {
    const rebound = await call(host, '/', { headers: { Host: `evil.example:${host.port}` } });
    expect(rebound.status).toBe(421);
    const cross = await api(host, 'sum.of', JSON.stringify({ a: 1, b: 1 }), { Origin: 'https://example.org' });
    expect(cross.status).toBe(403);
  });
});

describe('local web host: malformed requests get a clear error', () => {
  it('a body that is not JSON: 400, naming the method and the problem', async () => {
    const r = await api(host, 'sum.of', '{"a": 1,');
    expect(r.status).toBe(400);
    const reply = JSON.parse(r.body);
    expect(reply.ok).toBe(false);
    expect(reply.error.code).toBe('bad-request');
    expect(reply.error.message).toMatch(/^sum\.of: request body is not valid JSON/);
  });

  it('a payload that breaks the schema: 400 with the JSON path of the bad field', async () => {
    const r = await api(host, 'sum.of', JSON.stringify({ a: 1, b: 'two' }));
    expect(r.status).toBe(400);
    const reply = JSON.parse(r.body);
    expect(reply.error.code).toBe('bad-request');
    expect(reply.error.where).toBe('b');
    const extra = JSON.parse((await api(host, 'sum.of', JSON.stringify({ a: 1, b: 2, c: 3 }))).body);
    expect(extra.error.code).toBe('bad-request');
  });

  it('an unknown method: 404 naming it; a GET on the API: 405; a body that is not JSON-typed: 415', async () => {
    const r = await api(host, 'no.such', '{}');
    expect(r.status).toBe(404);
    expect(JSON.parse(r.body).error.message).toContain("'no.such'");
    const get = await call(host, '/api/sum.of', { headers: { Authorization: `Bearer ${host.token}` } });
    expect(get.status).toBe(405);
    const text = await api(host, 'sum.of', '{}', { 'Content-Type': 'text/plain' });
    expect(text.status).toBe(415);
  });
});

describe('local web host: hostile requests (issue 16)', () => {
  it('a method name that is not valid percent-encoding: 400, not 500', async () => {
    const r = await api(host, '%E0%A4%A', '{}');
    expect(r.status).toBe(400);
    const reply = JSON.parse(r.body);
    expect(reply.error.code).toBe('bad-request');
    expect(reply.error.message).toContain('malformed method name');
  });

  it('JSON nested 4,500 levels deep: 400 naming the depth, before anything walks it', async () => {
    for (const body of ['['.repeat(4500) + ']'.repeat(4500), '{"a":'.repeat(4500) + '1' + '}'.repeat(4500)]) {
      const r = await api(host, 'sum.of', body);
      expect(r.status).toBe(400);
      expect(JSON.parse(r.body).error.message).toMatch(/nests 4500 levels deep; at most 64/);
    }
    // Brackets inside strings are text, not nesting.
    const inString = await api(host, 'sum.of', JSON.stringify({ a: 1, b: 2, c: '['.repeat(5000) }));
    expect(JSON.parse(inString.body).error.code).toBe('bad-request');
    expect(JSON.parse(inString.body).error.message).not.toContain('nests');
    expect((await api(host, 'sum.of', JSON.stringify({ a: 1, b: 2 }))).status).toBe(200);
  });

  it('limits headers and the whole request to 30 s by default', () => {
    expect(host.timeouts).toEqual({ headersMs: 30_000, requestMs: 30_000 });
  });

  it('cuts off a client that sends its headers too slowly (408), at the limit it was given', async () => {
    const slow = await startWebHost({
      table,
      implementation,
      staticRoot: mkdtempSync(join(tmpdir(), 'holdfast-empty-')),
      headersTimeoutMs: 300,
      requestTimeoutMs: 300,
    });
    try {
      const started = Date.now();
      const answer = await new Promise<string>((resolve, reject) => {
        const socket = connect(slow.port, '127.0.0.1', () => socket.write('POST /api/sum.of HTTP/1.1\r\nHost: '));
        let text = '';
        socket.on('data', (d) => (text += d));
        socket.on('close', () => resolve(text));
        socket.on('error', reject);
      });
      expect(answer).toMatch(/^HTTP\/1\.1 408/);
      expect(Date.now() - started).toBeLessThan(5000);
    } finally {
      await slow.close();
    }
  });
});

describe('local web host: the page', () => {
  it('serves the built renderer with a strict Content-Security-Policy naming no other origin', async () => {
    const page = await call(host, '/');
    expect(page.status).toBe(200);
    expect(page.body).toContain('<title>Holdfast</title>');
    const csp = String(page.headers['content-security-policy']);
    expect(csp).toContain("default-src 'none'");
    expect(csp).toContain("script-src 'self' 'wasm-unsafe-eval'");
    expect(csp).not.toContain("'unsafe-eval'");
    expect(csp).toContain("connect-src 'self'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).not.toMatch(/https?:|wss?:|\*/);
    expect(page.headers['x-content-type-options']).toBe('nosniff');
    const apiReply = await api(host, 'sum.of', JSON.stringify({ a: 1, b: 1 }));
    expect(apiReply.headers['content-security-policy']).toBe(csp);
    const script = await call(host, '/assets/app.js');
    expect(script.headers['content-type']).toMatch(/^text\/javascript/);
  });

  it('never serves a file outside the renderer folder', async () => {
    for (const path of [
      '/../outside-the-root.txt',
      '/%2e%2e/outside-the-root.txt',
      '/assets/..%2f..%2foutside-the-root.txt',
    ])
      expect((await call(host, path)).status, path).toBe(404);
  });

  it('says how to build the page when the renderer is missing', async () => {
    const r = await call(bare, '/');
    expect(r.status).toBe(503);
    expect(r.body).toMatch(/npm run build/);
  });
});
