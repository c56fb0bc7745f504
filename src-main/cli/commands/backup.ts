import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../../../shared-core/errors.js';
import { EXIT, type CliIO, type OptionValues } from '../command.js';
import { existingStore } from './store-access.js';

/** `holdfast backup`: one consistent copy of the store through SQLite's online backup API. */
export async function runBackup(options: OptionValues, io: CliIO): Promise<number> {
  const outName = options.out as string;
  const out = resolve(io.cwd, outName);
  if (existsSync(out)) throw new InputError('exists already; choose a new backup file name', { file: outName });
  const store = existingStore(io.cwd, options.store as string);
  try {
    const problems = store.check();
    if (problems.length)
      throw new InputError(`fails the integrity check: ${problems.join('; ')}`, { file: options.store as string });
    await store.backup(out);
  } finally {
    store.close();
  }
  io.stdout(`backup written to ${outName}\n`);
  return EXIT.ok;
}
