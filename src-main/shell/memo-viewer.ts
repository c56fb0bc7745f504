import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import type { Service } from '../service/index.js';

/**
 * Opening a printed memo in the system's own PDF viewer (which also prints it): the stored bytes,
 * unchanged, are written to a file in the user-data folder named by the memo's id and hash, then
 * handed to the viewer. Electron's `shell.openPath` is passed in, so this runs in tests without
 * Electron.
 */
export const openMemoRequest = z.strictObject({
  memoId: z.string().regex(/^[1-9]\d{0,14}$/, 'expected a memo id'),
});

export type OpenMemoAnswer = { ok: true; path: string } | { ok: false; error: { code: string; message: string } };

export async function openMemoInViewer(
  service: Pick<Service, 'memos.get'>,
  payload: unknown,
  folder: string,
  /** Resolves to '' on success or the viewer's error text (as `shell.openPath` does). */
  openPath: (path: string) => Promise<string>,
): Promise<OpenMemoAnswer> {
  const request = openMemoRequest.safeParse(payload ?? {});
  if (!request.success) {
    const issue = request.error.issues[0];
    return {
      ok: false,
      error: { code: 'bad-request', message: `open memo: ${issue.path.join('.') || 'request'}: ${issue.message}` },
    };
  }
  let memo;
  try {
    memo = await service['memos.get']({ memoId: request.data.memoId });
  } catch (error) {
    return { ok: false, error: { code: 'not-found', message: (error as Error).message } };
  }
  mkdirSync(folder, { recursive: true, mode: 0o700 });
  const path = join(folder, `holdfast-memo-${request.data.memoId}-${memo.memo.hash.slice(0, 12)}.pdf`);
  writeFileSync(path, Buffer.from(memo.pdfBase64, 'base64'), { mode: 0o600 });
  const failure = await openPath(path);
  return failure
    ? { ok: false, error: { code: 'viewer', message: `the PDF viewer did not open ${path}: ${failure}` } }
    : { ok: true, path };
}
