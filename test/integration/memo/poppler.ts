import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * Reads a PDF the way a reviewer's tools do, with Debian's poppler-utils (pdftotext, pdfinfo,
 * pdftoppm), which CI installs: text per page, document information, PNG pages.
 */
function withFile<T>(pdf: Buffer, fn: (path: string) => T): T {
  const dir = mkdtempSync(join(tmpdir(), 'holdfast-memo-'));
  const path = join(dir, 'memo.pdf');
  writeFileSync(path, pdf);
  try {
    return fn(path);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** The text of each page (pdftotext -layout keeps table rows on one line). */
export function pageTexts(pdf: Buffer): string[] {
  return withFile(pdf, (path) => {
    const text = execFileSync('pdftotext', ['-layout', '-enc', 'UTF-8', path, '-'], { encoding: 'utf8' });
    const pages = text.split('\f');
    if (pages[pages.length - 1].trim() === '') pages.pop();
    return pages;
  });
}

/** Whitespace (line breaks included) collapsed to single spaces, for sentences that wrap. */
export function flatText(pdf: Buffer): string {
  return pageTexts(pdf).join(' ').replace(/\s+/g, ' ');
}

export function pdfInfo(pdf: Buffer): Record<string, string> {
  return withFile(pdf, (path) => {
    const out = execFileSync('pdfinfo', ['-isodates', path], { encoding: 'utf8' });
    const info: Record<string, string> = {};
    for (const line of out.split('\n')) {
      const m = /^([^:]+):\s*(.*)$/.exec(line);
      if (m) info[m[1].trim()] = m[2].trim();
    }
    return info;
  });
}

/** Renders every page to `dir/prefix-N.png` at `dpi`; returns the file names. */
export function renderPngs(pdf: Buffer, dir: string, prefix: string, dpi = 80): string[] {
  mkdirSync(dir, { recursive: true });
  for (const f of readdirSync(dir)) if (f.startsWith(`${prefix}-`) && f.endsWith('.png')) rmSync(join(dir, f));
  withFile(pdf, (path) => execFileSync('pdftoppm', ['-r', String(dpi), '-png', path, join(dir, prefix)]));
  return readdirSync(dir)
    .filter((f) => f.startsWith(`${prefix}-`) && f.endsWith('.png'))
    .sort();
}
