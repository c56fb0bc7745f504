/**
 * The shape every `holdfast` command shares. Commands are plain objects listed in
 * `commands/index.ts`; the parser, `--help` and the error messages all read these specs, and
 * each command's implementation module is imported only when it runs.
 */
export interface CliIO {
  stdout(text: string): void;
  stderr(text: string): void;
  /** Directory that relative paths are resolved against. */
  cwd: string;
  env: Record<string, string | undefined>;
  /** Aborted on Ctrl-C: long commands stop cleanly and write nothing partial. */
  signal: AbortSignal;
}

export type OptionKind = 'string' | 'number' | 'boolean';

export interface OptionSpec {
  /** Long name without dashes, e.g. `half-life`. */
  name: string;
  kind: OptionKind;
  description: string;
  /** Shown in help, e.g. `FILE.csv`. */
  valueName?: string;
  choices?: readonly string[];
  required?: boolean;
}

export type OptionValues = Record<string, string | number | boolean | undefined>;

/** What `--help`, the parser and the error messages read: static, with no implementation loaded. */
export interface CommandSpec {
  name: string;
  summary: string;
  options: readonly OptionSpec[];
  /** Extra lines for `holdfast COMMAND --help`. */
  details?: string;
}

/** A command's implementation: runs on options already checked against its spec. */
export type RunCommand = (options: OptionValues, io: CliIO) => Promise<number>;

export interface Command extends CommandSpec {
  /**
   * Imports the implementation module. Called only when this command runs, so that a command
   * starts without loading the others' dependencies (the store, the PDF writer, the schemas).
   */
  load(): Promise<RunCommand>;
}

/** Exit codes of the command line. */
export const EXIT = {
  ok: 0,
  failure: 1,
  /** Bad usage or bad input: nothing was written. */
  badInput: 2,
  /** `solve`: at least one candidate is infeasible (the JSON is still printed). */
  infeasible: 3,
  interrupted: 130,
} as const;

/** A mistake in how the command was called (unknown word, missing value). */
export class UsageError extends Error {
  override name = 'UsageError';
}
