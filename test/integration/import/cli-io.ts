import { runCli } from '../../../src-main/cli/run-cli.js';

/** Runs `holdfast ...` in-process with captured output. */
export async function holdfast(cwd: string, ...argv: string[]) {
  let stdout = '';
  let stderr = '';
  const code = await runCli(argv, {
    stdout: (t) => (stdout += t),
    stderr: (t) => (stderr += t),
    cwd,
    env: {},
    signal: new AbortController().signal,
  });
  return { code, stdout, stderr };
}
