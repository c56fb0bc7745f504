import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * The memo's one embedded family, two weights: Source Sans 3 Regular and Semibold (SIL Open
 * Font License 1.1; see assets/fonts/README.md). Read from the repository's assets/fonts, found
 * by walking up from this module, so it works from the sources (Vitest) and from dist/ alike.
 */
export const FONT_REGULAR = 'MemoRegular';
export const FONT_BOLD = 'MemoSemibold';

export interface MemoFonts {
  regular: Buffer;
  bold: Buffer;
}

let cached: MemoFonts | undefined;

function fontsDir(): string {
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let i = 0; i < 6; i++) {
    const candidate = join(dir, 'assets', 'fonts');
    if (existsSync(join(candidate, 'SourceSans3-Regular.ttf'))) return candidate;
    dir = dirname(dir);
  }
  throw new Error('the memo font (assets/fonts/SourceSans3-Regular.ttf) is missing from this installation');
}

export function memoFonts(): MemoFonts {
  if (!cached) {
    const dir = fontsDir();
    cached = {
      regular: readFileSync(join(dir, 'SourceSans3-Regular.ttf')),
      bold: readFileSync(join(dir, 'SourceSans3-Semibold.ttf')),
    };
  }
  return cached;
}
