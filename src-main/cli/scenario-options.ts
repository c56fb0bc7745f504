import { formatFieldError } from '../../shared-core/present/field-words.js';
import { scenarioFromFiles, type ScenarioInputs } from '../app/scenario-inputs.js';
import { UsageError, type CliIO, type OptionValues } from './command.js';

/**
 * The scenario options of a command parsed into the use cases' inputs: the file form
 * `--prices FILE.csv --scenario FILE.json [--fx FILE.csv]`, or (where the command has it) the
 * store form `--store FILE --household NAME --scenario NAME`. The scenario's other errors and
 * the price files' flagged moves go to standard error, prefixed with the command's name.
 */
export async function scenarioOptions(command: string, options: OptionValues, io: CliIO): Promise<ScenarioInputs> {
  if (
    (options.store === undefined) !== (options.household === undefined) ||
    (options.store !== undefined) === (options.prices !== undefined)
  )
    throw new UsageError(`'${command}' needs --prices FILE.csv, or --store FILE with --household NAME`);
  if (options.store !== undefined) {
    if (options.fx !== undefined)
      throw new UsageError('--fx is for the file form: the store form reads the stored exchange rates');
    // Loaded here so that the file form starts without the store and SQLite.
    const [{ existingStore }, { scenarioFromStore }] = await Promise.all([
      import('./commands/store-access.js'),
      import('../app/scenario-inputs.js'),
    ]);
    const store = existingStore(io.cwd, options.store as string);
    try {
      return scenarioFromStore(store, options.store as string, options.household as string, options.scenario as string);
    } finally {
      store.close();
    }
  }
  return scenarioFromFiles(
    io.cwd,
    {
      prices: options.prices as string,
      scenario: options.scenario as string,
      ...(options.fx !== undefined ? { fx: options.fx as string } : {}),
    },
    (e) => io.stderr(`holdfast ${command}: ${formatFieldError(e)}\n`),
    (w) => io.stderr(`holdfast ${command}: warning: ${w}\n`),
  );
}
