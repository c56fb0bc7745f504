import { renameSync, rmSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../../shared-core/errors.js';

/**
 * Writes a command's output file whole or not at all: under a temporary name first, then renamed,
 * so an interrupted or failed write leaves no half file. A write that fails is an InputError
 * naming the file (exit 2), with what the system said.
 */
export function writeOutputFile(cwd: string, name: string, data: string | Uint8Array): void {
  const full = resolve(cwd, name);
  const partial = `${full}.partial-${process.pid}`;
  try {
    writeFileSync(partial, data, { mode: 0o600 });
    renameSync(partial, full);
  } catch (error) {
    rmSync(partial, { force: true });
    throw new InputError(`cannot write: ${(error as Error).message}`, { file: name });
  }
}
