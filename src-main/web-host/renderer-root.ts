import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/** The project folder (the one whose package.json is Holdfast's), from src-main or dist/src-main. */
export function projectRoot(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 6; i++) {
    const candidate = join(dir, 'package.json');
    if (existsSync(candidate) && (JSON.parse(readFileSync(candidate, 'utf8')) as { name?: string }).name === 'holdfast')
      return dir;
    dir = dirname(dir);
  }
  throw new Error(`cannot find Holdfast's package.json above ${fileURLToPath(import.meta.url)}`);
}

/** dist/renderer, built by `node scripts/build.mjs`. */
export function rendererRoot(): string {
  return join(projectRoot(), 'dist', 'renderer');
}
