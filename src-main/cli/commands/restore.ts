import { resolve } from 'node:path';
import { InputError } from '../../../shared-core/errors.js';
import { StoreOpenError, restoreStore } from '../../store/store.js';
import { EXIT, type CliIO, type OptionValues } from '../command.js';

/**
 * `holdfast restore`: a verified backup becomes the store; a store it replaces is kept aside. A
 * damaged backup is bad input (exit 2) naming what is damaged, and the store is left as it was.
 */
export async function runRestore(options: OptionValues, io: CliIO): Promise<number> {
  const fromName = options.from as string;
  const from = resolve(io.cwd, fromName);
  try {
    const result = await restoreStore(from, resolve(io.cwd, options.store as string));
    const v = result.verified;
    io.stdout(
      `restored ${options.store as string} from ${fromName} (store schema ${result.schemaVersion}; ` +
        `${v.series} price series, ${v.revisions} scenario revisions and ${v.memos} memos verified)\n`,
    );
    for (const u of result.unverified) io.stdout(`not verified: ${u}\n`);
    if (result.previous) io.stdout(`the store it replaced is kept as ${result.previous}\n`);
    return EXIT.ok;
  } catch (error) {
    if (error instanceof StoreOpenError)
      throw new InputError(error.message.slice(error.path.length + 2), {
        file: error.path === from ? fromName : error.path,
      });
    throw error;
  }
}
