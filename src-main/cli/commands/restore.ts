import { resolve } from 'node:path';
import { InputError } from '../../../shared-core/errors.js';
import { StoreOpenError, restoreStore } from '../../store/store.js';
import { EXIT, type CliIO, type OptionValues } from '../command.js';

/** `holdfast restore`: a checked backup becomes the store; a store it replaces is kept aside. */
export async function runRestore(options: OptionValues, io: CliIO): Promise<number> {
  const fromName = options.from as string;
  const from = resolve(io.cwd, fromName);
  try {
    const result = await restoreStore(from, resolve(io.cwd, options.store as string));
    io.stdout(`restored ${options.store as string} from ${fromName} (store schema ${result.schemaVersion})\n`);
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
