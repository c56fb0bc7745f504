import { readFile, stat } from 'node:fs/promises';
import { extname, join, normalize, resolve, sep } from 'node:path';

const contentTypes: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.mjs': 'text/javascript; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.svg': 'image/svg+xml',
  '.png': 'image/png',
  '.ico': 'image/x-icon',
  '.woff2': 'font/woff2',
  '.woff': 'font/woff',
  '.ttf': 'font/ttf',
  '.txt': 'text/plain; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
};

export type StaticLookup =
  { kind: 'file'; body: Buffer; contentType: string } | { kind: 'not-found' } | { kind: 'no-renderer'; root: string };

/**
 * Finds a file of the built renderer for a URL path. Paths are decoded, normalised and must stay
 * inside `root` (no `..` escape); `/` is `index.html`.
 */
export async function lookupStatic(root: string, urlPath: string): Promise<StaticLookup> {
  const base = resolve(root);
  try {
    await stat(join(base, 'index.html'));
  } catch {
    return { kind: 'no-renderer', root: base };
  }
  let decoded: string;
  try {
    decoded = decodeURIComponent(urlPath);
  } catch {
    return { kind: 'not-found' };
  }
  if (decoded.includes('\0')) return { kind: 'not-found' };
  const relative = decoded === '/' ? 'index.html' : normalize(decoded).replace(/^([/\\])+/, '');
  const full = resolve(base, relative);
  if (full !== base && !full.startsWith(base + sep)) return { kind: 'not-found' };
  try {
    const info = await stat(full);
    if (!info.isFile()) return { kind: 'not-found' };
    return {
      kind: 'file',
      body: await readFile(full),
      contentType: contentTypes[extname(full).toLowerCase()] ?? 'application/octet-stream',
    };
  } catch {
    return { kind: 'not-found' };
  }
}
