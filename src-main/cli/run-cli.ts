import { InputError } from '../../shared-core/errors.js';
import { formatFieldError } from '../../shared-core/present/field-words.js';
import { packageVersion } from '../service/app-info.js';
import { commandHelp, parseOptions } from './args.js';
import { EXIT, UsageError, type CliIO } from './command.js';
import { commands } from './commands/index.js';
import { StorageError, asStorageError } from '../store/storage-error.js';

function overview(): string {
  const width = Math.max(...commands.map((c) => c.name.length)) + 2;
  const lines = [
    `holdfast ${packageVersion()}: offline portfolio construction for client households`,
    '',
    'Usage: holdfast COMMAND [options]     holdfast COMMAND --help for its options',
    '',
    'Commands:',
    ...commands.map((c) => `  ${c.name.padEnd(width)}${c.summary}`),
    '',
    'Estimates come from past data; past performance does not guarantee future results. Output is',
    'decision support, not advice, until a licensed adviser reviews it under the local rules.',
  ];
  return lines.join('\n') + '\n';
}

/** Runs one command line; returns the exit code. All output goes through `io`. */
export async function runCli(argv: readonly string[], io: CliIO): Promise<number> {
  const [first, ...rest] = argv;
  if (first === undefined || first === '--help' || first === '-h' || first === 'help') {
    io.stdout(overview());
    return first === undefined ? EXIT.badInput : EXIT.ok;
  }
  if (first === '--version' || first === '-v') {
    io.stdout(`${packageVersion()}\n`);
    return EXIT.ok;
  }
  const command = commands.find((c) => c.name === first);
  if (!command) {
    io.stderr(`holdfast: unknown ${first.startsWith('-') ? 'option' : 'command'} '${first}' (see holdfast --help)\n`);
    return EXIT.badInput;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    io.stdout(commandHelp(command));
    return EXIT.ok;
  }
  try {
    const options = parseOptions(command, rest);
    const run = await command.load();
    return await run(options, io);
  } catch (error) {
    if (error instanceof UsageError) {
      io.stderr(`holdfast ${command.name}: ${error.message}\n`);
      return EXIT.badInput;
    }
    if (error instanceof InputError) {
      io.stderr(`holdfast ${command.name}: ${formatFieldError(error)}\n`);
      return EXIT.badInput;
    }
    // The disk or the lock, not the input: one message naming the file and what to do.
    // Also a file the command writes itself (a memo, a household file) on a full or read-only disk.
    const storage =
      error instanceof StorageError
        ? error
        : typeof (error as NodeJS.ErrnoException).path === 'string'
          ? asStorageError(error, (error as NodeJS.ErrnoException).path!)
          : undefined;
    if (storage) {
      io.stderr(`holdfast ${command.name}: ${storage.message}\n`);
      return EXIT.failure;
    }
    io.stderr(`holdfast ${command.name}: internal error: ${(error as Error).stack ?? String(error)}\n`);
    return EXIT.failure;
  }
}
