import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { dispatch } from '../../shared-core/contract/dispatch.js';
import type { ImplementationOf, MethodTable, ServiceReply } from '../../shared-core/contract/define.js';
import { carriesToken, newAccessToken } from './access-token.js';
import { readJsonBody } from './read-json-body.js';
import { replyStatus } from './reply-status.js';
import { securityHeaders } from './security-headers.js';
import { lookupStatic } from './static-files.js';

/**
 * The local web host: the built renderer and the one service API over HTTP, on the loopback
 * interface only. It knows nothing of the methods: the table and its implementation are given,
 * and every call goes through `dispatch`, exactly as the Electron IPC bridge does.
 *
 * Access: each launch draws a random token; the printed address carries it in the fragment
 * (`#token=...`, never sent in a request line or logged by a proxy), the page sends it back as
 * `Authorization: Bearer ...`, and any API request without it is answered 401. Requests whose
 * Host header is not this loopback address are refused (a page on another site cannot reach the
 * host through a rebound DNS name), and so are cross-origin API calls.
 */
export const LOOPBACK = '127.0.0.1';
export const HEADERS_TIMEOUT_MS = 30_000;
export const REQUEST_TIMEOUT_MS = 30_000;

export interface WebHostOptions<T extends MethodTable> {
  table: T;
  implementation: ImplementationOf<T>;
  /** Folder of the built renderer (dist/renderer). */
  staticRoot: string;
  /** 0 picks a free port. */
  port?: number;
  /** Fixed token for tests; a random one otherwise. */
  token?: string;
  /** How long a client may take to send its headers, and its whole request (default 30 s each). */
  headersTimeoutMs?: number;
  requestTimeoutMs?: number;
}

export interface WebHost {
  /** `http://127.0.0.1:PORT/#token=...`: the address to open. */
  url: string;
  origin: string;
  port: number;
  host: string;
  token: string;
  /** The server's limits as Node applies them. */
  timeouts: { headersMs: number; requestMs: number };
  close(): Promise<void>;
}

function send(response: ServerResponse, status: number, body: string | Buffer, type: string, extra = {}): void {
  response.writeHead(status, { ...securityHeaders(), 'Content-Type': type, ...extra });
  response.end(body);
}

function sendReply(response: ServerResponse, status: number, reply: ServiceReply): void {
  send(response, status, JSON.stringify(reply), 'application/json; charset=utf-8', { 'Cache-Control': 'no-store' });
}

function refuse(response: ServerResponse, status: number, code: 'bad-request' | 'unknown-method', message: string) {
  sendReply(response, status, { ok: false, error: { code, message } });
}

export async function startWebHost<T extends MethodTable>(options: WebHostOptions<T>): Promise<WebHost> {
  const token = options.token ?? newAccessToken();
  let origin = '';
  let allowedHosts: string[] = [];
  let allowedOrigins: string[] = [];

  async function handle(request: IncomingMessage, response: ServerResponse): Promise<void> {
    const host = request.headers.host ?? '';
    if (!allowedHosts.includes(host)) {
      send(response, 421, `this host answers only as ${allowedHosts[0]}\n`, 'text/plain; charset=utf-8');
      return;
    }
    const url = new URL(request.url ?? '/', origin);
    if (url.pathname.startsWith('/api/')) {
      if (!carriesToken(request.headers, token)) {
        send(
          response,
          401,
          JSON.stringify({
            ok: false,
            error: {
              code: 'bad-request',
              message: 'missing or wrong access token: open the address holdfast serve printed',
            },
          }),
          'application/json; charset=utf-8',
          { 'WWW-Authenticate': 'Bearer realm="holdfast"', 'Cache-Control': 'no-store' },
        );
        return;
      }
      const from = request.headers.origin;
      if (from !== undefined && !allowedOrigins.includes(from)) {
        refuse(response, 403, 'bad-request', `cross-origin request from ${from} refused`);
        return;
      }
      if (request.method !== 'POST') {
        send(response, 405, 'use POST for /api/<method>\n', 'text/plain; charset=utf-8', { Allow: 'POST' });
        return;
      }
      let name: string;
      try {
        name = decodeURIComponent(url.pathname.slice('/api/'.length));
      } catch {
        refuse(response, 400, 'bad-request', `malformed method name in ${url.pathname}: not a valid percent-encoding`);
        return;
      }
      const body = await readJsonBody(request);
      if (!body.ok) {
        refuse(response, body.status, 'bad-request', `${name}: ${body.message}`);
        return;
      }
      const reply = await dispatch(options.table, options.implementation, name, body.value);
      sendReply(response, replyStatus(reply), reply);
      return;
    }
    if (request.method !== 'GET' && request.method !== 'HEAD') {
      send(response, 405, 'only GET for pages\n', 'text/plain; charset=utf-8', { Allow: 'GET, HEAD' });
      return;
    }
    const found = await lookupStatic(options.staticRoot, url.pathname);
    if (found.kind === 'file')
      send(response, 200, request.method === 'HEAD' ? '' : found.body, found.contentType, {
        'Cache-Control': 'no-cache',
      });
    else if (found.kind === 'no-renderer')
      send(
        response,
        503,
        `The Holdfast page is not built (no index.html in ${found.root}). Run: npm run build\n`,
        'text/plain; charset=utf-8',
      );
    else send(response, 404, `not found: ${url.pathname}\n`, 'text/plain; charset=utf-8');
  }

  const server = createServer(
    // A client that sends its headers or its body too slowly is cut off (Node's defaults are
    // 60 s and 300 s): the page's calls are small and local.
    {
      headersTimeout: options.headersTimeoutMs ?? HEADERS_TIMEOUT_MS,
      requestTimeout: options.requestTimeoutMs ?? REQUEST_TIMEOUT_MS,
      // How often Node looks for connections past those limits (its default is 30 s, which
      // would let a slow client hold a connection for up to twice the limit).
      connectionsCheckingInterval: Math.min(1000, options.headersTimeoutMs ?? HEADERS_TIMEOUT_MS),
    },
    (request, response) => {
      handle(request, response).catch((error: unknown) => {
        if (!response.headersSent)
          sendReply(response, 500, { ok: false, error: { code: 'internal', message: (error as Error).message } });
        else response.destroy();
      });
    },
  );
  // Loopback only, whatever the caller wants: the host is never reachable from another machine.
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen({ host: LOOPBACK, port: options.port ?? 0, exclusive: true }, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const address = server.address() as AddressInfo;
  origin = `http://${LOOPBACK}:${address.port}`;
  allowedHosts = [`${LOOPBACK}:${address.port}`, `localhost:${address.port}`];
  allowedOrigins = allowedHosts.map((h) => `http://${h}`);
  return {
    url: `${origin}/#token=${token}`,
    origin,
    port: address.port,
    host: address.address,
    token,
    timeouts: { headersMs: server.headersTimeout, requestMs: server.requestTimeout },
    close: () =>
      new Promise<void>((resolve, reject) => {
        server.close((error) => (error ? reject(error) : resolve()));
        server.closeAllConnections();
      }),
  };
}
