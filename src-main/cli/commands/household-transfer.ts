import { existsSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { InputError } from '../../../shared-core/errors.js';
import { exportHousehold, importHousehold } from '../../io/household-file.js';
import { readInputFile } from '../../io/read-input-file.js';
import { EXIT, type CliIO, type OptionValues } from '../command.js';
import { writeOutputFile } from '../write-output.js';
import { existingStore, storeAt } from './store-access.js';

/**
 * `holdfast export-household`: one household (its holdings, its scenarios with every revision,
 * and the assets and prices they use) to a portable holdfast-household@1 file that another
 * installation imports. Written under a temporary name and renamed, so no half file is left.
 */
export async function runExportHousehold(options: OptionValues, io: CliIO): Promise<number> {
  const outName = options.out as string;
  const out = resolve(io.cwd, outName);
  if (existsSync(out)) throw new InputError('exists already; choose a new file name', { file: outName });
  const store = existingStore(io.cwd, options.store as string);
  let text: string;
  try {
    text = exportHousehold(store, options.household as string);
  } catch (error) {
    if (error instanceof InputError && error.location.file === undefined) throw error.inFile(options.store as string);
    throw error;
  } finally {
    store.close();
  }
  writeOutputFile(io.cwd, outName, text);
  io.stdout(`household '${options.household as string}' written to ${outName}\n`);
  return EXIT.ok;
}

/**
 * `holdfast import-household`: adds a household file to a store (created when absent) in one
 * transaction, after checking the whole file; prices the store already holds with another close
 * keep the store's value and are listed.
 */
export async function runImportHousehold(options: OptionValues, io: CliIO): Promise<number> {
  const file = readInputFile(io.cwd, options.from as string);
  const storePath = resolve(io.cwd, options.store as string);
  const created = !existsSync(storePath);
  const store = storeAt(io.cwd, options.store as string, { create: true })!;
  let ok = false;
  try {
    const result = importHousehold(store, file.text, file.path);
    if (options.json) io.stdout(JSON.stringify(result) + '\n');
    else {
      io.stdout(
        `added household '${result.household}': ${result.scenarios} scenarios with ${result.revisions} revisions, ` +
          `${result.assetsAdded} new assets, ${result.pricesAdded} prices\n`,
      );
      for (const p of result.pricesKept)
        io.stdout(`  kept the stored close of ${p.assetId} on ${p.date}: ${p.stored} (the file has ${p.inFile})\n`);
    }
    ok = true;
    return EXIT.ok;
  } finally {
    store.close();
    // A store this command created for a file it then refused is removed: nothing is left.
    if (!ok && created) for (const f of [storePath, `${storePath}-wal`, `${storePath}-shm`]) rmSync(f, { force: true });
  }
}
