import type { CliIO } from '../../src-main/cli/command.js';
import { runCli } from '../../src-main/cli/run-cli.js';

export interface CliOutcome {
  code: number;
  stdout: string;
  stderr: string;
}

/** Runs one command line in this process, as `holdfast` would in `cwd`, and collects what it printed. */
export async function runCliInProcess(argv: readonly string[], cwd: string): Promise<CliOutcome> {
  let stdout = '';
  let stderr = '';
  const io: CliIO = {
    stdout: (t) => (stdout += t),
    stderr: (t) => (stderr += t),
    cwd,
    env: {},
    signal: new AbortController().signal,
  };
  const code = await runCli(argv, io);
  return { code, stdout, stderr };
}
