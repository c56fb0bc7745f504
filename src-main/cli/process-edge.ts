import { installKernelTeam } from '../../shared-core/linalg/kernel-team.js';
import { kernelTeamOfTwo } from '../threads/kernel-team.js';
import { runCli } from './run-cli.js';

export { runCli };

/**
 * The process edge of the command line: wires stdout, stderr and Ctrl-C into runCli, sets the exit
 * code, and gives the dense kernels a second thread for large problems.
 */
export async function runFromProcess(): Promise<void> {
  installKernelTeam(kernelTeamOfTwo());
  const controller = new AbortController();
  process.once('SIGINT', () => controller.abort());
  process.exitCode = await runCli(process.argv.slice(2), {
    stdout: (text) => process.stdout.write(text),
    stderr: (text) => process.stderr.write(text),
    cwd: process.cwd(),
    env: process.env,
    signal: controller.signal,
  });
}
