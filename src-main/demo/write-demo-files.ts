import { mkdirSync, renameSync, statSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { InputError } from '../../shared-core/errors.js';
import { demoFiles, generateDemo, type DemoData } from '../../shared-core/demo/index.js';

export interface WrittenDemo {
  dir: string;
  data: DemoData;
  files: { name: string; path: string; bytes: number }[];
}

/**
 * Writes the invented demonstration files into `dir` (created if needed). Each file is written
 * to a temporary name and renamed, so a reader never sees half a file.
 */
export function writeDemoFiles(dir: string, options: { seed?: number } = {}): WrittenDemo {
  const full = resolve(dir);
  let stat;
  try {
    stat = statSync(full);
  } catch {
    stat = undefined;
  }
  if (stat && !stat.isDirectory()) throw new InputError('exists and is not a directory', { file: dir });
  const data = generateDemo(options);
  const files = demoFiles(data);
  mkdirSync(full, { recursive: true });
  const written = files.map((f) => {
    const path = join(full, f.name);
    const temporary = `${path}.partial`;
    writeFileSync(temporary, f.text, 'utf8');
    renameSync(temporary, path);
    return { name: f.name, path, bytes: Buffer.byteLength(f.text) };
  });
  return { dir: full, data, files: written };
}
