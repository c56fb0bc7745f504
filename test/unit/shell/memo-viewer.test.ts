import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { openMemoInViewer } from '../../../src-main/shell/memo-viewer.js';

const folder = mkdtempSync(join(tmpdir(), 'holdfast-memo-viewer-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));
const pdf = Buffer.from('%PDF-1.7 invented memo bytes');
const service = {
  async 'memos.get'({ memoId }: { memoId: string }) {
    if (memoId !== '3') throw new Error(`no memo with id '${memoId}'`);
    return {
      memo: {
        id: '3',
        scenarioId: '1',
        revisionHash: 'r',
        dataVersion: 1,
        hash: 'abcdef0123456789',
        printedAt: '2026-12-01T10:00:00Z',
        title: 't',
        bytes: pdf.length,
      },
      pdfBase64: pdf.toString('base64'),
    };
  },
};

describe("opening a printed memo in the system's PDF viewer (desktop shell)", () => {
  it('writes the stored bytes unchanged, owner-only, and hands that file to the viewer', async () => {
    const opened: string[] = [];
    const answer = await openMemoInViewer(service, { memoId: '3' }, join(folder, 'memos'), async (p) => {
      opened.push(p);
      return '';
    });
    expect(answer).toEqual({ ok: true, path: join(folder, 'memos', 'holdfast-memo-3-abcdef012345.pdf') });
    expect(opened).toEqual([join(folder, 'memos', 'holdfast-memo-3-abcdef012345.pdf')]);
    expect(readFileSync(opened[0])).toEqual(pdf);
    expect(statSync(opened[0]).mode & 0o777).toBe(0o600);
  });

  it('refuses a malformed id before touching the store or the disk, and reports a viewer failure', async () => {
    const never = async () => {
      throw new Error('must not open');
    };
    for (const bad of [{}, { memoId: '../x' }, { memoId: 3 }, { memoId: '1', extra: true }])
      expect(await openMemoInViewer(service, bad, folder, never)).toMatchObject({
        ok: false,
        error: { code: 'bad-request' },
      });
    expect(await openMemoInViewer(service, { memoId: '9' }, folder, never)).toMatchObject({
      ok: false,
      error: { code: 'not-found', message: "no memo with id '9'" },
    });
    const failed = await openMemoInViewer(service, { memoId: '3' }, folder, async () => 'no application for PDF');
    expect(failed).toMatchObject({ ok: false, error: { code: 'viewer' } });
    expect(failed.ok ? '' : failed.error.message).toMatch(/no application for PDF/);
  });
});
