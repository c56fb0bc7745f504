import { isAppUrl } from './app-protocol.js';

/**
 * The session's request filter: the app works air-gapped and proves it, so every request that is
 * not for the app's own files is cancelled: http(s), ws(s), ftp, file:// (the renderer never
 * reads the disk directly) and any other scheme. `data:` and `blob:` URLs are made by the page
 * itself (chart images, the worker) and never leave the process. Devtools pages are allowed only
 * in a development build.
 */
export function shouldCancelRequest(url: string, options: { development: boolean }): boolean {
  if (isAppUrl(url)) return false;
  if (url.startsWith('data:') || url.startsWith('blob:')) return false;
  if (options.development && (url.startsWith('devtools://') || url.startsWith('chrome-extension://'))) return false;
  return true;
}

/** Navigation of the window: only to the app's own pages (a reload); everything else is prevented. */
export function mayNavigate(url: string): boolean {
  return isAppUrl(url);
}
