// The SHA-256 of the dense kernels' C sources, each file's name and text in name order: written
// into the embedded module by build-wasm.mjs and checked against the sources by the tests.
import { createHash } from 'node:crypto';
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';

export function kernelSourceDigest(folder) {
  const hash = createHash('sha256');
  for (const name of readdirSync(folder)
    .filter((file) => file.endsWith('.c'))
    .sort()) {
    hash.update(`${name}\n`);
    hash.update(readFileSync(join(folder, name)));
    hash.update('\n');
  }
  return hash.digest('hex');
}
