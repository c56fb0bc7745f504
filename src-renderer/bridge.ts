import type { ClientOf, ServiceErrorCode, ServiceReply } from '../shared-core/contract/define.js';
import { serviceApi, type ServiceApiTable } from '../shared-core/contract/service-api.js';

/**
 * The renderer's one way to the main process. Inside the desktop window the Electron preload
 * exposes `window.holdfast.call`; in a browser on the local web host each call is
 * `POST /api/<method>` with the per-launch token that `holdfast serve` put in the address's
 * fragment (`#token=...`). Either way the reply is the service's envelope, and a refusal becomes
 * a `ServiceCallError` whose message says what to do.
 */

export interface HoldfastPreload {
  call(method: string, request: unknown): Promise<ServiceReply>;
  /**
   * The desktop window's menu commands (see src-renderer/app/menu.ts); returns the function that
   * unsubscribes. Absent in a browser on the local web host.
   */
  onMenu?(listener: (action: string) => void): () => void;
  /**
   * The desktop window only: opens a printed memo in the system's own PDF viewer, from which it
   * can be printed (src-main/shell/memo-viewer.ts).
   */
  openMemo?(
    memoId: string,
  ): Promise<{ ok: true; path: string } | { ok: false; error: { code: string; message: string } }>;
}

declare global {
  interface Window {
    holdfast?: HoldfastPreload;
  }
}

export class ServiceCallError extends Error {
  constructor(
    readonly method: string,
    readonly code: ServiceErrorCode | 'transport' | 'unauthorised',
    message: string,
    /** JSON path inside the request (or file:line:column) that the error is about. */
    readonly where?: string,
  ) {
    super(message);
    this.name = 'ServiceCallError';
  }
}

const TOKEN_KEY = 'holdfast.token';

/**
 * Reads `token=...` from the fragment once, keeps it for this tab (so a reload still works) and
 * takes it out of the visible address, so it is not copied along with a link.
 */
export function takeTokenFromAddress(): string | null {
  const match = /(?:^#|[#&])token=([^&]+)/.exec(window.location.hash);
  if (match) {
    const token = decodeURIComponent(match[1]);
    window.sessionStorage.setItem(TOKEN_KEY, token);
    const rest = window.location.hash.replace(/(^#|&)token=[^&]+&?/, '$1').replace(/^#&?$/, '');
    window.history.replaceState(null, '', `${window.location.pathname}${window.location.search}${rest}`);
    return token;
  }
  return window.sessionStorage.getItem(TOKEN_KEY);
}

let token: string | null | undefined;

async function overHttp(method: string, request: unknown): Promise<ServiceReply> {
  if (token === undefined) token = takeTokenFromAddress();
  let response: Response;
  try {
    response = await fetch(`api/${encodeURIComponent(method)}`, {
      method: 'POST',
      headers: {
        'Content-Type': 'application/json',
        ...(token ? { Authorization: `Bearer ${token}` } : {}),
      },
      body: JSON.stringify(request ?? {}),
      credentials: 'same-origin',
    });
  } catch (error) {
    throw new ServiceCallError(
      method,
      'transport',
      `the Holdfast service does not answer (${(error as Error).message}); is 'holdfast serve' still running?`,
    );
  }
  if (response.status === 401 || response.status === 403)
    throw new ServiceCallError(
      method,
      'unauthorised',
      'this page has no valid access token: open the address that holdfast serve printed, including its #token= part',
    );
  const text = await response.text();
  try {
    return JSON.parse(text) as ServiceReply;
  } catch {
    throw new ServiceCallError(method, 'transport', `the service answered ${response.status} with no readable reply`);
  }
}

async function call(method: string, request: unknown): Promise<unknown> {
  const reply = window.holdfast ? await window.holdfast.call(method, request) : await overHttp(method, request);
  if (reply.ok) return reply.result;
  throw new ServiceCallError(method, reply.error.code, reply.error.message, reply.error.where);
}

/** `api['households.list']({})` and so on: typed from the one service API table. */
export const api = Object.fromEntries(
  Object.keys(serviceApi).map((name) => [name, (request: unknown) => call(name, request)]),
) as unknown as ClientOf<ServiceApiTable>;
