import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../../shared-core/errors.js';

/** Reads a UTF-8 text file named on the command line; a missing file is an InputError naming it. */
export function readInputFile(cwd: string, path: string): { path: string; text: string } {
  const full = resolve(cwd, path);
  try {
    return { path, text: readFileSync(full, 'utf8').replace(/^\uFEFF/, '') };
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory' : (error as Error).message;
    throw new InputError(why, { file: path });
  }
}
