import { readFile, stat } from 'node:fs/promises';
import { extname, normalize, resolve, sep } from 'node:path';
import { CONTENT_SECURITY_POLICY } from '../web-host/security-headers.js';

/**
 * The desktop window loads the renderer from a custom scheme, `holdfast://app/...`, rather than
 * `file://` (which would let a page read any file on disk). Each response carries the same
 * Content-Security-Policy as the local web host.
 */
export const APP_SCHEME = 'holdfast';
export const APP_HOST = 'app';
export const APP_ORIGIN = `${APP_SCHEME}://${APP_HOST}`;
export const APP_ENTRY = `${APP_ORIGIN}/index.html`;

const types: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.woff2': 'font/woff2',
  '.woff': 'font/woff',
  '.ttf': 'font/ttf',
};

/** True for a URL of the app's own pages. */
export function isAppUrl(url: string | undefined): boolean {
  if (!url) return false;
  try {
    const u = new URL(url);
    return u.protocol === `${APP_SCHEME}:` && u.host === APP_HOST;
  } catch {
    return false;
  }
}

/** The file behind an app URL, or undefined when it would leave the renderer folder. */
export function appFileOf(url: string, rendererRoot: string): string | undefined {
  if (!isAppUrl(url)) return undefined;
  let path: string;
  try {
    path = decodeURIComponent(new URL(url).pathname);
  } catch {
    return undefined;
  }
  if (path.includes('\0')) return undefined;
  const base = resolve(rendererRoot);
  const full = resolve(base, normalize(path === '/' ? 'index.html' : path).replace(/^([/\\])+/, ''));
  return full.startsWith(base + sep) ? full : undefined;
}

/** The protocol handler's answer for one request (a plain Fetch API Response). */
export async function appResponse(url: string, rendererRoot: string): Promise<Response> {
  const file = appFileOf(url, rendererRoot);
  const headers = { 'Content-Security-Policy': CONTENT_SECURITY_POLICY, 'X-Content-Type-Options': 'nosniff' };
  if (file) {
    try {
      if ((await stat(file)).isFile())
        return new Response(new Uint8Array(await readFile(file)), {
          status: 200,
          headers: { ...headers, 'Content-Type': types[extname(file).toLowerCase()] ?? 'application/octet-stream' },
        });
    } catch {
      // fall through to 404
    }
  }
  return new Response('not found', { status: 404, headers: { ...headers, 'Content-Type': 'text/plain' } });
}
