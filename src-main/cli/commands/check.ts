import { resolve } from 'node:path';
import { InputError } from '../../../shared-core/errors.js';
import { StoreOpenError, checkStoreFile, type StoreVerdict } from '../../store/store.js';
import { EXIT, type CliIO, type OptionValues } from '../command.js';

/** `holdfast check`: verifies a store or backup file as it is on disk and names what is damaged. */
export async function runCheck(options: OptionValues, io: CliIO): Promise<number> {
  const name = options.store as string;
  let verdict: StoreVerdict;
  try {
    verdict = checkStoreFile(resolve(io.cwd, name));
  } catch (error) {
    if (error instanceof StoreOpenError)
      throw new InputError(error.message.slice(error.path.length + 2), { file: name });
    throw error;
  }
  if (options.json) io.stdout(JSON.stringify({ file: name, sound: verdict.problems.length === 0, ...verdict }) + '\n');
  else {
    const v = verdict.verified;
    const counted = `${v.series} price series, ${v.revisions} scenario revisions and ${v.memos} memos checked against their checksums`;
    if (verdict.problems.length === 0)
      io.stdout(`${name}: sound (store schema ${verdict.schemaVersion}; ${counted})\n`);
    else {
      io.stderr(`${name}: damaged; ${verdict.problems.length} problem${verdict.problems.length > 1 ? 's' : ''}:\n`);
      for (const p of verdict.problems) io.stderr(`  ${p}\n`);
      io.stderr(`(${counted}.) Restore the latest sound backup with holdfast restore; check the backup first.\n`);
    }
    for (const u of verdict.unverified) io.stdout(`not verified: ${u}\n`);
  }
  return verdict.problems.length === 0 ? EXIT.ok : EXIT.failure;
}
