import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach } from 'vitest';

/** A fresh directory per test, removed afterwards. */
export function useTempDir(): () => string {
  let dirs: string[] = [];
  afterEach(() => {
    for (const d of dirs) rmSync(d, { recursive: true, force: true });
    dirs = [];
  });
  return () => {
    const d = mkdtempSync(join(tmpdir(), 'holdfast-store-'));
    dirs.push(d);
    return d;
  };
}
