import { isAscii } from 'node:buffer';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../../shared-core/errors.js';

/**
 * Reads a UTF-8 text file named by the user (a command's argument, a scenario or holdings file),
 * relative to `cwd`; the name is kept as given for messages. A missing file is an InputError
 * naming it.
 */
export function readInputFile(cwd: string, path: string): { path: string; text: string } {
  const full = resolve(cwd, path);
  try {
    const bytes = readFileSync(full);
    // An all-ASCII file (most price files) is the same text read as Latin-1, which skips UTF-8
    // decoding: 7 instead of 12 ms for a 6.6 MB file. A BOM is not ASCII.
    const text = isAscii(bytes) ? bytes.toString('latin1') : bytes.toString('utf8').replace(/^\uFEFF/, '');
    return { path, text };
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'is a directory' : (error as Error).message;
    throw new InputError(why, { file: path });
  }
}
